import { and, eq, gt, isNull, sql } from 'drizzle-orm'
import { firms, invitations } from '../db/schema'

/**
 * The open invitation behind a link, inside a transaction. Only this invitation is visible
 * (app.invite_token_hash); then the transaction is scoped to its firm. 404 when the link is
 * unknown, used, withdrawn or expired: a stranger learns nothing.
 */
export async function openInvitation(tx: Tx, token: string, lock = false) {
  const tokenHash = hashToken(token)
  await tx.execute(sql`select set_config('app.invite_token_hash', ${tokenHash}, true)`)
  const open = and(eq(invitations.tokenHash, tokenHash), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date()))
  let [inv] = await tx.select().from(invitations).where(open)
  if (inv) {
    await scopeTransaction(tx, inv.firmId, null)
    // locking needs the firm's own policy (FOR UPDATE checks it), so lock once scoped; re-check it is still open
    if (lock) [inv] = await tx.select().from(invitations).where(and(eq(invitations.firmId, inv.firmId), eq(invitations.id, inv.id), open)).for('update')
  }
  if (!inv) throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This invitation link has expired, was withdrawn or was already used. Ask for a new one.' } })
  const [firm] = await tx.select({ tradingName: firms.tradingName }).from(firms).where(eq(firms.id, inv.firmId))
  return { invitation: inv, firmName: firm?.tradingName ?? '' }
}

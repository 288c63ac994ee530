import { and, eq, gt, isNull } from 'drizzle-orm'
import { firms, invitations } from '../db/schema'

/**
 * The open invitation behind a link, inside a transaction. Only this invitation is visible
 * (app.invite_token_hash); then the transaction is scoped to its firm. 404 when the link is
 * unknown, used, withdrawn or expired: a stranger learns nothing.
 */
export function openInvitation(tx: Tx, token: string, lock = false) {
  const stillOpen = (tokenHash: string) => and(eq(invitations.tokenHash, tokenHash), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date()))
  return withSecretLink(tx, {
    setting: 'app.invite_token_hash',
    secret: token,
    find: (tx, tokenHash, firmId) => tx.select().from(invitations).where(and(stillOpen(tokenHash), inLinkFirm(invitations.firmId, firmId))),
    open: async (f, found) => {
      let inv: typeof found | undefined = found
      // locking needs the firm's own policy (FOR UPDATE checks it), so lock once scoped; re-check it is still open
      if (lock) [inv] = await f.tx.select().from(invitations).where(f.where(invitations, eq(invitations.id, found.id), stillOpen(found.tokenHash))).for('update')
      if (!inv) return undefined
      const [firm] = await f.tx.select({ tradingName: firms.tradingName }).from(firms).where(eq(firms.id, inv.firmId))
      return { invitation: inv, firmName: firm?.tradingName ?? '' }
    },
    gone: () => { throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This invitation link has expired, was withdrawn or was already used. Ask for a new one.' } }) },
  })
}

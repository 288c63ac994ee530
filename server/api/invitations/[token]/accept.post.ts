import { eq, sql } from 'drizzle-orm'
import { invitations, memberships, users } from '../../../db/schema'
import { acceptInvitationSchema, tokenParam } from '#shared/schemas/auth'

const hasAccount = (tx: Tx, email: string) => tx.select({ id: users.id }).from(users).where(eq(sql`lower(${users.email})`, email)).then(r => r.length > 0)

/**
 * Accept an invitation: a new person sets their name and password; someone who already has an
 * account (an accountant joining another firm) confirms with their password. Either way they
 * join with the invited role and are signed in to that firm. The link then stops working.
 * A password check here counts against the same limits as signing in (server/utils/limits.ts),
 * before the password is checked.
 */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, tokenParam)
  const input = await readBodyWith(event, acceptInvitationSchema)
  const first = await useDb().transaction(async (tx) => {
    const { invitation } = await openInvitation(tx, token)
    return { email: invitation.email, existing: await hasAccount(tx, invitation.email) }
  })
  const attempt = first.existing ? await limitPasswordCheck(event, first.email) : null
  await useDb().transaction(async (tx) => {
    const { invitation } = await openInvitation(tx, token, true)
    const [existing] = await tx.select().from(users).where(eq(sql`lower(${users.email})`, invitation.email))
    let userId: string
    if (existing) {
      // made between the two reads: counted on the next try
      if (!attempt) throw createError({ statusCode: 409, statusMessage: 'Try again', data: { message: 'Something changed while you were joining. Please try again.' } })
      if (!(await verifyPassword(existing.passwordHash, input.password))) {
        throw fieldError({ password: 'That is not the password for this account.' })
      }
      userId = existing.id
    }
    else {
      if (!input.name) throw fieldError({ name: 'Enter your name.' })
      const problem = passwordProblem(input.password, { email: invitation.email, name: input.name })
      if (problem) throw fieldError({ password: problem })
      const [created] = await tx.insert(users).values({ email: invitation.email, name: input.name, passwordHash: await hashPassword(input.password) }).returning({ id: users.id })
      userId = created!.id
    }
    await scopeTransaction(tx, invitation.firmId, userId)
    const f = new FirmScope(tx, invitation.firmId, userId)
    await tx.insert(memberships).values(f.values({ userId, role: invitation.role })).onConflictDoNothing()
    await tx.update(invitations).set({ acceptedAt: sql`now()`, acceptedBy: userId }).where(f.where(invitations, eq(invitations.id, invitation.id)))
    await f.audit('invitation.accepted', 'invitation', invitation.id, { role: invitation.role })
    await startSession(event, tx, userId, invitation.firmId)
  })
  if (attempt) await passwordSucceeded(first.email, clientAddress(event), attempt)
  return { ok: true }
})

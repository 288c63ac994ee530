import { eq, sql } from 'drizzle-orm'
import { users } from '../../db/schema'
import { tokenParam } from '#shared/schemas/auth'

/** Public: what an invitation link is for, so the page can ask for a password (and a name when new). */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, tokenParam)
  return useDb().transaction(async (tx) => {
    const { invitation, firmName } = await openInvitation(tx, token)
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(sql`lower(${users.email})`, invitation.email))
    return { firmName, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt, hasAccount: Boolean(existing) }
  })
})

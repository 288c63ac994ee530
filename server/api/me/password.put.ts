import { and, eq, isNull, ne, sql } from 'drizzle-orm'
import { sessions, users } from '../../db/schema'
import { changePasswordSchema } from '#shared/schemas/auth'

/** Change the password; every other session of this person ends. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const input = await readBodyWith(event, changePasswordSchema)
  const problem = passwordProblem(input.newPassword, { email: auth.email, name: auth.name })
  if (problem) throw fieldError({ newPassword: problem })
  const [user] = await useDb().select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, auth.userId))
  if (!user || !(await verifyPassword(user.passwordHash, input.currentPassword))) {
    throw fieldError({ currentPassword: 'That is not your current password.' })
  }
  const passwordHash = await hashPassword(input.newPassword)
  await useDb().transaction(async (tx) => {
    await tx.update(users).set({ passwordHash, passwordChangedAt: sql`now()` }).where(eq(users.id, auth.userId))
    await tx.update(sessions).set({ revokedAt: sql`now()` })
      .where(and(eq(sessions.userId, auth.userId), ne(sessions.id, auth.sessionId), isNull(sessions.revokedAt)))
  })
  return { ok: true }
})

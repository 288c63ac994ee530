import { and, eq } from 'drizzle-orm'
import { memberships, sessions } from '../../db/schema'
import { switchFirmSchema } from '#shared/schemas/auth'

/** Switch the session to another firm the person belongs to (an accountant serving several). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const { firmId } = await readBodyWith(event, switchFirmSchema)
  await withUser(auth.userId, async (tx) => {
    const [m] = await tx.select({ id: memberships.id }).from(memberships)
      .where(and(eq(memberships.firmId, firmId), eq(memberships.userId, auth.userId)))
    if (!m) notFound()
    await tx.update(sessions).set({ currentFirmId: firmId }).where(and(eq(sessions.userId, auth.userId), eq(sessions.id, auth.sessionId)))
  })
  forgetAuth(event)
  return { ok: true }
})

import { eq } from 'drizzle-orm'
import { memberships } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Remove someone from the firm. Their sessions in this firm and their calendar feeds end with it. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'team:manage')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, async (f) => {
    await lockTeam(f)
    const m = await findOr404(f, memberships, id, { lock: true })
    if (m.role === 'owner') await assertAnotherOwner(f, id)
    await f.tx.delete(memberships).where(f.where(memberships, eq(memberships.id, id)))
    await endAccessToFirm(f, m.userId)
    await f.audit('member.removed', 'membership', id, { userId: m.userId, role: m.role })
  })
  setResponseStatus(event, 204)
  return null
})

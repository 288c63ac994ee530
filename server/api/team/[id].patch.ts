import { eq, sql } from 'drizzle-orm'
import { memberships } from '../../db/schema'
import { changeRoleSchema } from '#shared/schemas/auth'
import { idParam } from '#shared/schemas/common'

/** Change someone's role. Owner only; the firm keeps at least one owner. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'team:manage')
  const { id } = await readParamsWith(event, idParam)
  const { role } = await readBodyWith(event, changeRoleSchema)
  return withFirm(auth, async (f) => {
    await lockTeam(f)
    const m = await findOr404(f, memberships, id, { lock: true })
    if (m.role === role) return { id, role }
    if (m.role === 'owner') await assertAnotherOwner(f, id)
    await f.tx.update(memberships).set({ role, updatedAt: sql`now()` }).where(f.where(memberships, eq(memberships.id, id)))
    await f.audit('member.role-changed', 'membership', id, { from: m.role, to: role, userId: m.userId })
    return { id, role }
  })
})

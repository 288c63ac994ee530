import { eq } from 'drizzle-orm'
import { firms, memberships } from '../../db/schema'
import { PERMISSIONS } from '#shared/utils/roles'

/** Who is signed in, in which firm, with which role and permissions, and the firms they can switch to. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  // in the request's transaction (scoped to the current firm): the person's own memberships are
  // visible in it too, and the firms they name (the firms_visible and memberships_visible policies)
  const rows = await withFirm(auth, f => f.tx.select({ id: firms.id, tradingName: firms.tradingName, role: memberships.role })
    .from(memberships).innerJoin(firms, eq(firms.id, memberships.firmId))
    .where(eq(memberships.userId, auth.userId)).orderBy(firms.tradingName))
  const current = rows.find(r => r.id === auth.firmId)
  return {
    user: { id: auth.userId, name: auth.name, email: auth.email },
    firm: { id: auth.firmId, tradingName: current?.tradingName ?? '' },
    role: auth.role,
    permissions: PERMISSIONS.filter(p => can(auth.role, p)),
    firms: rows,
  }
})

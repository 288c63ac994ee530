import { asc, eq } from 'drizzle-orm'
import { memberships, users } from '../db/schema'

/** The firm's people, for choosing who goes to a visit. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  return withFirm(auth, f => f.tx.select({ userId: users.id, name: users.name, role: memberships.role })
    .from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(f.where(memberships)).orderBy(asc(users.name)))
})

import { count, eq, ne } from 'drizzle-orm'
import { memberships } from '../db/schema'

/** A firm keeps at least one owner: refuse (409) a change that would leave it with none. */
export async function assertAnotherOwner(f: FirmScope, membershipId: string) {
  const [row] = await f.tx.select({ n: count() }).from(memberships)
    .where(f.where(memberships, eq(memberships.role, 'owner'), ne(memberships.id, membershipId)))
  if (!row || row.n === 0) {
    throw createError({ statusCode: 409, statusMessage: 'A firm needs an owner', data: { message: 'The firm needs at least one owner. Make someone else an owner first.' } })
  }
}

/** The membership with this id in the current firm, or 404 (the same for another firm's id as for none). */
export async function findMembership(f: FirmScope, id: string) {
  const [m] = await f.tx.select().from(memberships).where(f.where(memberships, eq(memberships.id, id))).for('update')
  if (!m) notFound()
  return m
}

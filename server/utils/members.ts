import { and, eq } from 'drizzle-orm'
import { memberships } from '../db/schema'

/** Is this user a member of the current firm? (For assigning a visit or a job to them.) */
export async function isMember(f: FirmScope, userId: string) {
  const [m] = await f.tx.select({ id: memberships.id }).from(memberships).where(f.where(memberships, and(eq(memberships.userId, userId))))
  return Boolean(m)
}

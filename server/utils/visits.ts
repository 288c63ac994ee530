import { eq } from 'drizzle-orm'
import { visits } from '../db/schema'

/**
 * The visit with this id in the current firm, as the signed-in person may see it: owner and
 * office see every visit; crew only the visits they are down to do (later: of the jobs they are
 * put on). 404 otherwise, the same as a visit that does not exist.
 */
export async function findVisit(f: FirmScope, auth: FirmContext, visitId: string, opts: { lock?: boolean } = {}) {
  const crewOnly = !can(auth.role, 'jobs:read-all')
  return findOr404(f, visits, visitId, { lock: opts.lock, where: crewOnly ? eq(visits.visitorUserId, auth.userId) : undefined })
}

/** May this person change what was measured on a visit? (Owner, office; crew on their own visits.) */
export function canMeasure(auth: FirmContext) {
  return can(auth.role, 'ledger:write') || can(auth.role, 'work:log')
}

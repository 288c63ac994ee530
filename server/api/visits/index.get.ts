import { asc, desc, eq, gte, inArray, lt } from 'drizzle-orm'
import { customers, sites, users, visits } from '../../db/schema'
import { visitListQuery } from '#shared/schemas/visit'

/**
 * Visits still to do (booked) in a period, default from now on, soonest first; or, with
 * show=finished, those done and cancelled, latest first (from any time unless `from` says).
 * Crew see only their own.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  if (!can(auth.role, 'ledger:write') && !can(auth.role, 'jobs:read-assigned')) throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  const q = await readQueryWith(event, visitListQuery)
  const crewOnly = !can(auth.role, 'jobs:read-all')
  const finished = q.show === 'finished'
  return withFirm(auth, f => f.tx.select({
    id: visits.id,
    startsAt: visits.startsAt,
    durationMinutes: visits.durationMinutes,
    status: visits.status,
    doneAt: visits.doneAt,
    cancelReason: visits.cancelReason,
    customer: { id: customers.id, name: customers.name },
    site: { id: sites.id, line1: sites.line1, town: sites.town, postcode: sites.postcode },
    visitor: { id: users.id, name: users.name },
  }).from(visits)
    .innerJoin(customers, f.where(customers, eq(customers.id, visits.customerId)))
    .innerJoin(sites, f.where(sites, eq(sites.id, visits.siteId)))
    .leftJoin(users, eq(users.id, visits.visitorUserId))
    .where(f.where(visits,
      finished ? inArray(visits.status, ['done', 'cancelled']) : eq(visits.status, 'booked'),
      q.from || !finished ? gte(visits.startsAt, new Date(q.from ?? Date.now() - 12 * 3600_000)) : undefined,
      q.to ? lt(visits.startsAt, new Date(q.to)) : undefined,
      crewOnly ? eq(visits.visitorUserId, auth.userId) : undefined,
    ))
    .orderBy(finished ? desc(visits.startsAt) : asc(visits.startsAt)).limit(q.limit))
})

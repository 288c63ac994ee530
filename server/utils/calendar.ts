// A person's iCalendar feed: their booked days on the firm's jobs and the site visits they are
// down to make (no prices), at a secret URL a
// calendar app polls. Only the token's hash is kept; resetting makes a new URL and the old one
// stops at once. Built with the `ics` package.
import { createEvents, type EventAttributes } from 'ics'
import { and, asc, count, eq, gte, inArray, ne, sql } from 'drizzle-orm'
import { auditLog, calendarFeeds, customers, firms, jobDays, jobs, memberships, sites, visits } from '../db/schema'
import { refoldIcs, visitFeedEntry } from '#shared/utils/ics'

export function calendarUrl(token: string) {
  return `${useRuntimeConfig().appUrl.replace(/\/$/, '')}/calendar/${token}.ics`
}

/** Make (or remake) the person's feed in this firm; returns the new URL. */
export async function resetCalendarFeed(f: FirmScope, userId: string) {
  const { token, hash } = newLinkToken(f.firmId)
  await f.tx.insert(calendarFeeds).values({ firmId: f.firmId, userId, tokenHash: hash })
    .onConflictDoUpdate({ target: [calendarFeeds.firmId, calendarFeeds.userId], set: { tokenHash: hash, updatedAt: sql`now()` } })
  await f.audit('calendar.reset', 'user', userId, {})
  return calendarUrl(token)
}

const dateParts = (iso: string): [number, number, number] => {
  const [y, m, d] = iso.split('-').map(Number)
  return [y!, m!, d!]
}

/** The feed behind a token as iCalendar text; 404 for a token that is not (or no longer) a feed. */
export async function calendarFor(token: string): Promise<string> {
  return useDb().transaction(async (tx) => {
    const { f, feed } = await withSecretLink(tx, {
      setting: 'app.calendar_token_hash',
      secret: token,
      find: (tx, tokenHash, firmId) => tx.select({ firmId: calendarFeeds.firmId, tokenHash: calendarFeeds.tokenHash }).from(calendarFeeds).where(and(eq(calendarFeeds.tokenHash, tokenHash), inLinkFirm(calendarFeeds.firmId, firmId))),
      // A feed answers only while its person is a member, and only a feed made (or reset) since they
      // joined: a removed member's link is dead, and stays dead if they are invited back later.
      open: async (f, found) => {
        const [feed] = await f.tx.select({ firmId: calendarFeeds.firmId, userId: calendarFeeds.userId }).from(calendarFeeds)
          .innerJoin(memberships, and(eq(memberships.firmId, calendarFeeds.firmId), eq(memberships.userId, calendarFeeds.userId)))
          .where(and(f.where(calendarFeeds, eq(calendarFeeds.tokenHash, found.tokenHash)), gte(calendarFeeds.updatedAt, memberships.createdAt)))
        return feed && { f, feed }
      },
      gone: () => { throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This calendar link is not right or has been reset. Get the new one from Setwell, under Your account.' } }) },
    })
    const [firm] = await tx.select({ tradingName: firms.tradingName, letters: firms.referenceLetters }).from(firms).where(eq(firms.id, feed.firmId))
    const rows = await tx.select({
      id: jobDays.id, day: jobDays.day, portion: jobDays.portion, number: jobs.number, title: jobs.title, status: jobs.status,
      customer: customers.name, line1: sites.line1, town: sites.town, postcode: sites.postcode, access: sites.accessNotes, updatedAt: jobDays.updatedAt,
    }).from(jobDays)
      .innerJoin(jobs, and(eq(jobs.firmId, jobDays.firmId), eq(jobs.id, jobDays.jobId)))
      .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
      .leftJoin(sites, and(eq(sites.firmId, jobs.firmId), eq(sites.id, jobs.siteId)))
      .where(f.where(jobDays, eq(jobDays.userId, feed.userId)))
      .orderBy(asc(jobDays.day))
    const events: EventAttributes[] = rows.filter(r => r.status !== 'cancelled').map((r) => {
      const start = dateParts(r.day)
      const next = new Date(Date.UTC(start[0], start[1] - 1, start[2] + 1))
      return {
        uid: `${r.id}@setwell`,
        start,
        startInputType: 'local',
        end: [next.getUTCFullYear(), next.getUTCMonth() + 1, next.getUTCDate()],
        title: `${jobReference(firm?.letters || firmLetters(firm?.tradingName ?? ''), r.number)} ${r.customer}${r.portion === 'half-day' ? ' (half day)' : ''}`,
        description: [r.title, r.access ? `Access: ${r.access}` : ''].filter(Boolean).join('\n'),
        location: [r.line1, r.town, r.postcode].filter(Boolean).join(', '),
        status: 'CONFIRMED',
        busyStatus: 'BUSY',
        lastModified: [r.updatedAt.getUTCFullYear(), r.updatedAt.getUTCMonth() + 1, r.updatedAt.getUTCDate(), r.updatedAt.getUTCHours(), r.updatedAt.getUTCMinutes()],
      } satisfies EventAttributes
    })
    events.push(...await visitEvents(f, feed.userId))
    const { error, value } = createEvents(events, { productId: 'setwell/diary', calName: `${firm?.tradingName ?? 'Setwell'} jobs` })
    if (error || value === undefined || value === null) throw error ?? new Error('calendar not made')
    // folded by octets, not characters (RFC 5545, 3.1): see shared/utils/ics.ts
    return refoldIcs(value)
  })
}

const stampOf = (d: Date): [number, number, number, number, number] => [d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes()]

/** The site visits a person is down to make, as events (shared/utils/ics.ts visitFeedEntry: moved, cancelled, done). */
async function visitEvents(f: FirmScope, userId: string): Promise<EventAttributes[]> {
  const rows = await f.tx.select({
    id: visits.id, status: visits.status, startsAt: visits.startsAt, durationMinutes: visits.durationMinutes, notes: visits.notes, updatedAt: visits.updatedAt,
    customer: customers.name, line1: sites.line1, town: sites.town, postcode: sites.postcode, access: sites.accessNotes,
  }).from(visits)
    .innerJoin(customers, and(eq(customers.firmId, visits.firmId), eq(customers.id, visits.customerId)))
    .innerJoin(sites, and(eq(sites.firmId, visits.firmId), eq(sites.id, visits.siteId)))
    .where(f.where(visits, eq(visits.visitorUserId, userId), ne(visits.status, 'cancelled')))
    .orderBy(asc(visits.startsAt))
  // how many times each was moved: the audit log keeps every move (PATCH /api/visits/:id)
  const moves = rows.length
    ? await f.tx.select({ id: auditLog.entityId, n: count() }).from(auditLog)
        .where(f.where(auditLog, eq(auditLog.entity, 'visit'), eq(auditLog.action, 'visit.moved'), inArray(auditLog.entityId, rows.map(r => r.id))))
        .groupBy(auditLog.entityId)
    : []
  const movesOf = new Map(moves.map(m => [m.id, m.n]))
  return rows.flatMap((r) => {
    const entry = visitFeedEntry(r, movesOf.get(r.id) ?? 0)
    if (!entry) return []
    return [{
      uid: entry.uid,
      sequence: entry.sequence,
      start: entry.startMs,
      startInputType: 'utc',
      startOutputType: 'utc',
      end: entry.endMs,
      endInputType: 'utc',
      endOutputType: 'utc',
      title: `Site visit: ${r.customer}`,
      description: [r.notes, r.access ? `Access: ${r.access}` : ''].filter(Boolean).join('\n'),
      location: [r.line1, r.town, r.postcode].filter(Boolean).join(', '),
      status: 'CONFIRMED',
      busyStatus: 'BUSY',
      lastModified: stampOf(r.updatedAt),
    } satisfies EventAttributes]
  })
}

import { and, asc, eq, gte, lte } from 'drizzle-orm'
import { customers, jobDays, jobs, sites, users } from '../db/schema'
import { diaryQuery } from '#shared/schemas/job'

/** The booked days between two dates, with their jobs (and each one's reference) and people; crew see only their own days. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  const { from, to } = await readQueryWith(event, diaryQuery)
  const all = can(auth.role, 'jobs:read-all')
  return withFirm(auth, async (f) => {
    const letters = await referenceLettersOf(f)
    const rows = await f.tx.select({
      id: jobDays.id, day: jobDays.day, portion: jobDays.portion, worked: jobDays.worked,
      userId: jobDays.userId, person: users.name,
      jobId: jobs.id, number: jobs.number, title: jobs.title, status: jobs.status,
      customer: customers.name, town: sites.town, postcode: sites.postcode, line1: sites.line1,
    }).from(jobDays)
      .innerJoin(jobs, and(eq(jobs.firmId, jobDays.firmId), eq(jobs.id, jobDays.jobId)))
      .innerJoin(users, eq(users.id, jobDays.userId))
      .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
      .leftJoin(sites, and(eq(sites.firmId, jobs.firmId), eq(sites.id, jobs.siteId)))
      .where(f.where(jobDays, gte(jobDays.day, from), lte(jobDays.day, to), all ? undefined : eq(jobDays.userId, auth.userId)))
      .orderBy(asc(jobDays.day), asc(jobs.number), asc(users.name))
    return rows.map(r => ({ ...r, reference: jobReference(letters, r.number) }))
  })
})

import { and, desc, eq, sql } from 'drizzle-orm'
import { customers, jobs, sites } from '../../db/schema'
import { jobListQuery } from '#shared/schemas/job'

/**
 * Jobs, newest first, a page at a time (a busy firm has tens of thousands), each with its first
 * booked day; crew see only the jobs they are booked on, with no money.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  const { status, page, pageSize } = await readQueryWith(event, jobListQuery)
  const money = can(auth.role, 'money:read')
  return withFirm(auth, async (f) => {
    // the first booked day of each job on the page only (job_days_person_unique answers it)
    const firstDay = sql<string | null>`(select min(d.day) from job_days d where d.firm_id = ${jobs.firmId} and d.job_id = ${jobs.id})`
    const rows = await f.tx.select({
      id: jobs.id, number: jobs.number, title: jobs.title, status: jobs.status, grossPence: jobs.grossPence,
      customer: customers.name, town: sites.town, postcode: sites.postcode, firstDay, createdAt: jobs.createdAt,
    }).from(jobs)
      .innerJoin(customers, f.where(customers, eq(customers.id, jobs.customerId)))
      .leftJoin(sites, and(eq(sites.firmId, jobs.firmId), eq(sites.id, jobs.siteId)))
      .where(f.where(jobs, status ? eq(jobs.status, status) : undefined, visibleJobs(f, auth)))
      .orderBy(desc(jobs.number)).limit(pageSize).offset((page - 1) * pageSize)
    const letters = await referenceLettersOf(f)
    return rows.map(({ grossPence, ...r }) => ({ ...r, reference: jobReference(letters, r.number), ...(money ? { grossPence } : {}) }))
  })
})

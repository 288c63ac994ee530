import { and, asc, desc, eq, min, sql } from 'drizzle-orm'
import { z } from 'zod'
import { customers, jobDays, jobs, sites } from '../../db/schema'
import { JOB_STATUSES } from '#shared/utils/jobs'

const query = z.object({ status: z.enum(JOB_STATUSES).optional() })

/** Jobs, soonest first by their first booked day; crew see only the jobs they are booked on, with no money. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  const { status } = await readQueryWith(event, query)
  const money = can(auth.role, 'money:read')
  return withFirm(auth, async (f) => {
    const firstDay = f.tx.select({ jobId: jobDays.jobId, first: min(jobDays.day).as('first') }).from(jobDays).where(f.where(jobDays)).groupBy(jobDays.jobId).as('first_day')
    const rows = await f.tx.select({
      id: jobs.id, number: jobs.number, title: jobs.title, status: jobs.status, grossPence: jobs.grossPence,
      customer: customers.name, town: sites.town, postcode: sites.postcode, firstDay: firstDay.first, createdAt: jobs.createdAt,
    }).from(jobs)
      .innerJoin(customers, f.where(customers, eq(customers.id, jobs.customerId)))
      .leftJoin(sites, and(eq(sites.firmId, jobs.firmId), eq(sites.id, jobs.siteId)))
      .leftJoin(firstDay, eq(firstDay.jobId, jobs.id))
      .where(f.where(jobs, status ? eq(jobs.status, status) : undefined, visibleJobs(f, auth)))
      .orderBy(sql`${firstDay.first} asc nulls last`, desc(jobs.number), asc(jobs.id)).limit(200)
    return rows.map(({ grossPence, ...r }) => ({ ...r, reference: jobReference(r.number), ...(money ? { grossPence } : {}) }))
  })
})

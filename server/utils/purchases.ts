// Purchases: what the firm bought, split across the jobs it was for. The VAT summary (input tax)
// and the profit table (materials and other costs per job) read them.
import { and, asc, desc, eq, gte, inArray, lte } from 'drizzle-orm'
import { jobs, purchaseJobs, purchases } from '../db/schema'

/** The split's jobs must be the firm's own (another firm's job id is a field error, as if it did not exist). */
export async function checkJobs(f: FirmScope, split: { jobId: string }[]) {
  if (!split.length) return
  const ids = split.map(j => j.jobId)
  const found = new Set((await f.tx.select({ id: jobs.id }).from(jobs).where(f.where(jobs, inArray(jobs.id, ids)))).map(r => r.id))
  const bad = ids.findIndex(id => !found.has(id))
  if (bad >= 0) throw fieldError({ [`jobs.${bad}.jobId`]: 'Choose one of your jobs.' })
}

export async function saveSplit(f: FirmScope, purchaseId: string, split: { jobId: string, netPence: number }[]) {
  await f.tx.delete(purchaseJobs).where(f.where(purchaseJobs, eq(purchaseJobs.purchaseId, purchaseId)))
  if (split.length) await f.tx.insert(purchaseJobs).values(split.map(j => f.values({ purchaseId, ...j })))
}

export async function purchaseDetail(f: FirmScope, id: string) {
  const p = await findOr404(f, purchases, id)
  const split = await f.tx.select({ jobId: purchaseJobs.jobId, netPence: purchaseJobs.netPence, number: jobs.number })
    .from(purchaseJobs).innerJoin(jobs, and(eq(jobs.firmId, purchaseJobs.firmId), eq(jobs.id, purchaseJobs.jobId)))
    .where(f.where(purchaseJobs, eq(purchaseJobs.purchaseId, id))).orderBy(asc(jobs.number))
  const letters = await referenceLettersOf(f)
  return { ...p, jobs: split.map(s => ({ jobId: s.jobId, netPence: s.netPence, reference: jobReference(letters, s.number) })), documents: await documentsOf(f, { purchaseId: id }) }
}

export async function listPurchases(f: FirmScope, q: { from?: string, to?: string, jobId?: string }) {
  const onJob = q.jobId ? inArray(purchases.id, f.tx.select({ id: purchaseJobs.purchaseId }).from(purchaseJobs).where(f.where(purchaseJobs, eq(purchaseJobs.jobId, q.jobId)))) : undefined
  return f.tx.select().from(purchases)
    .where(f.where(purchases, q.from ? gte(purchases.boughtOn, q.from) : undefined, q.to ? lte(purchases.boughtOn, q.to) : undefined, onJob))
    .orderBy(desc(purchases.boughtOn), desc(purchases.createdAt)).limit(1000)
}

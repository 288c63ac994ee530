// The profit table ("Is the work paying?", issue 7): for each job whose last worked day falls in
// a period, the price against the days it really took (shared/utils/profit.ts jobProfit).
//
// Where each figure comes from (our rules):
// - jobs: not cancelled, with at least one booked day marked worked; the job is in the period when
//   its LAST worked day is (a job is judged once, when its work is done).
// - price net: what was invoiced on the job, net of VAT (issued invoices less issued credit notes,
//   from each one's frozen totals.netPence), once anything is issued; until then the price as won
//   (jobs.net_pence). `priceFrom` says which.
// - materials: the job's share of purchases in the category "materials"; where the job has none,
//   the set log's bags and packs at the cost recorded when logged (each use rounded half up to
//   the penny, as shared/utils/jobs.ts packCostPence does); `materialsFrom` says which.
// - labour paid to others: the job's share of purchases in the category "labour"; other costs:
//   its share of every other category (tools, fuel, vehicle, other).
// - days worked: person-days, each booked day marked worked counting 1 for a day and 0.5 for a
//   half day, for whoever worked it (shared/utils/jobs.ts daysWorked, summed over the people). Two
//   people on site for a day are two days: the day rate the firm aims for is per person.
// - target: the firm's day rate (firms.day_rate_pence).
// - provisional: a job still on site (booked or on site, not marked finished: shared/utils/profit.ts
//   isStillOnSite). Its figures are so far only (a deposit may be all that is invoiced), so the
//   page shows it apart and never judges it against the target.
// Totals: the finished jobs' (and the ones still on site too with `onSite: 'include'`): the sum of
// each pence column and of the days; the effective day rate and the margin are worked out again
// from the totals (not averaged from the rows). `onSiteJobs` counts the jobs still on site.
//
// Five grouped queries whatever the number of jobs; a request covers at most 366 days.
import { and, asc, eq, inArray, isNotNull, ne, sql } from 'drizzle-orm'
import { customers, firms, invoices, jobDays, jobs, materialUses, purchaseJobs, purchases } from '../db/schema'
import { CUSTOMER_KIND_LABELS, type CustomerKind } from '#shared/utils/ledger'
import { isStillOnSite, jobProfit } from '#shared/utils/profit'
import type { ProfitOnSite } from '#shared/schemas/profit'
import type { JobStatus } from '#shared/utils/jobs'
import { poundsCell, toCsv, type CsvCell } from '#shared/utils/csv'

// The query's schema (at most PROFIT_MAX_DAYS days, one kind of customer) is shared/schemas/profit.ts.

/** Shown wherever the figures are (shared/utils/profit.ts gives the basis). */
export const PROFIT_CAUTION = 'A rule of thumb for pricing your work, not accounts or tax advice: these figures leave out your overheads (van, insurance, tools kept between jobs), VAT and tax, and your own time off site (quoting, buying, paperwork); a job still on site shows its figures so far. Your accountant decides what your books say.'

export type PriceFrom = 'invoiced' | 'as-won'
export type MaterialsFrom = 'purchases' | 'set-log' | 'none'
export const PRICE_FROM_WORDS: Record<PriceFrom, string> = { 'invoiced': 'Invoiced', 'as-won': 'Price as won' }
export const MATERIALS_FROM_WORDS: Record<MaterialsFrom, string> = { 'purchases': 'Receipts', 'set-log': 'Set log at cost', 'none': 'None recorded' }

export interface ProfitRow {
  jobId: string
  reference: string
  title: string
  status: JobStatus
  /** Still on site (not yet marked finished): the figures are so far only, kept apart from the totals by default. */
  provisional: boolean
  customerId: string
  customerName: string
  customerKind: CustomerKind
  /** ISO dates of the first and last booked days marked worked. */
  firstDay: string
  lastDay: string
  priceNetPence: number
  priceFrom: PriceFrom
  /** The price the job was won at (jobs.net_pence), whatever has been invoiced so far. */
  priceAsWonPence: number
  /** Materials, other costs and labour paid to others, together. */
  costsPence: number
  materialsPence: number
  materialsFrom: MaterialsFrom
  otherCostsPence: number
  labourPaidPence: number
  /** Person-days worked in halves (a day is 2, half a day 1), and as days (1.5). */
  halfDaysWorked: number
  daysWorked: number
  contributionPence: number
  effectiveDayRatePence: number | null
  targetPricePence: number
  differencePence: number
  marginPercent: number | null
}

export interface ProfitTotals {
  jobs: number
  priceNetPence: number
  costsPence: number
  materialsPence: number
  otherCostsPence: number
  labourPaidPence: number
  halfDaysWorked: number
  daysWorked: number
  contributionPence: number
  effectiveDayRatePence: number | null
  targetPricePence: number
  differencePence: number
  marginPercent: number | null
}

export interface ProfitTable {
  rows: ProfitRow[]
  totals: ProfitTotals
  targetDayRatePence: number
  /** Whether the totals count the jobs still on site ('apart': they do not). */
  onSite: ProfitOnSite
  /** How many of the rows are jobs still on site. */
  onSiteJobs: number
}

/** The profit table of the firm's jobs whose last worked day falls in [from, to]. */
export async function profitTable(f: FirmScope, q: { from: string, to: string, customerKind?: CustomerKind, onSite?: ProfitOnSite }): Promise<ProfitTable> {
  const onSite = q.onSite ?? 'apart'
  const [firm] = await f.tx.select({ dayRatePence: firms.dayRatePence }).from(firms).where(eq(firms.id, f.firmId))
  const targetDayRatePence = firm?.dayRatePence ?? 0

  // 1. the jobs, with their worked days, last worked day in the period
  const lastDay = sql<string>`max(${jobDays.day})`
  const picked = await f.tx.select({
    id: jobs.id, number: jobs.number, title: jobs.title, status: jobs.status, netPence: jobs.netPence,
    customerId: customers.id, customerName: customers.name, customerKind: customers.kind,
    firstDay: sql<string>`min(${jobDays.day})`,
    lastDay,
    halfDays: sql<string>`sum(case when ${jobDays.portion} = 'half-day' then 1 else 2 end)`,
  })
    .from(jobs)
    .innerJoin(jobDays, and(eq(jobDays.firmId, jobs.firmId), eq(jobDays.jobId, jobs.id), eq(jobDays.worked, true)))
    .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
    .where(f.where(jobs, ne(jobs.status, 'cancelled'), q.customerKind ? eq(customers.kind, q.customerKind) : undefined))
    .groupBy(jobs.firmId, jobs.id, customers.firmId, customers.id)
    .having(sql`${lastDay} >= ${q.from} and ${lastDay} <= ${q.to}`)
    .orderBy(asc(lastDay), asc(jobs.number))

  const ids = picked.map(j => j.id)
  const invoiced = new Map<string, number>()
  const costs = new Map<string, { materials: number, hasMaterials: boolean, labour: number, other: number }>()
  const logged = new Map<string, number>()
  if (ids.length) {
    // 2. invoiced net per job: issued invoices less issued credit notes
    const inv = await f.tx.select({
      jobId: invoices.jobId,
      netPence: sql<string>`coalesce(sum(case when ${invoices.kind} = 'credit-note' then -1 else 1 end * coalesce((${invoices.totals}->>'netPence')::bigint, 0)), 0)`,
    })
      .from(invoices)
      .where(f.where(invoices, inArray(invoices.jobId, ids), isNotNull(invoices.issuedOn)))
      .groupBy(invoices.jobId)
    for (const r of inv) invoiced.set(r.jobId!, Number(r.netPence))

    // 3. the job's share of purchases, by category
    const bought = await f.tx.select({ jobId: purchaseJobs.jobId, category: purchases.category, netPence: sql<string>`sum(${purchaseJobs.netPence})` })
      .from(purchaseJobs)
      .innerJoin(purchases, and(eq(purchases.firmId, purchaseJobs.firmId), eq(purchases.id, purchaseJobs.purchaseId)))
      .where(f.where(purchaseJobs, inArray(purchaseJobs.jobId, ids)))
      .groupBy(purchaseJobs.jobId, purchases.category)
    for (const r of bought) {
      const c = costs.get(r.jobId) ?? { materials: 0, hasMaterials: false, labour: 0, other: 0 }
      const pence = Number(r.netPence)
      if (r.category === 'materials') {
        c.materials += pence
        c.hasMaterials = true
      }
      else if (r.category === 'labour') c.labour += pence
      else c.other += pence
      costs.set(r.jobId, c)
    }

    // 4. the set log's materials at the cost recorded, each use rounded half up (packCostPence)
    const uses = await f.tx.select({ jobId: materialUses.jobId, pence: sql<string>`sum((${materialUses.packsX1000}::bigint * ${materialUses.costPencePerPack} + 500) / 1000)` })
      .from(materialUses)
      .where(f.where(materialUses, inArray(materialUses.jobId, ids)))
      .groupBy(materialUses.jobId)
    for (const r of uses) logged.set(r.jobId, Number(r.pence))
  }

  const letters = await referenceLettersOf(f)
  const rows: ProfitRow[] = picked.map((j) => {
    const c = costs.get(j.id) ?? { materials: 0, hasMaterials: false, labour: 0, other: 0 }
    const fromLog = logged.get(j.id)
    const materialsFrom: MaterialsFrom = c.hasMaterials ? 'purchases' : fromLog !== undefined ? 'set-log' : 'none'
    const materialsPence = materialsFrom === 'purchases' ? c.materials : (fromLog ?? 0)
    const inv = invoiced.get(j.id)
    const priceFrom: PriceFrom = inv !== undefined ? 'invoiced' : 'as-won'
    // more credited than invoiced would be a mistake in the invoices; the table shows nothing below zero
    const priceNetPence = Math.max(0, inv ?? j.netPence)
    const halfDaysWorked = Number(j.halfDays)
    const daysWorked = halfDaysWorked / 2
    const profit = jobProfit({ priceNetPence, materialsPence, otherCostsPence: c.other, labourPaidPence: c.labour, daysWorked, targetDayRatePence })
    return {
      jobId: j.id, reference: jobReference(letters, j.number), title: j.title, status: j.status, provisional: isStillOnSite(j.status),
      customerId: j.customerId, customerName: j.customerName, customerKind: j.customerKind,
      firstDay: j.firstDay, lastDay: j.lastDay,
      priceNetPence, priceFrom, priceAsWonPence: j.netPence, costsPence: materialsPence + c.other + c.labour,
      materialsPence, materialsFrom, otherCostsPence: c.other, labourPaidPence: c.labour,
      halfDaysWorked, daysWorked, ...profit,
    }
  })

  const counted = onSite === 'include' ? rows : rows.filter(r => !r.provisional)
  const sum = (k: 'priceNetPence' | 'costsPence' | 'materialsPence' | 'otherCostsPence' | 'labourPaidPence' | 'halfDaysWorked' | 'targetPricePence' | 'differencePence') => counted.reduce((s, r) => s + r[k], 0)
  const halfDaysWorked = sum('halfDaysWorked')
  const whole = jobProfit({ priceNetPence: sum('priceNetPence'), materialsPence: sum('materialsPence'), otherCostsPence: sum('otherCostsPence'), labourPaidPence: sum('labourPaidPence'), daysWorked: halfDaysWorked / 2, targetDayRatePence })
  const totals: ProfitTotals = {
    jobs: counted.length,
    priceNetPence: sum('priceNetPence'),
    costsPence: sum('costsPence'),
    materialsPence: sum('materialsPence'),
    otherCostsPence: sum('otherCostsPence'),
    labourPaidPence: sum('labourPaidPence'),
    halfDaysWorked,
    daysWorked: halfDaysWorked / 2,
    contributionPence: whole.contributionPence,
    effectiveDayRatePence: whole.effectiveDayRatePence,
    // the sums of the rows, so the column adds up as shown (each row's target price is rounded once)
    targetPricePence: sum('targetPricePence'),
    differencePence: sum('differencePence'),
    marginPercent: whole.marginPercent,
  }
  return { rows, totals, targetDayRatePence, onSite, onSiteJobs: rows.filter(r => r.provisional).length }
}

/** The CSV's columns, in words; amounts in pounds with two decimals, dates ISO. */
export const PROFIT_CSV_HEADER = [
  'Job', 'Job title', 'Customer', 'Customer kind', 'First day worked', 'Last day worked', 'Days worked',
  'Price net (pounds)', 'Price from', 'Materials (pounds)', 'Materials from', 'Other costs (pounds)',
  'Labour paid to others (pounds)', 'Left after costs (pounds)', 'Day rate earned (pounds)',
  'Target day rate (pounds)', 'Target price (pounds)', 'Difference from target price (pounds)', 'Margin on the price (percent)',
  'Still on site (figures so far)',
] as const

/** The table as CSV text (one row per job, no totals row, so a spreadsheet's own sums are right). */
export function profitCsv(table: ProfitTable): string {
  const rows: CsvCell[][] = table.rows.map(r => [
    r.reference, r.title, r.customerName, CUSTOMER_KIND_LABELS[r.customerKind], r.firstDay, r.lastDay, String(r.daysWorked),
    poundsCell(r.priceNetPence), PRICE_FROM_WORDS[r.priceFrom], poundsCell(r.materialsPence), MATERIALS_FROM_WORDS[r.materialsFrom],
    poundsCell(r.otherCostsPence), poundsCell(r.labourPaidPence), poundsCell(r.contributionPence), poundsCell(r.effectiveDayRatePence),
    poundsCell(table.targetDayRatePence), poundsCell(r.targetPricePence), poundsCell(r.differencePence),
    r.marginPercent === null ? '' : r.marginPercent.toFixed(1),
    r.provisional ? 'Yes' : 'No',
  ])
  return toCsv(PROFIT_CSV_HEADER, rows)
}

import { asc, desc, eq, max, sql } from 'drizzle-orm'
import { customers, firms, jobs, quoteLines, quotes, quoteVersions } from '../db/schema'
import type { TaxLine } from '#shared/utils/tax'
import { pricedLines, type PricedLine } from '#shared/utils/quote-pricing'
import { linesTotals } from '#shared/utils/money-lines'

export const DRYING_CAUTION = 'Drying times are estimates: a skim coat needs about a week before decorating, longer for undercoats and in cold or damp rooms.'
export const RULE_OF_THUMB = 'Quantities and materials are rules of thumb from the measurements; they are checked on the day. Work follows the Building Regulations where they apply.'

export type QuoteLineRow = typeof quoteLines.$inferSelect

/** Quote lines as tax lines (quantity in units, up to 3 decimals). */
export function taxLines(lines: Pick<QuoteLineRow, 'kind' | 'quantityX1000' | 'unitPence' | 'vatRatePercent'>[]): TaxLine[] {
  return lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 }))
}

// suggestedVat (the VAT treatment a quote or invoice starts with) is in shared/utils/vat-treatment.ts.

export async function currentVersion(f: FirmScope, quote: { id: string, currentVersion: number }, lock = false) {
  const q = f.tx.select().from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.quoteId, quote.id), eq(quoteVersions.version, quote.currentVersion)))
  const [row] = lock ? await q.for('update') : await q
  return row!
}

/** Whether any version of the quote has been accepted (call with the quote locked). */
export async function anyAccepted(f: FirmScope, quoteId: string) {
  const [row] = await f.tx.select({ id: quoteVersions.id }).from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.quoteId, quoteId), eq(quoteVersions.status, 'accepted'))).limit(1)
  return Boolean(row)
}

export async function versionLines(f: FirmScope, versionId: string) {
  return f.tx.select().from(quoteLines).where(f.where(quoteLines, eq(quoteLines.versionId, versionId))).orderBy(asc(quoteLines.position))
}

/** The next quote number of the firm (under a lock on the firm's row, so two at once never share one). */
export async function nextQuoteNumber(f: FirmScope) {
  await f.tx.execute(sql`select 1 from firms where id = ${f.firmId} for update`)
  const [row] = await f.tx.select({ n: max(quotes.number) }).from(quotes).where(f.where(quotes))
  return (row?.n ?? 0) + 1
}

/** Everything about one quote for the firm's screens. */
export async function quoteDetail(f: FirmScope, id: string) {
  const quote = await findOr404(f, quotes, id)
  const [customer] = await f.tx.select({ id: customers.id, name: customers.name, email: customers.email, kind: customers.kind }).from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
  const versions = await f.tx.select({ id: quoteVersions.id, version: quoteVersions.version, status: quoteVersions.status, sentAt: quoteVersions.sentAt, respondedAt: quoteVersions.respondedAt, totals: quoteVersions.totals })
    .from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.quoteId, id))).orderBy(desc(quoteVersions.version))
  const current = await currentVersion(f, quote)
  const { tokenHash: _t, ...publicVersion } = current
  const lines = await versionLines(f, current.id)
  const priced = customerLinesOrWorking(current, lines)
  const [job] = await f.tx.select({ id: jobs.id, number: jobs.number }).from(jobs).where(f.where(jobs, eq(jobs.quoteId, id)))
  const [firm] = await f.tx.select({ tradingName: firms.tradingName, invoicePrefix: firms.invoicePrefix, dayRatePence: firms.dayRatePence }).from(firms).where(eq(firms.id, f.firmId))
  return {
    ...quote, reference: quoteReference(await referenceLettersOf(f), quote.number), job: job ? { id: job.id, reference: jobReference(await referenceLettersOf(f), job.number) } : null, firmName: firm?.tradingName ?? '', firmDayRatePence: firm?.dayRatePence ?? 0, customer, versions,
    current: { ...publicVersion, lines, customerLines: priced.lines, pricingProblem: priced.problem },
  }
}

export type NewLine = Omit<typeof quoteLines.$inferInsert, 'firmId' | 'versionId' | 'id'>

/** Replace a version's lines. */
export async function saveLines(f: FirmScope, versionId: string, lines: NewLine[]) {
  await f.tx.delete(quoteLines).where(f.where(quoteLines, eq(quoteLines.versionId, versionId)))
  if (lines.length) await f.tx.insert(quoteLines).values(lines.map((l, i) => f.values({ ...l, versionId, position: i })))
}

type VersionRow = typeof quoteVersions.$inferSelect

/**
 * The lines the customer sees for a version: its working lines priced the way it is priced
 * (shared/utils/quote-pricing.ts). Throws a 400 on the field at fault when the pricing cannot
 * be worked out (a fixed price below the materials, no day rate).
 */
export function customerLines(version: Pick<VersionRow, 'pricing' | 'estimatedDaysX100' | 'dayRatePence' | 'fixedPricePence'>, working: readonly PricedLine[]): PricedLine[] {
  const result = pricedLines(working, { pricing: version.pricing, estimatedDaysX100: version.estimatedDaysX100, dayRatePence: version.dayRatePence, fixedPricePence: version.fixedPricePence })
  if (!result.ok) throw fieldError({ [result.field]: result.message })
  return result.lines
}

/** The customer's lines, or the working lines when the pricing is not yet complete (a draft being edited). */
export function customerLinesOrWorking(version: Parameters<typeof customerLines>[0], working: readonly PricedLine[]): { lines: PricedLine[], problem: string | null } {
  const result = pricedLines(working, { pricing: version.pricing, estimatedDaysX100: version.estimatedDaysX100, dayRatePence: version.dayRatePence, fixedPricePence: version.fixedPricePence })
  return result.ok ? { lines: result.lines, problem: null } : { lines: [...working], problem: result.message }
}

/** Recompute a version's totals from its lines, priced as chosen, with the shared tax arithmetic, and keep them on the version. */
export async function refreshTotals(f: FirmScope, versionId: string) {
  const [v] = await f.tx.select().from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.id, versionId)))
  const lines = customerLines(v!, await versionLines(f, versionId))
  const totals = linesTotals(lines, v!)
  await f.tx.update(quoteVersions).set({ totals: { ...totals } }).where(f.where(quoteVersions, eq(quoteVersions.id, versionId)))
  return totals
}

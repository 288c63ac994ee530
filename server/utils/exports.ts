// The accountant's exports: one CSV per kind for a period, or all of them in one ZIP (the
// quarter-end pack). Rows come from the database in batches, by keyset (never OFFSET), and each
// batch is written out before the next is read, waiting when the client is slower than the
// database: memory stays flat whatever the range (npm run bench measures it).
//
// House rules (shared/utils/csv.ts): papaparse with formula escaping, UTF-8 with a byte-order
// mark, one header row, ISO dates, amounts in pounds with two decimals in columns named in words.
// Credit notes and refunds are negative, so every amount column adds up.
import type { H3Event } from 'h3'
import { and, asc, eq, gte, inArray, isNotNull, lte, sql } from 'drizzle-orm'
import { Zip, ZipDeflate, strToU8 } from 'fflate'
import { customers, invoiceLines, invoices, jobs, payments, purchases } from '../db/schema'
import type { FirmScope } from './db'
import type { Period } from './quarter'
import { periodQuery } from '#shared/schemas/quarter'
import { type CsvCell, poundsCell, toCsv, UTF8_BOM } from '#shared/utils/csv'
import { INVOICE_KIND_LABELS, PAYMENT_METHOD_LABELS } from '#shared/utils/invoices'
import { longDate } from '#shared/utils/dates'
import { CUSTOMER_KIND_LABELS } from '#shared/utils/ledger'
import { formatQuantity } from '#shared/utils/quantity'
import { lineNetPence } from '#shared/utils/tax'
import { PURCHASE_CATEGORY_LABELS } from '#shared/schemas/purchase'

export const EXPORT_KINDS = ['invoices', 'invoice-lines', 'payments', 'purchases', 'cis-deductions', 'vat-summary', 'vat-breakdown'] as const
export type ExportKind = (typeof EXPORT_KINDS)[number]
export const EXPORT_LABELS: Record<ExportKind, string> = {
  'invoices': 'Invoices and credit notes',
  'invoice-lines': 'Invoice lines',
  'payments': 'Payments received',
  'purchases': 'Purchases',
  'cis-deductions': 'CIS deducted by contractors',
  'vat-summary': 'VAT return boxes',
  'vat-breakdown': 'What makes up each VAT box',
}

/**
 * Rows per query: big enough to be quick, small enough that memory stays flat. At 2,000 a busy
 * year's export grew the server by 65 to 80 MB before the collector ran; at 500 by 30 to 40 MB,
 * for a tenth more time (npm run bench).
 */
export const EXPORT_BATCH = 500

const VAT_WORDS: Record<string, string> = { 'standard': 'Standard', 'reverse-charge': 'Reverse charge', 'not-registered': 'No VAT (not registered)' }
const num = (v: unknown) => Number(v ?? 0)
const signOf = (kind: string) => (kind === 'credit-note' ? -1 : 1)
const pounds = (pence: number, sign = 1) => poundsCell(sign * pence || 0)

interface Source {
  header: readonly string[]
  batches: (f: FirmScope, period: Period) => AsyncGenerator<CsvCell[][]>
}

const INVOICE_HEADER = [
  'Number', 'Kind', 'Issued on', 'Due on', 'Customer', 'Customer kind', 'Credits invoice', 'Job', 'VAT treatment', 'CIS rate (percent)',
  'Labour net (pounds)', 'Materials net (pounds)', 'Net (pounds)', 'VAT (pounds)', 'Reverse charge VAT for the customer (pounds)',
  'Gross (pounds)', 'CIS deduction (pounds)', 'Amount due (pounds)', 'Paid to date (pounds)',
] as const

/**
 * Keyset batches of EXPORT_BATCH rows. The next batch is asked for as soon as this one arrives, so
 * the database reads it while the caller formats and writes this one (npm run bench: the export
 * otherwise waits on the database and on its own formatting in turn).
 */
async function* keysetBatches<R, K>(page: (after: K | null) => PromiseLike<R[]>, keyOf: (last: R) => K): AsyncGenerator<R[]> {
  const ask = (after: K | null) => {
    const pending = Promise.resolve(page(after))
    // handled here, awaited below: a query that fails while this batch is being written is not an
    // unhandled rejection (which would stop the server); its error comes out of the await instead
    pending.catch(() => {})
    return pending
  }
  let next: Promise<R[]> | null = ask(null)
  while (next) {
    const rows: R[] = await next
    next = rows.length === EXPORT_BATCH ? ask(keyOf(rows[rows.length - 1]!)) : null
    if (rows.length) yield rows
  }
}

/**
 * Issued invoices and credit notes in the period, a batch at a time in (issued on, series, number)
 * order. The one query is prepared and run once a batch with the last row's key, on the plan made
 * the first time (see writeCsv): planning it again for each batch cost more than reading the rows.
 */
function issuedInvoices(f: FirmScope, period: Period) {
  type After = { issuedOn: string, series: string, number: number }
  const credited = sql<string | null>`(select c.reference from invoices c where c.firm_id = ${invoices.firmId} and c.id = ${invoices.creditsInvoiceId})`
  const paid = sql<number>`(select coalesce(sum(p.amount_pence), 0)::int from payments p where p.firm_id = ${invoices.firmId} and p.invoice_id = ${invoices.id})`
  const query = f.tx.select({
    id: invoices.id, reference: invoices.reference, kind: invoices.kind, series: invoices.series, number: invoices.number, issuedOn: invoices.issuedOn, dueOn: invoices.dueOn,
    vat: invoices.vat, cisRatePercent: invoices.cisRatePercent, totals: invoices.totals, amountDuePence: invoices.amountDuePence,
    customer: customers.name, customerKind: customers.kind, credits: credited, jobNumber: jobs.number, paidPence: paid,
  })
    .from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .leftJoin(jobs, and(eq(jobs.firmId, invoices.firmId), eq(jobs.id, invoices.jobId)))
    .where(f.where(invoices, isNotNull(invoices.issuedOn), gte(invoices.issuedOn, period.start), lte(invoices.issuedOn, period.end),
      sql`(${invoices.issuedOn}, ${invoices.series}, ${invoices.number}) > (${sql.placeholder('issuedOn')}::date, ${sql.placeholder('series')}::text, ${sql.placeholder('number')}::int)`))
    .orderBy(asc(invoices.issuedOn), asc(invoices.series), asc(invoices.number))
    .limit(EXPORT_BATCH)
    .prepare('export_issued_invoices')
  // the first batch starts before any real key: every series name sorts after '', every number after -1
  const first: After = { issuedOn: period.start, series: '', number: -1 }
  return keysetBatches((after: After | null) => query.execute(after ?? first), (last): After => ({ issuedOn: last.issuedOn!, series: last.series, number: last.number! }))
}

const invoicesSource: Source = {
  header: INVOICE_HEADER,
  async* batches(f, period) {
    const letters = await referenceLettersOf(f)
    for await (const rows of issuedInvoices(f, period)) {
      yield rows.map((r) => {
        const s = signOf(r.kind)
        const t = r.totals
        return [
          r.reference, INVOICE_KIND_LABELS[r.kind], r.issuedOn, r.dueOn ?? '', r.customer, CUSTOMER_KIND_LABELS[r.customerKind], r.credits ?? '',
          r.jobNumber ? jobReference(letters, r.jobNumber) : '', VAT_WORDS[r.vat] ?? r.vat, r.cisRatePercent ?? '',
          pounds(num(t.labourNetPence), s), pounds(num(t.materialsNetPence), s), pounds(num(t.netPence), s), pounds(num(t.vatPence), s),
          pounds(num(t.reverseChargeVatPence), s), pounds(num(t.grossPence), s), pounds(num(t.cisDeductionPence), s), pounds(r.amountDuePence, s),
          r.kind === 'credit-note' ? '' : pounds(num(r.paidPence)),
        ]
      })
    }
  },
}

const linesSource: Source = {
  header: ['Invoice number', 'Issued on', 'Line', 'Labour or materials', 'Description', 'Quantity', 'Unit', 'Unit price (pounds)', 'Line net (pounds)', 'VAT rate (percent)'],
  async* batches(f, period) {
    for await (const batch of issuedInvoices(f, period)) {
      const byId = new Map(batch.map(i => [i.id, i]))
      const lines = await f.tx.select().from(invoiceLines)
        .where(f.where(invoiceLines, inArray(invoiceLines.invoiceId, [...byId.keys()])))
        .orderBy(asc(invoiceLines.invoiceId), asc(invoiceLines.position))
      const grouped = new Map<string, typeof lines>()
      for (const l of lines) grouped.set(l.invoiceId, [...(grouped.get(l.invoiceId) ?? []), l])
      const out: CsvCell[][] = []
      for (const inv of batch) {
        const s = signOf(inv.kind)
        ;(grouped.get(inv.id) ?? []).forEach((l, n) => out.push([
          inv.reference, inv.issuedOn, n + 1, l.kind === 'labour' ? 'Labour' : 'Materials', l.description, formatQuantity(l.quantityX1000), l.unit,
          pounds(l.unitPence), pounds(lineNetPence({ quantity: l.quantityX1000 / 1000, unitPence: l.unitPence }), s), l.vatRatePercent,
        ]))
      }
      if (out.length) yield out
    }
  },
}

const paymentsSource: Source = {
  header: ['Received on', 'Invoice number', 'Customer', 'Method', 'Amount (pounds)', 'Reference', 'Card payment'],
  async* batches(f, period) {
    type After = { receivedOn: string, id: string }
    const page = (after: After | null) => f.tx.select({ id: payments.id, receivedOn: payments.receivedOn, amountPence: payments.amountPence, method: payments.method, reference: payments.reference, intent: payments.stripePaymentIntentId, refund: payments.stripeRefundId, invoice: invoices.reference, customer: customers.name })
      .from(payments)
      .innerJoin(invoices, and(eq(invoices.firmId, payments.firmId), eq(invoices.id, payments.invoiceId)))
      .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
      .where(f.where(payments, gte(payments.receivedOn, period.start), lte(payments.receivedOn, period.end),
        after ? sql`(${payments.receivedOn}, ${payments.id}) > (${after.receivedOn}, ${after.id})` : undefined))
      .orderBy(asc(payments.receivedOn), asc(payments.id))
      .limit(EXPORT_BATCH)
    for await (const rows of keysetBatches(page, (last): After => ({ receivedOn: last.receivedOn, id: last.id }))) {
      yield rows.map(r => [r.receivedOn, r.invoice ?? '', r.customer, PAYMENT_METHOD_LABELS[r.method], pounds(r.amountPence), r.reference, r.refund ?? r.intent ?? ''])
    }
  },
}

const purchasesSource: Source = {
  header: ['Bought on', 'Supplier', 'Category', 'Reference', 'Net (pounds)', 'VAT (pounds)', 'Gross (pounds)', 'Jobs', 'Receipt kept', 'Notes'],
  async* batches(f, period) {
    type After = { boughtOn: string, id: string }
    // each job's reference as shared/utils/references.ts makes it: the firm's job prefix (BP-J) then the number
    const jobsPrefix = jobPrefix(await referenceLettersOf(f))
    const split = sql<string>`coalesce((select string_agg(${jobsPrefix}::text || j.number::text || ' ' || to_char(pj.net_pence / 100.0, 'FM999999990.00'), '; ' order by j.number) from purchase_jobs pj join jobs j on j.firm_id = pj.firm_id and j.id = pj.job_id where pj.firm_id = "purchases"."firm_id" and pj.purchase_id = "purchases"."id"), '')`
    // qualified by hand: drizzle leaves a one-table select's columns unqualified inside sql``
    const kept = sql<boolean>`exists (select 1 from documents d where d.firm_id = "purchases"."firm_id" and d.purchase_id = "purchases"."id")`
    const page = (after: After | null) => f.tx.select({ id: purchases.id, boughtOn: purchases.boughtOn, supplier: purchases.supplier, category: purchases.category, reference: purchases.reference, netPence: purchases.netPence, vatPence: purchases.vatPence, notes: purchases.notes, jobs: split, kept })
      .from(purchases)
      .where(f.where(purchases, gte(purchases.boughtOn, period.start), lte(purchases.boughtOn, period.end),
        after ? sql`(${purchases.boughtOn}, ${purchases.id}) > (${after.boughtOn}, ${after.id})` : undefined))
      .orderBy(asc(purchases.boughtOn), asc(purchases.id))
      .limit(EXPORT_BATCH)
    for await (const rows of keysetBatches(page, (last): After => ({ boughtOn: last.boughtOn, id: last.id }))) {
      yield rows.map(r => [r.boughtOn, r.supplier, PURCHASE_CATEGORY_LABELS[r.category], r.reference, pounds(r.netPence), pounds(r.vatPence), pounds(r.netPence + r.vatPence), r.jobs, r.kept ? 'Yes' : 'No', r.notes])
    }
  },
}

const CIS_STATUS_WORDS = { 'matches': 'Matches the statement', 'differs': 'Differs from the statement', 'no-statement': 'No statement recorded', 'statement-only': 'Statement with no payment recorded' } as const

const cisSource: Source = {
  header: ['Contractor', 'Tax month from', 'Tax month to', 'Gross paid excluding VAT (pounds)', 'Materials (pounds)', 'CIS deducted (pounds)', 'Statement gross (pounds)', 'Statement materials (pounds)', 'Statement deduction (pounds)', 'Reconciled', 'Deduction difference (pounds)', 'Invoices'],
  async* batches(f, period) {
    const { rows } = await cisDeductions(f, period)
    if (!rows.length) return
    yield rows.map(r => [
      r.customerName, r.taxMonthStart, r.taxMonthEnd, pounds(r.grossPence), pounds(r.materialsPence), pounds(r.deductionPence),
      r.statement ? pounds(r.statement.grossPence) : '', r.statement ? pounds(r.statement.materialsPence) : '', r.statement ? pounds(r.statement.deductionPence) : '',
      CIS_STATUS_WORDS[r.status], pounds(r.differencePence), r.invoices.join('; '),
    ])
  },
}

const BOX_WORDS: Record<number, string> = {
  1: 'VAT due on sales and other outputs',
  2: 'VAT due on acquisitions of goods from the EU (Northern Ireland only)',
  3: 'Total VAT due (box 1 + box 2)',
  4: 'VAT reclaimed on purchases and other inputs',
  5: 'Net VAT to pay to HMRC or reclaim (difference between box 3 and box 4)',
  6: 'Total value of sales and all other outputs excluding VAT',
  7: 'Total value of purchases and all other inputs excluding VAT',
  8: 'Total value of supplies of goods to the EU (Northern Ireland only)',
  9: 'Total value of acquisitions of goods from the EU (Northern Ireland only)',
}
export { BOX_WORDS }

const vatSummarySource: Source = {
  header: ['Period from', 'Period to', 'Basis', 'Box', 'What the box is', 'Amount (pounds)', 'Whole pounds for the return'],
  async* batches(f, period) {
    const v = await vatSummary(f, period)
    const basis = v.basis === 'cash' ? 'Cash accounting' : 'Invoice basis'
    yield ([1, 2, 3, 4, 5, 6, 7, 8, 9] as const).map(box => [
      period.start, period.end, basis, box, box === 5 ? `${BOX_WORDS[5]}: ${v.toPay ? 'to pay' : 'to reclaim'}` : BOX_WORDS[box],
      pounds(v.boxes[box]), box >= 6 ? String(v.wholePounds[box as 6 | 7 | 8 | 9]) : '',
    ])
  },
}

const SOURCE_WORDS = { 'invoice': 'Invoice', 'credit-note': 'Credit note', 'payment': 'Payment', 'purchase': 'Purchase' } as const

const vatBreakdownSource: Source = {
  header: ['Box', 'From', 'Reference', 'Date', 'Customer or supplier', 'Net (pounds)', 'VAT (pounds)', 'Note'],
  async* batches(f, period) {
    const v = await vatSummary(f, period)
    if (!v.entries.length) return
    yield v.entries.map(e => [e.box, SOURCE_WORDS[e.source], e.reference, e.date, e.party, pounds(e.netPence), pounds(e.vatPence), e.note])
  },
}

export const EXPORT_SOURCES: Record<ExportKind, Source> = {
  'invoices': invoicesSource,
  'invoice-lines': linesSource,
  'payments': paymentsSource,
  'purchases': purchasesSource,
  'cis-deductions': cisSource,
  'vat-summary': vatSummarySource,
  'vat-breakdown': vatBreakdownSource,
}

export function exportFileName(kind: ExportKind | 'pack', period: Period) {
  return kind === 'pack' ? `setwell-quarter-${period.start}-to-${period.end}.zip` : `setwell-${kind}-${period.start}-to-${period.end}.csv`
}

/** Write a chunk and wait while the socket's buffer is full (the client reads slower than we query). */
function writer(event: H3Event) {
  const res = event.node.res
  return async (chunk: string | Uint8Array) => {
    if (res.destroyed) throw new Error('client went away')
    if (!res.write(chunk)) await new Promise<void>((resolve, reject) => {
      const stop = () => {
        res.off('drain', done)
        res.off('close', gone)
      }
      const done = () => {
        stop()
        resolve()
      }
      const gone = () => {
        stop()
        reject(new Error('client went away'))
      }
      res.on('drain', done)
      res.on('close', gone)
    })
  }
}

function startDownload(event: H3Event, contentType: string, fileName: string) {
  const res = event.node.res
  res.statusCode = 200
  res.setHeader('content-type', contentType)
  res.setHeader('content-disposition', `attachment; filename="${fileName}"`)
  res.setHeader('cache-control', 'private, no-store')
  res.setHeader('x-content-type-options', 'nosniff')
}

/**
 * An export's transaction: read only, one consistent view; and the batch queries keep the plan
 * made for their first run (the keys change, the shape of the work does not).
 */
async function readOnlyExport(f: FirmScope) {
  await f.tx.execute(sql`set transaction read only`)
  await f.tx.execute(sql`set local plan_cache_mode = force_generic_plan`)
}

/** One CSV, streamed. Everything is read in one transaction (one consistent view), a batch at a time. */
export async function streamCsv(event: H3Event, auth: { firmId: string, userId: string }, kind: ExportKind, period: Period) {
  await failMidStream(event, () => writeCsv(event, auth, kind, period))
  await withFirm(auth, f => f.audit('export.downloaded', 'firm', f.firmId, { kind, from: period.start, to: period.end }))
}

/**
 * Once the first bytes are out, an error can no longer be a tidy answer: cut the connection, so
 * the download fails in the browser rather than hanging or ending as a file that looks whole.
 */
async function failMidStream(event: H3Event, fn: () => Promise<void>) {
  try {
    await fn()
  }
  catch (err) {
    if (!event.node.res.headersSent) throw err
    console.error('[exports] failed part way through a download', err)
    event.node.res.destroy(err as Error)
  }
}

async function writeCsv(event: H3Event, auth: { firmId: string, userId: string }, kind: ExportKind, period: Period) {
  const source = EXPORT_SOURCES[kind]
  const write = writer(event)
  let started = false
  await withFirm(auth, async (f) => {
    await readOnlyExport(f)
    for await (const rows of source.batches(f, period)) {
      if (!started) {
        startDownload(event, 'text/csv; charset=utf-8', exportFileName(kind, period))
        await write(UTF8_BOM + toCsv(source.header, [], true))
        started = true
      }
      await write(toCsv(source.header, rows, false))
    }
    if (!started) {
      startDownload(event, 'text/csv; charset=utf-8', exportFileName(kind, period))
      await write(UTF8_BOM + toCsv(source.header, [], true))
    }
  })
  event.node.res.end()
}

export const PACK_NOTE = (period: Period) => [
  `Setwell: the quarter-end pack for ${longDate(period.start)} to ${longDate(period.end)}.`,
  '',
  ...EXPORT_KINDS.map(k => `setwell-${k}-${period.start}-to-${period.end}.csv: ${EXPORT_LABELS[k]}.`),
  '',
  'CSV files in UTF-8, one header row, dates as YYYY-MM-DD, amounts in pounds with two decimals.',
  'Credit notes and refunds are negative. A cell that would start like a spreadsheet formula starts with an apostrophe.',
  'The VAT boxes are worked from what was recorded in Setwell, as a rule of thumb: check them with the firm\'s accountant and HMRC\'s guidance before a return is submitted.',
  '',
].join('\r\n')

/** All the CSVs of a period in one ZIP, compressed as it streams (fflate). */
export async function streamPack(event: H3Event, auth: { firmId: string, userId: string }, period: Period) {
  await failMidStream(event, () => writePack(event, auth, period))
  await withFirm(auth, f => f.audit('export.downloaded', 'firm', f.firmId, { kind: 'pack', from: period.start, to: period.end }))
}

async function writePack(event: H3Event, auth: { firmId: string, userId: string }, period: Period) {
  const write = writer(event)
  let pending: Uint8Array[] = []
  let failed: Error | null = null
  const zip = new Zip((err, chunk) => {
    if (err) failed = err
    else pending.push(chunk)
  })
  const flush = async () => {
    if (failed) throw failed
    const out = pending
    pending = []
    for (const c of out) await write(c)
  }
  startDownload(event, 'application/zip', exportFileName('pack', period))
  await withFirm(auth, async (f) => {
    await readOnlyExport(f)
    const note = new ZipDeflate('about-this-pack.txt', { level: 6 })
    zip.add(note)
    note.push(strToU8(PACK_NOTE(period)), true)
    await flush()
    for (const kind of EXPORT_KINDS) {
      const source = EXPORT_SOURCES[kind]
      const file = new ZipDeflate(`setwell-${kind}-${period.start}-to-${period.end}.csv`, { level: 6 })
      zip.add(file)
      file.push(strToU8(UTF8_BOM + toCsv(source.header, [], true)))
      for await (const rows of source.batches(f, period)) {
        file.push(strToU8(toCsv(source.header, rows, false)))
        await flush()
      }
      file.push(new Uint8Array(0), true)
      await flush()
    }
    zip.end()
    await flush()
  })
  event.node.res.end()
}

/**
 * A download route (server/routes/exports/*.csv and quarter.zip): owner, office and the accountant,
 * who reads only. 400 names a bad period; streamed in batches.
 */
export async function exportDownload(event: H3Event, kind: ExportKind | 'pack') {
  const auth = await requireAuth(event, 'exports:download')
  const q = await readQueryWith(event, periodQuery)
  const period = await withFirm(auth, f => periodOf(f, q))
  if (kind === 'pack') await streamPack(event, auth, period)
  else await streamCsv(event, auth, kind, period)
}

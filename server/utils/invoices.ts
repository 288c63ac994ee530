// Invoices on the server: finding, numbering under a lock, drafting from a job, issuing (frozen
// after), credit notes, payments and the status that follows from them.
import { and, asc, desc, eq, inArray, isNotNull, max, ne, sql } from 'drizzle-orm'
import { chaseNotes, customers, firms, invoiceLines, invoices, jobs, payments, sites, users, type InvoiceParties } from '../db/schema'
import { dueDateFor, finalLines, invoiceStatus, outstandingPence, overpaidPence, partLines, type DraftInvoiceLine, type InvoiceKind } from '#shared/utils/invoices'
import { invoiceTotals } from '#shared/utils/tax'

export type InvoiceRow = typeof invoices.$inferSelect

export const todayIso = () => new Date().toISOString().slice(0, 10)

export async function findInvoice(f: FirmScope, id: string, lock = false) {
  const q = f.tx.select().from(invoices).where(f.where(invoices, eq(invoices.id, id)))
  const [row] = lock ? await q.for('update') : await q
  if (!row) notFound()
  return row
}

export async function linesOf(f: FirmScope, invoiceId: string) {
  return f.tx.select().from(invoiceLines).where(f.where(invoiceLines, eq(invoiceLines.invoiceId, invoiceId))).orderBy(asc(invoiceLines.position))
}

export async function saveInvoiceLines(f: FirmScope, invoiceId: string, lines: DraftInvoiceLine[]) {
  await f.tx.delete(invoiceLines).where(f.where(invoiceLines, eq(invoiceLines.invoiceId, invoiceId)))
  if (lines.length) await f.tx.insert(invoiceLines).values(lines.map((l, i) => f.values({ ...l, invoiceId, position: i })))
}

/** Recompute a draft's totals with the shared tax arithmetic. */
export async function refreshInvoiceTotals(f: FirmScope, invoiceId: string) {
  const [inv] = await f.tx.select().from(invoices).where(f.where(invoices, eq(invoices.id, invoiceId)))
  const lines = await linesOf(f, invoiceId)
  const totals = invoiceTotals(taxLines(lines), { vat: inv!.vat, cisRatePercent: (inv!.cisRatePercent ?? null) as 0 | 20 | 30 | null })
  await f.tx.update(invoices).set({ totals: { ...totals }, amountDuePence: totals.amountDuePence, updatedAt: sql`now()` }).where(f.where(invoices, eq(invoices.id, invoiceId)))
  return totals
}

/** Money in against each invoice (payments less refunds) and credit notes issued against it. */
export async function moneyAgainst(f: FirmScope, invoiceIds: string[]) {
  const paid = new Map<string, number>()
  const credited = new Map<string, number>()
  if (!invoiceIds.length) return { paid, credited }
  const p = await f.tx.select({ invoiceId: payments.invoiceId, total: sql<number>`coalesce(sum(${payments.amountPence}), 0)::int` })
    .from(payments).where(f.where(payments, inArray(payments.invoiceId, invoiceIds))).groupBy(payments.invoiceId)
  for (const r of p) paid.set(r.invoiceId, Number(r.total))
  const c = await f.tx.select({ invoiceId: invoices.creditsInvoiceId, total: sql<number>`coalesce(sum(${invoices.amountDuePence}), 0)::int` })
    .from(invoices).where(f.where(invoices, inArray(invoices.creditsInvoiceId, invoiceIds), isNotNull(invoices.issuedOn))).groupBy(invoices.creditsInvoiceId)
  for (const r of c) credited.set(r.invoiceId!, Number(r.total))
  return { paid, credited }
}

export function statusOf(row: Pick<InvoiceRow, 'id' | 'kind' | 'issuedOn' | 'dueOn' | 'amountDuePence'>, money: Awaited<ReturnType<typeof moneyAgainst>>, today = todayIso()) {
  const input = { issuedOn: row.issuedOn, dueOn: row.dueOn, amountDuePence: row.amountDuePence, paidPence: money.paid.get(row.id) ?? 0, creditedPence: money.credited.get(row.id) ?? 0, today }
  if (row.kind === 'credit-note') return { status: row.issuedOn ? 'issued' as const : 'draft' as const, paidPence: 0, creditedPence: 0, outstandingPence: 0, overpaidPence: 0 }
  return { status: invoiceStatus(input), paidPence: input.paidPence, creditedPence: input.creditedPence, outstandingPence: outstandingPence(input), overpaidPence: overpaidPence(input) }
}

/** Everything about one invoice for the firm's screens. */
export async function invoiceDetail(f: FirmScope, id: string) {
  const inv = await findInvoice(f, id)
  const lines = await linesOf(f, id)
  const [customer] = await f.tx.select({ id: customers.id, name: customers.name, email: customers.email, kind: customers.kind, billingLine1: customers.billingLine1, billingTown: customers.billingTown, billingPostcode: customers.billingPostcode })
    .from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
  const vatSuggested = await suggestedVatFor(f, inv.customerId)
  const [site] = inv.siteId ? await f.tx.select({ line1: sites.line1, town: sites.town, postcode: sites.postcode }).from(sites).where(f.where(sites, eq(sites.id, inv.siteId))) : []
  const [job] = inv.jobId ? await f.tx.select({ id: jobs.id, number: jobs.number, status: jobs.status }).from(jobs).where(f.where(jobs, eq(jobs.id, inv.jobId))) : []
  const paymentRows = await f.tx.select().from(payments).where(f.where(payments, eq(payments.invoiceId, id))).orderBy(asc(payments.receivedOn), asc(payments.createdAt))
  const creditNotes = await f.tx.select({ id: invoices.id, reference: invoices.reference, issuedOn: invoices.issuedOn, amountDuePence: invoices.amountDuePence })
    .from(invoices).where(f.where(invoices, eq(invoices.creditsInvoiceId, id))).orderBy(asc(invoices.createdAt))
  const [credits] = inv.creditsInvoiceId ? await f.tx.select({ id: invoices.id, reference: invoices.reference }).from(invoices).where(f.where(invoices, eq(invoices.id, inv.creditsInvoiceId))) : []
  const money = await moneyAgainst(f, [id])
  const chase = await f.tx.select({ id: chaseNotes.id, kind: chaseNotes.kind, note: chaseNotes.note, promisedOn: chaseNotes.promisedOn, at: chaseNotes.at, sentAt: chaseNotes.sentAt, by: users.name })
    .from(chaseNotes).leftJoin(users, eq(users.id, chaseNotes.byUserId)).where(f.where(chaseNotes, eq(chaseNotes.invoiceId, id))).orderBy(asc(chaseNotes.at))
  const { tokenHash: _t, ...rest } = inv
  return {
    ...rest,
    customer: customer ?? null,
    site: site ?? null,
    job: job ? { id: job.id, reference: jobReference(job.number), status: job.status } : null,
    lines,
    payments: paymentRows,
    creditNotes,
    credits: credits ?? null,
    chase,
    businessCustomer: customer ? customer.kind !== 'homeowner' : false,
    /** The VAT treatment suggested from the firm's and the customer's flags now; another needs a reason. */
    suggestedVat: vatSuggested,
    ...statusOf(inv, money),
  }
}

/** The VAT treatment suggested for an invoice to this customer, from the firm's and the customer's flags. */
export async function suggestedVatFor(f: FirmScope, customerId: string) {
  const [row] = await f.tx.select({ firmVat: firms.vatRegistered, kind: customers.kind, vatRegistered: customers.vatRegistered, paysUnderCis: customers.paysUnderCis, endUserNotified: customers.endUserNotified })
    .from(customers).innerJoin(firms, eq(firms.id, customers.firmId)).where(f.where(customers, eq(customers.id, customerId)))
  if (!row) notFound()
  return suggestedVat({ vatRegistered: row.firmVat }, row)
}

/** The next number of a series, under a lock on the firm's row: no gaps, no duplicates, whatever runs at once. */
export async function nextInvoiceNumber(f: FirmScope, series: 'invoice' | 'credit-note') {
  await f.tx.execute(sql`select 1 from firms where id = ${f.firmId} for update`)
  const [row] = await f.tx.select({ n: max(invoices.number) }).from(invoices).where(f.where(invoices, eq(invoices.series, series)))
  return (row?.n ?? 0) + 1
}

/**
 * What the job's invoices have already claimed (issued or not, not this one), labour and
 * materials apart, less what issued credit notes against them gave back.
 */
export async function invoicedForJob(f: FirmScope, jobId: string, except?: string) {
  const rows = await f.tx.select({ kind: invoices.kind, issuedOn: invoices.issuedOn, totals: invoices.totals }).from(invoices)
    .where(f.where(invoices, eq(invoices.jobId, jobId), except ? ne(invoices.id, except) : undefined))
  return rows.reduce((s, r) => {
    if (r.kind === 'credit-note' && !r.issuedOn) return s
    const sign = r.kind === 'credit-note' ? -1 : 1
    return { labourNetPence: s.labourNetPence + sign * (r.totals.labourNetPence ?? 0), materialsNetPence: s.materialsNetPence + sign * (r.totals.materialsNetPence ?? 0) }
  }, { labourNetPence: 0, materialsNetPence: 0 })
}

/** A new draft: blank for a customer, or from a job (deposit, stage or final). The VAT treatment and CIS rate are suggested from the firm and the customer. */
export async function createDraft(f: FirmScope, input: { kind: Exclude<InvoiceKind, 'credit-note'>, customerId?: string | null, jobId?: string | null, percent?: number | null, amountPence?: number | null }) {
  let customerId = input.customerId ?? null
  let siteId: string | null = null
  let lines: DraftInvoiceLine[] = []
  if (input.jobId) {
    const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, input.jobId)))
    if (!job) throw fieldError({ jobId: 'Choose one of your jobs.' })
    if (job.status === 'cancelled') throw createError({ statusCode: 409, statusMessage: 'Job cancelled', data: { message: 'The job is cancelled: nothing to invoice.' } })
    customerId = job.customerId
    siteId = job.siteId
    const price = { reference: jobReference(job.number), labourNetPence: job.labourNetPence, materialsNetPence: job.materialsNetPence }
    if (input.kind === 'final') {
      lines = finalLines(price, await invoicedForJob(f, job.id))
      if (!lines.length) throw createError({ statusCode: 409, statusMessage: 'Nothing left', data: { message: 'Everything on this job has been invoiced already.' } })
    }
    else if (input.kind === 'deposit' || input.kind === 'stage') {
      const part: { percent: number } | { amountPence: number } | null = input.percent ? { percent: input.percent } : input.amountPence ? { amountPence: input.amountPence } : null
      if (!part) throw fieldError({ percent: 'Enter a percentage or an amount.' })
      const invoiced = await invoicedForJob(f, job.id)
      const left = price.labourNetPence + price.materialsNetPence - invoiced.labourNetPence - invoiced.materialsNetPence
      if ('amountPence' in part && part.amountPence > left) throw fieldError({ amountPence: `That is more than is left to invoice on the job (${formatPence(Math.max(0, left))}).` })
      try {
        lines = partLines(input.kind, price, part)
      }
      catch {
        throw fieldError('percent' in part ? { percent: 'Enter a percentage from 1 to 100.' } : { amountPence: 'Enter an amount in pounds and pence, more than 0.' })
      }
    }
  }
  if (!customerId) throw fieldError({ customerId: 'Choose the customer.' })
  const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, customerId)))
  if (!customer) throw fieldError({ customerId: 'Choose one of your customers.' })
  const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId))
  const vat = suggestedVat(firm!, customer)
  const cis = customer.paysUnderCis ? ((customer.cisRatePercent ?? 20) as 0 | 20 | 30) : null
  if (vat !== 'standard') lines = lines.map(l => ({ ...l, vatRatePercent: vat === 'not-registered' ? 0 : l.vatRatePercent }))
  const [row] = await f.tx.insert(invoices).values(f.values({ kind: input.kind, customerId, siteId, jobId: input.jobId ?? null, vat, cisRatePercent: cis, createdBy: f.userId })).returning()
  await saveInvoiceLines(f, row!.id, lines)
  await refreshInvoiceTotals(f, row!.id)
  await f.audit('invoice.drafted', 'invoice', row!.id, { kind: input.kind, jobId: input.jobId ?? null })
  return row!
}

/**
 * The firm's, the customer's and the site's names and addresses as they are now: what an invoice
 * keeps when it is issued (`invoices.parties`), and what a draft (or an invoice issued before
 * they were kept) shows.
 */
export async function partiesNow(f: FirmScope, inv: Pick<InvoiceRow, 'customerId' | 'siteId'>): Promise<InvoiceParties> {
  const [firm] = await f.tx.select({ tradingName: firms.tradingName, addressLine1: firms.addressLine1, addressLine2: firms.addressLine2, town: firms.town, postcode: firms.postcode, vatRegistered: firms.vatRegistered, vatNumber: firms.vatNumber })
    .from(firms).where(eq(firms.id, f.firmId))
  const [customer] = await f.tx.select({ name: customers.name, billingLine1: customers.billingLine1, billingLine2: customers.billingLine2, billingTown: customers.billingTown, billingPostcode: customers.billingPostcode, vatNumber: customers.vatNumber })
    .from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
  const [site] = inv.siteId ? await f.tx.select({ line1: sites.line1, town: sites.town, postcode: sites.postcode }).from(sites).where(f.where(sites, eq(sites.id, inv.siteId))) : []
  return { firm: firm!, customer: customer!, site: site ?? null }
}

/** Issue a draft: its number, dates and the customer's link; frozen from now on. Returns the link's token. */
export async function issueInvoice(f: FirmScope, id: string) {
  const inv = await findInvoice(f, id, true)
  if (inv.issuedOn) throw createError({ statusCode: 409, statusMessage: 'Already issued', data: { message: 'This invoice has been issued; it stays as it is. Correct it with a credit note.' } })
  const lines = await linesOf(f, id)
  if (!lines.length) throw fieldError({ lines: 'Add at least one line before issuing.' })
  const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId))
  const series = inv.kind === 'credit-note' && firm!.creditNoteNumbering === 'own' ? 'credit-note' as const : 'invoice' as const
  const number = await nextInvoiceNumber(f, series)
  const prefix = series === 'credit-note' ? firm!.creditNotePrefix : firm!.invoicePrefix
  const issuedOn = todayIso()
  const token = newToken()
  await refreshInvoiceTotals(f, id)
  const parties = await partiesNow(f, inv)
  await f.tx.update(invoices).set({
    series, number, reference: `${prefix}${String(number).padStart(4, '0')}`, issuedOn, parties,
    dueOn: inv.kind === 'credit-note' ? null : dueDateFor(issuedOn, firm!.paymentTermsDays),
    tokenHash: inv.kind === 'credit-note' ? null : hashToken(token), updatedAt: sql`now()`,
  }).where(f.where(invoices, eq(invoices.id, id)))
  // a final invoice issued moves a finished job on
  if (inv.jobId && inv.kind === 'final') {
    const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, inv.jobId))).for('update')
    if (job && job.status === 'finished') await moveJob(f, job, 'invoiced', 'Final invoice issued', false)
  }
  await f.audit('invoice.issued', 'invoice', id, { number, series })
  return { token }
}

/** A job is paid once its final invoice is issued and every invoice of it is paid or credited. */
export async function settleJob(f: FirmScope, jobId: string | null) {
  if (!jobId) return
  const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, jobId))).for('update')
  if (!job || job.status !== 'invoiced') return
  const rows = await f.tx.select().from(invoices).where(f.where(invoices, eq(invoices.jobId, jobId), ne(invoices.kind, 'credit-note'), isNotNull(invoices.issuedOn)))
  const money = await moneyAgainst(f, rows.map(r => r.id))
  if (rows.length && rows.every(r => ['paid', 'credited'].includes(statusOf(r, money).status))) await moveJob(f, job, 'paid', 'Every invoice paid', false)
}

/** Record money in (or a refund, negative) and let the invoice and its job follow. */
export async function recordPayment(f: FirmScope, invoiceId: string, p: { method: 'card' | 'transfer' | 'cash' | 'cheque', amountPence: number, receivedOn: string, reference?: string, stripePaymentIntentId?: string | null, stripeRefundId?: string | null }) {
  const [row] = await f.tx.insert(payments).values(f.values({ invoiceId, ...p, reference: p.reference ?? '', recordedBy: f.userId })).returning()
  const [inv] = await f.tx.select({ jobId: invoices.jobId }).from(invoices).where(f.where(invoices, eq(invoices.id, invoiceId)))
  await settleJob(f, inv?.jobId ?? null)
  await f.audit(p.amountPence < 0 ? 'payment.refunded' : 'payment.recorded', 'invoice', invoiceId, { method: p.method, amountPence: p.amountPence })
  return row!
}

export async function listInvoices(f: FirmScope, today = todayIso(), filter: { jobId?: string, limit?: number } = {}) {
  // drafts first, then the newest issued: the issued index read backwards gives this order
  const rows = await f.tx.select({ inv: invoices, customer: customers.name }).from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(f.where(invoices, filter.jobId ? eq(invoices.jobId, filter.jobId) : undefined))
    .orderBy(sql`${invoices.issuedOn} desc nulls first`, desc(invoices.series), desc(invoices.number))
    .limit(filter.limit ?? 500)
  const money = await moneyAgainst(f, rows.map(r => r.inv.id))
  return rows.map(({ inv, customer }) => {
    // the names and addresses kept on each issued invoice are for its own page and PDF, not the list
    const { tokenHash: _t, parties: _p, ...rest } = inv
    return { ...rest, customer, ...statusOf(inv, money, today) }
  })
}

/**
 * Every issued invoice with something still owed (no limit: the owed list and the reminders must
 * see them all), filtered in SQL by its payments and credit notes, with its status; `only`, just
 * those of these ids that are owing.
 */
export async function listOwing(f: FirmScope, today = todayIso(), only?: string[]) {
  if (only && !only.length) return []
  // settled_pence (payments less refunds, and issued credit notes) is kept by triggers as they are
  // written; the partial index invoices_owing_idx holds only the invoices still owing, so this
  // reads a few rows at a busy firm rather than summing a hundred thousand invoices' payments
  const rows = await f.tx.select({ inv: invoices, customer: customers.name }).from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(f.where(invoices, isNotNull(invoices.issuedOn), ne(invoices.kind, 'credit-note'), sql`${invoices.amountDuePence} > ${invoices.settledPence}`,
      only ? inArray(invoices.id, only) : undefined))
    .orderBy(asc(invoices.dueOn), asc(invoices.number))
  const money = await moneyAgainst(f, rows.map(r => r.inv.id))
  return rows.map(({ inv, customer }) => {
    const { tokenHash: _t, ...rest } = inv
    return { ...rest, customer, ...statusOf(inv, money, today) }
  })
}

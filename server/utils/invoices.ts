// Invoices on the server: finding, numbering under a lock, drafting from a job, issuing (frozen
// after), credit notes, payments and the status that follows from them.
import { and, asc, desc, eq, getTableColumns, inArray, isNotNull, max, ne, sql, type SQL } from 'drizzle-orm'
import { chaseNotes, customers, firms, invoiceLines, invoices, jobs, payments, quoteVersions, sites, type InvoiceParties, users } from '../db/schema'
import { dueDateFor, finalFromQuote, finalLines, INVOICE_KIND_LABELS, invoiceStatus, outstandingPence, overpaidPence, partLines, type DraftInvoiceLine, type InvoicedBefore, type InvoiceKind } from '#shared/utils/invoices'
import { londonToday } from '#shared/utils/dates'
import { lineNetPence } from '#shared/utils/tax'
import { linesTotals } from '#shared/utils/money-lines'

export type InvoiceRow = typeof invoices.$inferSelect

/** Today in Britain (not UTC's day: half past midnight in summer is already the next day). */
export const todayIso = (now = new Date()) => londonToday(now)

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
  const totals = linesTotals(lines, inv!)
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
  const inv = await findOr404(f, invoices, id)
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
  const chase = await f.tx.select({ id: chaseNotes.id, kind: chaseNotes.kind, outcome: chaseNotes.outcome, note: chaseNotes.note, promisedPence: chaseNotes.promisedPence, promisedOn: chaseNotes.promisedOn, at: chaseNotes.at, sentAt: chaseNotes.sentAt, byUserId: chaseNotes.byUserId, by: users.name })
    .from(chaseNotes).leftJoin(users, eq(users.id, chaseNotes.byUserId)).where(f.where(chaseNotes, eq(chaseNotes.invoiceId, id))).orderBy(asc(chaseNotes.at))
  const { tokenHash: _t, ...rest } = inv
  return {
    ...rest,
    customer: customer ?? null,
    site: site ?? null,
    job: job ? { id: job.id, reference: jobReference(await referenceLettersOf(f), job.number), status: job.status } : null,
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
 * What the job's invoices claim of its price (drafts included, not this one), labour and
 * materials apart, less what issued credit notes against them gave back. Lines marked as extra
 * work are beyond the price and are not counted. Read from the lines themselves (each line's net
 * rounded as the tax arithmetic does: half up, and half away from zero on a line taking off).
 */
export async function invoicedForJob(f: FirmScope, jobId: string, except?: string) {
  const rows = await f.tx.select({
    kind: invoiceLines.kind,
    net: sql<string>`coalesce(sum(case when ${invoices.kind} = 'credit-note' then -1 else 1 end * round(${invoiceLines.quantityX1000}::numeric * ${invoiceLines.unitPence} / 1000)), 0)`,
  }).from(invoiceLines)
    .innerJoin(invoices, and(eq(invoices.firmId, invoiceLines.firmId), eq(invoices.id, invoiceLines.invoiceId)))
    .where(f.where(invoices, eq(invoices.jobId, jobId), eq(invoiceLines.extraWork, false), except ? ne(invoices.id, except) : undefined,
      sql`(${invoices.kind} <> 'credit-note' or ${invoices.issuedOn} is not null)`))
    .groupBy(invoiceLines.kind)
  const of = (k: 'labour' | 'materials') => Number(rows.find(r => r.kind === k)?.net ?? 0)
  return { labourNetPence: of('labour'), materialsNetPence: of('materials') }
}

/** The job, locked: whatever invoices it at once is counted one after another. */
async function lockJob(f: FirmScope, jobId: string) {
  const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, jobId))).for('update')
  return job ?? null
}

const priceOf = (job: { labourNetPence: number, materialsNetPence: number }) => job.labourNetPence + job.materialsNetPence

/**
 * What a job's invoices claim (drafts included, less issued credit notes, lines of extra work
 * apart) never passes its price: checked under a lock on the job after a change is written, so a
 * breach rolls the change back with a 409. A job with no price agreed (made directly, none given)
 * has nothing to pass.
 */
export async function assertWithinJobPrice(f: FirmScope, jobId: string) {
  const job = await lockJob(f, jobId)
  if (!job || priceOf(job) <= 0) return
  const claimed = await invoicedForJob(f, jobId)
  const total = claimed.labourNetPence + claimed.materialsNetPence
  if (total > priceOf(job)) {
    throw createError({ statusCode: 409, statusMessage: 'More than the price', data: {
      message: `The invoices for ${jobReference(await referenceLettersOf(f), job.number)} would come to ${formatPence(total)} before VAT, more than its price of ${formatPence(priceOf(job))}. Tick "Extra work" on the lines for work beyond the price, or lower the amounts.`,
    } })
  }
}

/**
 * The final invoice of a job made from an accepted quote, while the job's price is still the
 * quote's: the quote's lines as the customer accepted them, with the quote's VAT treatment and CIS
 * rate, less each invoice of the job before it (drafts included, less what credit notes gave back,
 * lines of extra work apart). Totalled like the quote (invoiceTotals over the same lines), so with
 * nothing invoiced before it is the quote to the penny. Null when the job has no accepted quote,
 * its price was changed since, or what was invoiced before cannot be taken off the quote's lines
 * kind by kind and rate by rate (the final is then the price less what was invoiced, as before).
 */
async function finalFromAcceptedQuote(f: FirmScope, job: typeof jobs.$inferSelect) {
  if (!job.quoteVersionId) return null
  const [version] = await f.tx.select().from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.id, job.quoteVersionId)))
  if (!version || version.status !== 'accepted') return null
  const quoteTotals = version.totals as Record<string, number>
  if (quoteTotals.labourNetPence !== job.labourNetPence || quoteTotals.materialsNetPence !== job.materialsNetPence) return null
  const accepted = customerLines(version, await versionLines(f, version.id))
  // what each invoice of the job claimed, by kind and rate, less what issued credit notes against it gave back
  const rows = await f.tx.select({
    id: invoices.id, reference: invoices.reference, kind: invoices.kind, credits: invoices.creditsInvoiceId, issuedOn: invoices.issuedOn,
    lineKind: invoiceLines.kind, rate: invoiceLines.vatRatePercent,
    net: sql<string>`sum(round(${invoiceLines.quantityX1000}::numeric * ${invoiceLines.unitPence} / 1000))`,
  }).from(invoiceLines)
    .innerJoin(invoices, and(eq(invoices.firmId, invoiceLines.firmId), eq(invoices.id, invoiceLines.invoiceId)))
    .where(f.where(invoices, eq(invoices.jobId, job.id), eq(invoiceLines.extraWork, false)))
    .groupBy(invoices.id, invoices.reference, invoices.kind, invoices.creditsInvoiceId, invoices.issuedOn, invoiceLines.kind, invoiceLines.vatRatePercent)
  const claimed = new Map<string, InvoicedBefore & { at: number }>()
  rows.forEach((r, at) => {
    if (r.kind === 'credit-note') return
    const reference = r.reference ?? `the draft ${INVOICE_KIND_LABELS[r.kind].toLowerCase()}`
    claimed.set(`${r.id}|${r.lineKind}|${r.rate}`, { reference, kind: r.lineKind, vatRatePercent: r.rate, netPence: Number(r.net), at })
  })
  for (const r of rows) {
    if (r.kind !== 'credit-note' || !r.issuedOn || !r.credits) continue
    const c = claimed.get(`${r.credits}|${r.lineKind}|${r.rate}`)
    if (c) c.netPence -= Number(r.net)
  }
  const lines = finalFromQuote(accepted, [...claimed.values()].sort((a, b) => a.at - b.at))
  const cisRatePercent = (version.cisRatePercent ?? null) as 0 | 20 | 30 | null
  try {
    const t = linesTotals(lines, { vat: version.vat, cisRatePercent })
    if (t.netPence <= 0) return null
  }
  catch (err) {
    if (err instanceof RangeError) return null
    throw err
  }
  return { lines, vat: version.vat, cisRatePercent }
}

/** A new draft: blank for a customer, or from a job (deposit, stage or final). The VAT treatment and CIS rate are suggested from the firm and the customer. */
export async function createDraft(f: FirmScope, input: { kind: Exclude<InvoiceKind, 'credit-note'>, customerId?: string | null, jobId?: string | null, percent?: number | null, amountPence?: number | null }) {
  let customerId = input.customerId ?? null
  let siteId: string | null = null
  let lines: DraftInvoiceLine[] = []
  let fromQuote: Awaited<ReturnType<typeof finalFromAcceptedQuote>> = null
  if (input.jobId) {
    // the job is locked first: deposits drafted at once are counted one after another
    const job = await lockJob(f, input.jobId)
    if (!job) throw fieldError({ jobId: 'Choose one of your jobs.' })
    if (job.status === 'cancelled') throw createError({ statusCode: 409, statusMessage: 'Job cancelled', data: { message: 'The job is cancelled: nothing to invoice.' } })
    customerId = job.customerId
    siteId = job.siteId
    const price = { reference: jobReference(await referenceLettersOf(f), job.number), labourNetPence: job.labourNetPence, materialsNetPence: job.materialsNetPence }
    if (input.kind === 'final') {
      fromQuote = await finalFromAcceptedQuote(f, job)
      lines = fromQuote?.lines ?? finalLines(price, await invoicedForJob(f, job.id))
      if (!lines.length) throw createError({ statusCode: 409, statusMessage: 'Nothing left', data: { message: 'Everything on this job has been invoiced already.' } })
    }
    else if (input.kind === 'deposit' || input.kind === 'stage') {
      const part: { percent: number } | { amountPence: number } | null = input.percent ? { percent: input.percent } : input.amountPence ? { amountPence: input.amountPence } : null
      if (!part) throw fieldError({ percent: 'Enter a percentage or an amount.' })
      try {
        lines = partLines(input.kind, price, part)
      }
      catch {
        throw fieldError('percent' in part ? { percent: 'Enter a percentage from 1 to 100.' } : { amountPence: 'Enter an amount in pounds and pence, more than 0.' })
      }
      // percentages and amounts alike: never more than is left of the price (under the job's lock)
      const invoiced = await invoicedForJob(f, job.id)
      const left = priceOf(price) - invoiced.labourNetPence - invoiced.materialsNetPence
      const asked = lines.reduce((sum, l) => sum + lineNetPence({ quantity: l.quantityX1000 / 1000, unitPence: l.unitPence }), 0)
      if (priceOf(price) > 0 && asked > left) {
        const field = 'percent' in part ? 'percent' : 'amountPence'
        const words = `That is ${formatPence(asked)}, more than is left to invoice on ${price.reference}: ${formatPence(Math.max(0, left))} of its ${formatPence(priceOf(price))}. Invoice work beyond the price on lines marked as extra work.`
        throw createError({ statusCode: 409, statusMessage: 'More than the price', data: { fields: { [field]: words } } })
      }
    }
  }
  if (!customerId) throw fieldError({ customerId: 'Choose the customer.' })
  const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, customerId)))
  if (!customer) throw fieldError({ customerId: 'Choose one of your customers.' })
  const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId))
  const suggested = suggestedVat(firm!, customer)
  // made from the accepted quote: its VAT treatment and CIS rate, as its totals were worked out
  const vat = fromQuote?.vat ?? suggested
  const cis = fromQuote ? fromQuote.cisRatePercent : customer.paysUnderCis ? ((customer.cisRatePercent ?? 20) as 0 | 20 | 30) : null
  const vatReason = vat !== suggested ? 'As on the accepted quote.' : ''
  if (vat !== 'standard' && !fromQuote) lines = lines.map(l => ({ ...l, vatRatePercent: vat === 'not-registered' ? 0 : l.vatRatePercent }))
  const [row] = await f.tx.insert(invoices).values(f.values({ kind: input.kind, customerId, siteId, jobId: input.jobId ?? null, vat, vatReason, cisRatePercent: cis, createdBy: f.userId })).returning()
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
  const inv = await findOr404(f, invoices, id, { lock: true })
  if (inv.issuedOn) throw createError({ statusCode: 409, statusMessage: 'Already issued', data: { message: 'This invoice has been issued; it stays as it is. Correct it with a credit note.' } })
  const lines = await linesOf(f, id)
  if (!lines.length) throw fieldError({ lines: 'Add at least one line before issuing.' })
  const totals = await refreshInvoiceTotals(f, id)
  if (inv.kind === 'credit-note' && inv.creditsInvoiceId) await assertCreditFits(f, inv.creditsInvoiceId, id, totals.grossPence)
  if (inv.jobId && inv.kind !== 'credit-note') await assertWithinJobPrice(f, inv.jobId)
  // the firm's row is locked before its prefixes are read: numbering and prefixes change one at a time
  const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId)).for('update')
  // an invoice offering payment by transfer needs the account to pay into: refused before a number
  // is taken (nothing is written, and the route sends nothing); a credit note asks for no payment
  if (inv.kind !== 'credit-note' && firm!.takesTransfer && !hasBankAccount(firm)) {
    throw createError({ statusCode: 409, statusMessage: 'Bank details needed', data: { fields: { bankDetails: BANK_DETAILS_NEEDED } } })
  }
  const series = inv.kind === 'credit-note' && firm!.creditNoteNumbering === 'own' ? 'credit-note' as const : 'invoice' as const
  const number = await nextInvoiceNumber(f, series)
  const letters = firm!.referenceLetters || firmLetters(firm!.tradingName)
  const prefix = series === 'credit-note' ? creditNotePrefixOf(letters, firm!.creditNotePrefix) : invoicePrefixOf(letters, firm!.invoicePrefix)
  const reference = invoiceReference(prefix, number)
  const issuedOn = todayIso()
  const { token, hash } = newLinkToken(f.firmId)
  const parties = await partiesNow(f, inv)
  // references are unique per firm (a unique index); prefixes set alike would repeat one: say so, write nothing
  const [clash] = await f.tx.select({ id: invoices.id }).from(invoices).where(f.where(invoices, eq(invoices.reference, reference)))
  if (clash) throw referenceClash(reference)
  try {
    await f.tx.update(invoices).set({
      series, number, reference, issuedOn, parties,
      dueOn: inv.kind === 'credit-note' ? null : dueDateFor(issuedOn, firm!.paymentTermsDays),
      tokenHash: inv.kind === 'credit-note' ? null : hash, updatedAt: sql`now()`,
    }).where(f.where(invoices, eq(invoices.id, id)))
  }
  catch (err) {
    if (isUniqueViolation(err)) throw referenceClash(reference)
    throw err
  }
  // a final invoice issued moves a finished job on
  if (inv.jobId && inv.kind === 'final') {
    const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, inv.jobId))).for('update')
    if (job && job.status === 'finished') await moveJob(f, job, 'invoiced', 'Final invoice issued', false)
  }
  await f.audit('invoice.issued', 'invoice', id, { number, series })
  return { token }
}

function referenceClash(reference: string) {
  return createError({ statusCode: 409, statusMessage: 'Reference in use', data: { message: `${reference} has already been given to another invoice or credit note, so nothing was issued. Give invoices and credit notes different prefixes in Firm settings, then issue again.` } })
}

/**
 * Credit notes against an invoice never give back more than it charged: checked when a credit
 * note is issued, under a lock on the invoice it credits, so notes issued at once are counted one
 * after another.
 */
export async function assertCreditFits(f: FirmScope, creditedId: string, noteId: string, noteGrossPence: number) {
  const credited = await findOr404(f, invoices, creditedId, { lock: true })
  const [row] = await f.tx.select({ total: sql<number>`coalesce(sum((${invoices.totals}->>'grossPence')::bigint), 0)::bigint` }).from(invoices)
    .where(f.where(invoices, eq(invoices.creditsInvoiceId, creditedId), isNotNull(invoices.issuedOn), ne(invoices.id, noteId)))
  const already = Number(row?.total ?? 0)
  const charged = Number(credited.totals.grossPence ?? 0)
  if (already + noteGrossPence > charged) {
    const left = Math.max(0, charged - already)
    throw createError({ statusCode: 409, statusMessage: 'More than the invoice', data: {
      message: `This credit note gives back ${formatPence(noteGrossPence)}, but ${credited.reference} charged ${formatPence(charged)}${already ? ` and ${formatPence(already)} has already been credited` : ''}: at most ${formatPence(left)} can be credited against it. Change the lines, then issue it.`,
    } })
  }
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

/**
 * The other way: a job marked paid whose invoices are no longer all settled (a payment matched
 * from the bank statement was undone) goes back to invoiced. Not a move a person makes, so not
 * through moveJob's table, which has no way back from paid.
 */
export async function unsettleJob(f: FirmScope, jobId: string | null) {
  if (!jobId) return
  const [job] = await f.tx.select().from(jobs).where(f.where(jobs, eq(jobs.id, jobId))).for('update')
  if (!job || job.status !== 'paid') return
  const rows = await f.tx.select().from(invoices).where(f.where(invoices, eq(invoices.jobId, jobId), ne(invoices.kind, 'credit-note'), isNotNull(invoices.issuedOn)))
  const money = await moneyAgainst(f, rows.map(r => r.id))
  if (rows.every(r => ['paid', 'credited'].includes(statusOf(r, money).status))) return
  await f.tx.update(jobs).set({ status: 'invoiced', updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, jobId)))
  await recordJobStatus(f, jobId, 'paid', 'invoiced', 'A payment was taken off')
  await f.audit('job.moved', 'job', jobId, { from: 'paid', to: 'invoiced' })
}

/** The payment recorded for a form's request id, if any (the same request sent again is that payment). */
export async function paymentByRequest(f: FirmScope, requestId: string) {
  const [row] = await f.tx.select().from(payments).where(f.where(payments, eq(payments.requestId, requestId)))
  return row ?? null
}

/** Record money in (or a refund, negative) and let the invoice and its job follow. */
export async function recordPayment(f: FirmScope, invoiceId: string, p: { method: 'card' | 'transfer' | 'cash' | 'cheque', amountPence: number, receivedOn: string, reference?: string, stripePaymentIntentId?: string | null, stripeRefundId?: string | null, requestId?: string | null }) {
  const insert = f.tx.insert(payments).values(f.values({ invoiceId, ...p, reference: p.reference ?? '', recordedBy: f.userId }))
  // a request id already used (on another invoice: the same one is found before this) is a 409, not a 500
  const [row] = p.requestId ? await insert.onConflictDoNothing({ target: [payments.firmId, payments.requestId] }).returning() : await insert.returning()
  if (!row) throw createError({ statusCode: 409, statusMessage: 'Already recorded', data: { message: 'That payment has already been recorded.' } })
  const [inv] = await f.tx.select({ jobId: invoices.jobId }).from(invoices).where(f.where(invoices, eq(invoices.id, invoiceId)))
  await settleJob(f, inv?.jobId ?? null)
  await f.audit(p.amountPence < 0 ? 'payment.refunded' : 'payment.recorded', 'invoice', invoiceId, { method: p.method, amountPence: p.amountPence })
  return row!
}

/** What an invoice has had in (payments less refunds) and credited (issued credit notes), read beside it in the same query. */
export const paidColumn = sql<number>`(select coalesce(sum(p.amount_pence), 0) from ${payments} p where p.firm_id = ${invoices.firmId} and p.invoice_id = ${invoices.id})::int`
export const creditedColumn = sql<number>`(select coalesce(sum(n.amount_due_pence), 0) from ${invoices} n where n.firm_id = ${invoices.firmId} and n.credits_invoice_id = ${invoices.id} and n.issued_on is not null)::int`

/** An invoice's columns as a list shows them: not its token's hash, nor the names and addresses kept for its own page and PDF. */
const { tokenHash: _tokenHash, parties: _parties, ...listColumns } = getTableColumns(invoices)

export async function listInvoices(f: FirmScope, today = todayIso(), filter: { jobId?: string, limit?: number } = {}) {
  // drafts first, then the newest issued: the issued index read backwards gives this order; what
  // each has had in and credited comes in the same query (one round trip, not three)
  const rows = await f.tx.select({ inv: listColumns, customer: customers.name, paid: paidColumn, credited: creditedColumn }).from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(f.where(invoices, filter.jobId ? eq(invoices.jobId, filter.jobId) : undefined))
    .orderBy(sql`${invoices.issuedOn} desc nulls first`, desc(invoices.series), desc(invoices.number))
    .limit(filter.limit ?? 500)
  const money = { paid: new Map(rows.map(r => [r.inv.id, r.paid])), credited: new Map(rows.map(r => [r.inv.id, r.credited])) }
  return rows.map(({ inv, customer }) => ({ ...inv, customer, ...statusOf(inv, money, today) }))
}

/**
 * An issued invoice (not a credit note) with something still to pay: the `owing` column itself, the
 * invoices_owing_idx condition (why a column: server/db/schema/invoices.ts).
 */
export const owing = (f: FirmScope, ...more: (SQL | undefined)[]) => f.where(invoices, sql`${invoices.owing}`, ...more)

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
    .where(owing(f, only ? inArray(invoices.id, only) : undefined))
    .orderBy(asc(invoices.dueOn), asc(invoices.number))
  const money = await moneyAgainst(f, rows.map(r => r.inv.id))
  return rows.map(({ inv, customer }) => {
    const { tokenHash: _t, ...rest } = inv
    return { ...rest, customer, ...statusOf(inv, money, today) }
  })
}

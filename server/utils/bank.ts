// Importing a bank statement file into one of the firm's accounts (issue 20): read as OFX or CSV
// (shared/utils/bank-ofx.ts, bank-csv.ts), each line keyed (lineKeys) and written once per account
// (a unique key: a file imported again, or overlapping one, adds only what is new), all in one
// transaction, so nothing is half-imported.
import Papa from 'papaparse'
import { and, desc, eq, gte, inArray, isNotNull, isNull, lt, lte, sql, type SQL } from 'drizzle-orm'
import { bankAccounts, bankLines, bankMatches, bankStatements, customers, documents, invoices, payments, purchases } from '../db/schema'
import type { PURCHASE_CATEGORIES } from '#shared/schemas/purchase'
import { moneyAgainst, owing, recordPayment, unsettleJob } from './invoices'
import type { FirmScope } from './db'
import { lineKeys, readStatementRows, type BankMapping, type BankCsvLine } from '#shared/utils/bank-csv'
import { readOfx } from '#shared/utils/bank-ofx'
import { PURCHASE_DAYS, proposeAll, proposeMoneyOut } from '#shared/utils/bank-match'
import { addDays } from '#shared/utils/dates'
import { formatPence as pounds } from '#shared/utils/money'

export interface StatementImport { statementId: string, linesNew: number, linesAlready: number, format: 'csv' | 'ofx' }

/** OFX by its header or its root element; anything else is read as CSV. */
export function looksLikeOfx(text: string) {
  const head = text.slice(0, 2000).trimStart()
  return head.startsWith('OFXHEADER') || /<OFX>/i.test(head) || /<\?OFX\b/i.test(head)
}

/**
 * Read the file and write its new lines. A file that cannot be read is a 400 naming its line, with
 * nothing written; a CSV whose header does not name its columns needs `layout` (the person's
 * mapping), which is then remembered for the account.
 */
export async function importStatement(f: FirmScope, accountId: string, file: { data: Buffer, filename: string }, layout?: { headerRow: number, mapping: BankMapping }): Promise<StatementImport> {
  const [account] = await f.tx.select().from(bankAccounts).where(f.where(bankAccounts, eq(bankAccounts.id, accountId))).for('update')
  if (!account) notFound()
  const text = file.data.toString('utf8').replace(/^\uFEFF/, '')
  const format = looksLikeOfx(text) ? 'ofx' : 'csv'
  let lines: (BankCsvLine & { fitId?: string | null })[]
  if (format === 'ofx') {
    const read = readOfx(text)
    if (!read.ok) throw fieldError({ file: read.message })
    lines = read.lines
  }
  else {
    const rows = Papa.parse<string[]>(text, { skipEmptyLines: false }).data
    const given = layout ?? account.csvLayout ?? undefined
    const read = readStatementRows(rows, given)
    if (!read.ok) throw fieldError({ file: read.message }, 400, given ? 'The file does not fit the columns chosen' : 'Check the statement file')
    lines = read.lines
    if (layout) await f.tx.update(bankAccounts).set({ csvLayout: layout }).where(f.where(bankAccounts, eq(bankAccounts.id, accountId)))
  }
  const keys = lineKeys(lines)
  const [statement] = await f.tx.insert(bankStatements).values(f.values({ accountId, fileName: file.filename.slice(0, 200), format, linesNew: 0, linesAlready: 0, importedBy: f.userId })).returning({ id: bankStatements.id })
  let linesNew = 0
  // in batches: a year's statement is thousands of lines
  for (let i = 0; i < lines.length; i += 1000) {
    const batch = lines.slice(i, i + 1000).map((l, j) => f.values({
      accountId, statementId: statement!.id, postedOn: l.date, description: l.description.slice(0, 500), amountPence: l.amountPence, balancePence: l.balancePence, lineKey: keys[i + j]!,
    }))
    const written = await f.tx.insert(bankLines).values(batch).onConflictDoNothing({ target: [bankLines.firmId, bankLines.accountId, bankLines.lineKey] }).returning({ id: bankLines.id })
    linesNew += written.length
  }
  const linesAlready = lines.length - linesNew
  await f.tx.update(bankStatements).set({ linesNew, linesAlready }).where(and(eq(bankStatements.firmId, f.firmId), eq(bankStatements.id, statement!.id)))
  await f.audit('bank.statement-imported', 'bank-account', accountId, { statementId: statement!.id, format, linesNew, linesAlready })
  return { statementId: statement!.id, linesNew, linesAlready, format }
}

/** The most open lines matched in one go: more than a busy firm's year of statements. */
export const MATCH_ALL = 20_000

/**
 * An account's lines, newest first, `limit` of them, with what each could be (shared/utils/
 * bank-match.ts): money in against the firm's owing invoices (the `owing` index), money out against
 * purchases and refunds within a few days and not matched yet. The proposals are worked out over
 * every open line, oldest first, so the page shows what confirming all would do. Matched lines come
 * with what they were matched to. The invoices and purchases named come beside them, by id.
 */
export async function linesWithProposals(f: FirmScope, accountId: string, state: 'open' | 'matched' | 'ignored' = 'open', limit = 200) {
  const lines = await f.tx.select({
    id: bankLines.id, date: bankLines.postedOn, description: bankLines.description, amountPence: bankLines.amountPence,
    balancePence: bankLines.balancePence, state: bankLines.state, note: bankLines.note,
  }).from(bankLines)
    .where(f.where(bankLines, eq(bankLines.accountId, accountId), eq(bankLines.state, state)))
    .orderBy(desc(bankLines.postedOn), desc(bankLines.id)).limit(state === 'open' ? MATCH_ALL : limit)
  const shown = lines.slice(0, limit)
  const none = { invoices: {}, purchases: {}, refunds: {}, recorded: {} }
  if (state === 'matched') {
    const matches = await matchesOf(f, shown.map(l => l.id))
    return { lines: shown.map(l => ({ ...l, proposal: null, matches: matches.get(l.id) ?? [] })), ...none }
  }
  if (state !== 'open' || !lines.length) return { lines: shown.map(l => ({ ...l, proposal: null, matches: [] })), ...none }
  const open = await f.tx.select({
    id: invoices.id, reference: invoices.reference, customerName: customers.name, dueOn: invoices.dueOn,
    outstandingPence: sql<number>`(${invoices.amountDuePence} - ${invoices.settledPence})::int`,
    cisDeductionPence: sql<number>`coalesce((${invoices.totals}->>'cisDeductionPence')::int, 0)`,
    untouched: sql<boolean>`${invoices.settledPence} = 0`,
    person: sql<boolean>`${customers.kind} = 'homeowner'`,
  }).from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(owing(f))
  const out = lines.filter(l => l.amountPence < 0)
  const dates = out.map(l => l.date).sort()
  const from = dates.length ? addDays(dates[0]!, -PURCHASE_DAYS) : null
  const to = dates.length ? addDays(dates.at(-1)!, PURCHASE_DAYS) : null
  const unmatched = (col: SQL) => sql`not exists (select 1 from ${bankMatches} m where m.firm_id = ${f.firmId} and ${col} and m.undone_at is null)`
  const near = from && to
    ? await f.tx.select({
        id: purchases.id, supplier: purchases.supplier, boughtOn: purchases.boughtOn,
        grossPence: sql<number>`(${purchases.netPence} + ${purchases.vatPence})::int`,
      }).from(purchases)
        .where(f.where(purchases, gte(purchases.boughtOn, from), lte(purchases.boughtOn, to), unmatched(sql`m.purchase_id = ${purchases.id}`)))
    : []
  const refunds = from && to
    ? await f.tx.select({ id: payments.id, reference: sql<string>`coalesce(${invoices.reference}, '')`, refundedOn: payments.receivedOn, amountPence: sql<number>`(-${payments.amountPence})::int` })
        .from(payments)
        .innerJoin(invoices, and(eq(invoices.firmId, payments.firmId), eq(invoices.id, payments.invoiceId)))
        .where(f.where(payments, lt(payments.amountPence, 0), gte(payments.receivedOn, from), lte(payments.receivedOn, to), unmatched(sql`m.payment_id = ${payments.id}`)))
    : []
  const ins = lines.filter(l => l.amountPence > 0).map(l => l.date).sort()
  const amountsIn = [...new Set(lines.filter(l => l.amountPence > 0).map(l => l.amountPence))]
  // payments typed in by hand around the lines of money in and not matched yet: a line that is one of them records nothing more
  const recorded = ins.length
    ? await f.tx.select({
        id: payments.id, reference: sql<string>`coalesce(${invoices.reference}, '')`, customerName: customers.name, typed: payments.reference,
        receivedOn: payments.receivedOn, amountPence: payments.amountPence,
      }).from(payments)
        .innerJoin(invoices, and(eq(invoices.firmId, payments.firmId), eq(invoices.id, payments.invoiceId)))
        .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
        .where(f.where(payments, inArray(payments.amountPence, amountsIn), inArray(payments.method, ['transfer', 'cheque']),
          gte(payments.receivedOn, addDays(ins[0]!, -PURCHASE_DAYS)), lte(payments.receivedOn, addDays(ins.at(-1)!, PURCHASE_DAYS)),
          unmatched(sql`m.payment_id = ${payments.id}`)))
    : []
  const moneyIn = new Map(proposeAll(lines.filter(l => l.amountPence > 0), open.map(i => ({ ...i, reference: i.reference ?? '' })), recorded).map(p => [p.lineId, p]))
  const withProposals = shown.map(l => ({ ...l, proposal: l.amountPence > 0 ? moneyIn.get(l.id) ?? null : proposeMoneyOut(l, near, refunds), matches: [] }))
  // what the shown proposals name, for the page to show them by reference and name
  const invoiceIds = new Set(withProposals.flatMap(l => l.proposal && 'parts' in l.proposal ? [...l.proposal.parts.map(p => p.invoiceId), ...l.proposal.alternatives] : []))
  const purchaseIds = new Set(withProposals.flatMap(l => l.proposal && 'match' in l.proposal ? [...(l.proposal.match.kind === 'purchase' ? [l.proposal.match.purchaseId] : []), ...l.proposal.alternatives] : []))
  const refundIds = new Set(withProposals.flatMap(l => l.proposal && 'match' in l.proposal && l.proposal.match.kind === 'refund' ? [l.proposal.match.refundId] : []))
  const recordedIds = new Set(withProposals.flatMap(l => l.proposal && 'recordedPaymentId' in l.proposal && l.proposal.recordedPaymentId ? [l.proposal.recordedPaymentId] : []))
  return {
    lines: withProposals,
    invoices: Object.fromEntries(open.filter(i => invoiceIds.has(i.id)).map(i => [i.id, { reference: i.reference ?? '', customerName: i.customerName, outstandingPence: i.outstandingPence, dueOn: i.dueOn }])),
    purchases: Object.fromEntries(near.filter(p => purchaseIds.has(p.id)).map(p => [p.id, { supplier: p.supplier, boughtOn: p.boughtOn, grossPence: p.grossPence }])),
    refunds: Object.fromEntries(refunds.filter(r => refundIds.has(r.id)).map(r => [r.id, { reference: r.reference, refundedOn: r.refundedOn, amountPence: r.amountPence }])),
    recorded: Object.fromEntries(recorded.filter(r => recordedIds.has(r.id)).map(r => [r.id, { reference: r.reference, customerName: r.customerName, receivedOn: r.receivedOn, amountPence: r.amountPence }])),
  }
}

/** What each matched line was matched to (its live matches), with the invoice's reference and customer or the purchase's supplier. */
interface MatchRow { lineId: string, kind: string, invoiceId: string | null, purchaseId: string | null, amountPence: number, made: boolean, reference: string | null, customerName: string | null, supplier: string | null, confirmedAt: Date }
async function matchesOf(f: FirmScope, lineIds: string[]) {
  const byLine = new Map<string, MatchRow[]>()
  if (!lineIds.length) return byLine
  const rows = await f.tx.select({
    lineId: bankMatches.lineId, kind: bankMatches.kind, invoiceId: bankMatches.invoiceId, purchaseId: bankMatches.purchaseId, amountPence: bankMatches.amountPence,
    made: bankMatches.made, reference: invoices.reference, customerName: customers.name, supplier: purchases.supplier, confirmedAt: bankMatches.confirmedAt,
  }).from(bankMatches)
    .leftJoin(invoices, and(eq(invoices.firmId, bankMatches.firmId), eq(invoices.id, bankMatches.invoiceId)))
    .leftJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .leftJoin(purchases, and(eq(purchases.firmId, bankMatches.firmId), eq(purchases.id, bankMatches.purchaseId)))
    .where(f.where(bankMatches, inArray(bankMatches.lineId, lineIds), isNull(bankMatches.undoneAt)))
  // Map.groupBy is Node 21's
  for (const r of rows) byLine.set(r.lineId, [...byLine.get(r.lineId) ?? [], r])
  return byLine
}

/** How many lines of an account are open, matched and set aside. */
export async function lineCounts(f: FirmScope, accountId: string) {
  const rows = await f.tx.select({ state: bankLines.state, n: sql<number>`count(*)::int` }).from(bankLines)
    .where(f.where(bankLines, eq(bankLines.accountId, accountId))).groupBy(bankLines.state)
  const n = (s: string) => rows.find(r => r.state === s)?.n ?? 0
  return { open: n('open'), matched: n('matched'), ignored: n('ignored') }
}

/** What the partner confirms a line as (shared/schemas/bank.ts bankMatchSchema). */
export type LineChoice
  = | { kind: 'payment', parts: { invoiceId: string, amountPence: number }[] }
    | { kind: 'refund', paymentId: string }
    | { kind: 'recorded', paymentId: string }
    | { kind: 'purchase', purchaseId: string }
    | { kind: 'new-purchase', supplier: string, category: (typeof PURCHASE_CATEGORIES)[number] }
    | { kind: 'payout' }

const conflict = (message: string, statusMessage = 'Not now') => createError({ statusCode: 409, statusMessage, data: { message } })

/** A line of the firm's, locked for this request: two confirmations of it at once queue here, and the second finds it matched. */
export async function lockLine(f: FirmScope, lineId: string) {
  // the account first: confirming one line and confirming all the sure ones queue on it, so the
  // proposals confirmed together are worked out from what is owed after any line confirmed before
  const [of] = await f.tx.select({ accountId: bankLines.accountId }).from(bankLines).where(f.where(bankLines, eq(bankLines.id, lineId)))
  if (!of) notFound()
  await lockAccount(f, of.accountId)
  const [line] = await f.tx.select().from(bankLines).where(f.where(bankLines, eq(bankLines.id, lineId))).for('update')
  if (!line) notFound()
  return line
}

async function lockAccount(f: FirmScope, accountId: string) {
  const [account] = await f.tx.select({ id: bankAccounts.id }).from(bankAccounts).where(f.where(bankAccounts, eq(bankAccounts.id, accountId))).for('update')
  if (!account) notFound()
}

/**
 * Confirm together the lines the partner saw as sure. Proposals are worked out again under the
 * account's lock: a line still open with a sure proposal is confirmed as proposed; the rest are
 * left open and counted (matched meanwhile, or what is owed changed).
 */
export async function confirmSure(f: FirmScope, accountId: string, lineIds: string[]) {
  await lockAccount(f, accountId)
  const wanted = new Set(lineIds)
  // every line named is this account's (another firm's or account's id is a 404, with nothing done)
  const [{ n }] = await f.tx.select({ n: sql<number>`count(*)::int` }).from(bankLines)
    .where(f.where(bankLines, eq(bankLines.accountId, accountId), inArray(bankLines.id, [...wanted]))) as [{ n: number }]
  if (n !== wanted.size) notFound()
  const open = await linesWithProposals(f, accountId, 'open', MATCH_ALL)
  let confirmed = 0
  for (const l of open.lines) {
    if (!wanted.has(l.id) || l.proposal?.certainty !== 'sure') continue
    const p = l.proposal
    const choice: LineChoice = 'parts' in p
      ? (p.payout ? { kind: 'payout' } : p.recordedPaymentId ? { kind: 'recorded', paymentId: p.recordedPaymentId } : { kind: 'payment', parts: p.parts })
      : p.match.kind === 'purchase' ? { kind: 'purchase', purchaseId: p.match.purchaseId } : p.match.kind === 'refund' ? { kind: 'refund', paymentId: p.match.refundId } : null!
    if (!choice) continue
    await confirmLine(f, l.id, choice, { certainty: p.certainty, reasons: p.reasons })
    confirmed++
  }
  if (confirmed) await f.audit('bank.sure-confirmed', 'bank-account', accountId, { asked: wanted.size, confirmed })
  return { confirmed, left: wanted.size - confirmed }
}

/**
 * Confirm what a line is. Money in to invoices records each payment as a hand-entered transfer
 * would be (recordPayment: the owed view, reminders, the job and the VAT cash basis follow), dated
 * the day it reached the bank. A line already matched or set aside is a 409; so is an invoice that
 * takes no payment or owes less than its part (a line never overpays an invoice: what is left over
 * stays on the line's amount), and a purchase or refund already matched to another line. Parts
 * adding up to more than the line are a 400.
 */
export async function confirmLine(f: FirmScope, lineId: string, choice: LineChoice, why: { certainty?: string, reasons?: string[] } = {}) {
  const line = await lockLine(f, lineId)
  if (line.state === 'matched') throw conflict('This line is already matched: undo that first to match it again.', 'Already matched')
  if (line.state === 'ignored') throw conflict('This line was set aside: bring it back to the open lines first.', 'Set aside')
  const incoming = line.amountPence > 0
  if ((choice.kind === 'payment' || choice.kind === 'payout' || choice.kind === 'recorded') !== incoming) {
    throw fieldError({ kind: incoming ? 'Money came in on this line: match it to invoices, or to a Stripe payout.' : 'Money went out on this line: match it to a purchase or a refund.' })
  }
  const match = { lineId, certainty: why.certainty ?? 'chosen', reasons: why.reasons ?? [], confirmedBy: f.userId }
  if (choice.kind === 'payment') {
    const total = choice.parts.reduce((n, p) => n + p.amountPence, 0)
    if (total > line.amountPence) throw fieldError({ parts: `The parts add up to ${pounds(total)}, more than the ${pounds(line.amountPence)} that came in.` })
    // invoices locked in one order, so two lines paying the same two invoices cannot deadlock
    for (const part of [...choice.parts].sort((a, b) => a.invoiceId.localeCompare(b.invoiceId))) {
      const inv = await findOr404(f, invoices, part.invoiceId, { lock: true })
      if (!inv.issuedOn || inv.kind === 'credit-note') throw conflict(`${inv.reference ?? 'A draft'} is not an issued invoice, so it takes no payment.`, 'Not payable')
      const { credited } = await moneyAgainst(f, [inv.id])
      if ((credited.get(inv.id) ?? 0) >= inv.amountDuePence) throw conflict(`Credit notes cancel everything on ${inv.reference}, so nothing is owed on it.`, 'Credited')
      // read under the invoice's lock: a line confirmed a moment ago is in settled_pence already
      const left = inv.amountDuePence - inv.settledPence
      if (part.amountPence > left) throw conflict(left > 0 ? `${inv.reference} has ${pounds(left)} left to pay, less than the ${pounds(part.amountPence)} put against it.` : `${inv.reference} is paid already: choose another invoice, or leave the line for later.`, 'More than owed')
    }
    for (const part of choice.parts) {
      const payment = await recordPayment(f, part.invoiceId, { method: 'transfer', amountPence: part.amountPence, receivedOn: line.postedOn, reference: line.description.slice(0, 200) })
      await f.tx.insert(bankMatches).values(f.values({ ...match, kind: 'payment', invoiceId: part.invoiceId, paymentId: payment.id, made: true, amountPence: part.amountPence }))
    }
  }
  else if (choice.kind === 'refund' || choice.kind === 'recorded') {
    // a refund recorded (money out), or a payment typed in by hand (money in): the line is that payment, and records nothing more
    const [refund] = await f.tx.select().from(payments).where(f.where(payments, eq(payments.id, choice.paymentId), choice.kind === 'refund' ? lt(payments.amountPence, 0) : sql`${payments.amountPence} > 0`)).for('update')
    if (!refund) notFound()
    await notMatchedYet(f, eq(bankMatches.paymentId, refund.id), `That ${choice.kind === 'refund' ? 'refund' : 'payment'} is already matched to another line of the statement.`)
    await f.tx.insert(bankMatches).values(f.values({ ...match, kind: 'payment', invoiceId: refund.invoiceId, paymentId: refund.id, made: false, amountPence: line.amountPence }))
  }
  else if (choice.kind === 'purchase') {
    await findOr404(f, purchases, choice.purchaseId, { lock: true })
    await notMatchedYet(f, eq(bankMatches.purchaseId, choice.purchaseId), 'That purchase is already matched to another line of the statement.')
    await f.tx.insert(bankMatches).values(f.values({ ...match, kind: 'purchase', purchaseId: choice.purchaseId, made: false, amountPence: line.amountPence }))
  }
  else if (choice.kind === 'new-purchase') {
    // VAT is not on a bank line: it waits for the receipt (none is claimed until then)
    const [made] = await f.tx.insert(purchases).values(f.values({
      supplier: choice.supplier, boughtOn: line.postedOn, category: choice.category, netPence: -line.amountPence, vatPence: 0,
      reference: '', notes: 'Made from the bank statement: add the VAT from its receipt when it comes.', createdBy: f.userId,
    })).returning({ id: purchases.id })
    await f.audit('purchase.recorded', 'purchase', made!.id, { netPence: -line.amountPence, fromBankLine: lineId })
    await f.tx.insert(bankMatches).values(f.values({ ...match, kind: 'purchase', purchaseId: made!.id, made: true, amountPence: line.amountPence }))
  }
  else {
    await f.tx.insert(bankMatches).values(f.values({ ...match, kind: 'payout', made: false, amountPence: line.amountPence }))
  }
  await f.tx.update(bankLines).set({ state: 'matched', updatedAt: sql`now()` }).where(f.where(bankLines, eq(bankLines.id, lineId)))
  await f.audit('bank.line-matched', 'bank-line', lineId, { kind: choice.kind })
}

async function notMatchedYet(f: FirmScope, cond: SQL, message: string) {
  const [taken] = await f.tx.select({ id: bankMatches.id }).from(bankMatches).where(f.where(bankMatches, cond, isNull(bankMatches.undoneAt))).limit(1)
  if (taken) throw conflict(message, 'Already matched')
}

/**
 * Undo a line's match: each payment made from it is taken off its invoice (which owes again, and
 * its job, if it was marked paid, goes back to invoiced); a purchase made from it is removed while
 * no receipt has come (with one, it stays for the firm to delete). The line is open again.
 */
export async function undoLine(f: FirmScope, lineId: string) {
  const line = await lockLine(f, lineId)
  if (line.state !== 'matched') throw conflict('This line is not matched, so there is nothing to undo.', 'Not matched')
  const live = await f.tx.select().from(bankMatches).where(f.where(bankMatches, eq(bankMatches.lineId, lineId), isNull(bankMatches.undoneAt)))
  await f.tx.update(bankMatches).set({ undoneAt: sql`now()`, paymentId: sql`case when ${bankMatches.made} then null else ${bankMatches.paymentId} end` })
    .where(f.where(bankMatches, eq(bankMatches.lineId, lineId), isNull(bankMatches.undoneAt)))
  let purchaseKept = false
  for (const m of live) {
    if (m.kind === 'payment' && m.made && m.paymentId) {
      const [gone] = await f.tx.delete(payments).where(f.where(payments, eq(payments.id, m.paymentId))).returning({ invoiceId: payments.invoiceId, amountPence: payments.amountPence })
      if (gone) {
        const [inv] = await f.tx.select({ jobId: invoices.jobId }).from(invoices).where(f.where(invoices, eq(invoices.id, gone.invoiceId)))
        await unsettleJob(f, inv?.jobId ?? null)
        await f.audit('payment.removed', 'invoice', gone.invoiceId, { amountPence: gone.amountPence, fromBankLine: lineId })
      }
    }
    else if (m.kind === 'purchase' && m.made && m.purchaseId) {
      const [receipt] = await f.tx.select({ id: documents.id }).from(documents).where(f.where(documents, eq(documents.purchaseId, m.purchaseId))).limit(1)
      if (receipt) {
        purchaseKept = true
        continue
      }
      // the undone match keeps no hold on it
      await f.tx.delete(bankMatches).where(f.where(bankMatches, eq(bankMatches.purchaseId, m.purchaseId), isNotNull(bankMatches.undoneAt)))
      await f.tx.delete(purchases).where(f.where(purchases, eq(purchases.id, m.purchaseId)))
      await f.audit('purchase.deleted', 'purchase', m.purchaseId, { fromBankLine: lineId })
    }
  }
  await f.tx.update(bankLines).set({ state: 'open', updatedAt: sql`now()` }).where(f.where(bankLines, eq(bankLines.id, lineId)))
  await f.audit('bank.line-unmatched', 'bank-line', lineId, {})
  return { purchaseKept }
}

/** A note on a line left for later, or the line set aside (not the firm's business: a transfer between its own accounts) or brought back. */
export async function noteLine(f: FirmScope, lineId: string, change: { note?: string, state?: 'open' | 'ignored' }) {
  const line = await lockLine(f, lineId)
  if (change.state && line.state === 'matched') throw conflict('This line is matched: undo the match to set it aside.', 'Already matched')
  await f.tx.update(bankLines).set({ ...change, updatedAt: sql`now()` }).where(f.where(bankLines, eq(bankLines.id, lineId)))
  await f.audit('bank.line-noted', 'bank-line', lineId, { state: change.state ?? line.state })
}

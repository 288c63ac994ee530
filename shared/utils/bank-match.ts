// Matching a bank statement's money in to the firm's unsettled invoices (issue 20). Pure: the
// server reads the open invoices and the statement's lines and saves what the partner confirms.
//
// In order: an invoice reference in the line's description (spaces, dashes, case and leading
// zeros do not matter: "brp 17" is BRP-0017), then the exact amount still owed (an invoice's
// amount due is already net of any CIS deduction; a contractor who paid the whole before the
// deduction is matched on the total), then the customer's name in the description. Several
// invoices paid by one transfer (references, or amounts of one customer's invoices adding up) and
// one invoice paid in parts are both proposed. Each proposal says why and how sure it is; only
// "sure" ones may be confirmed all at once, and an amount that fits more than one invoice is
// never "sure".

export interface OpenInvoice {
  id: string
  reference: string
  customerName: string
  /** What is still to pay (amount due less what was paid and credited). */
  outstandingPence: number
  /** The CIS deduction on it, when the customer is a contractor (0 otherwise). */
  cisDeductionPence: number
  /** Nothing paid or credited yet (the whole before the deduction can then be matched). */
  untouched: boolean
  dueOn: string | null
  /** The customer is a person (a homeowner), so the last word of the name is a surname. */
  person?: boolean
}
export interface MoneyInLine { id: string, date: string, description: string, amountPence: number }
export type Certainty = 'sure' | 'likely' | 'possible'
export interface Proposal {
  lineId: string
  /** Each invoice and how much of the line goes to it (they add up to the line, or less for an overpayment left over). */
  parts: { invoiceId: string, amountPence: number }[]
  certainty: Certainty
  /** Why, in words for the partner: "reference BRP-0017 in the description; amount equal". */
  reasons: string[]
  /** Other invoices the line could be (an ambiguous amount): shown, never chosen for the partner. */
  alternatives: string[]
  /** A Stripe payout: its card payments were recorded as each was paid, so it settles nothing more. */
  payout?: true
  /** A payment already recorded by hand that this line is: it settles nothing more. */
  recordedPaymentId?: string
}

/** A payment of money in already recorded by hand (a transfer or cheque typed in before the statement came). */
export interface RecordedPayment {
  id: string
  /** The invoice's reference. */
  reference: string
  customerName: string
  /** What was typed as the payment's own reference ("MILLBECK FLAT5 DEP"), often the bank's words. */
  typed: string
  receivedOn: string
  amountPence: number
  /** What its invoice still owes: as much again or more, and the line may be the next payment, not this one. */
  invoiceOwingPence?: number
}
const words = (s: string) => ` ${s.toUpperCase().replace(/[^A-Z0-9]+/g, ' ').trim()} `

/** Stripe's name in a line of money in: a payout of card payments already recorded one by one. */
export const isStripePayout = (line: MoneyInLine) => line.amountPence > 0 && /\bstripe\b/i.test(line.description)

/** A reference's key: its letters and its number without leading zeros ("BRP-0017", "brp 17" -> "BRP#17"). */
export function referenceKey(reference: string): string | null {
  const m = /^([a-z]{1,6})[\s\-_/#.]*0*(\d{1,7})$/i.exec(reference.trim())
  return m ? `${m[1]!.toUpperCase()}#${Number(m[2])}` : null
}

/** Every reference-like key in a description: letters then a number, with spaces or dashes between or not. */
export function keysInDescription(description: string): Set<string> {
  const keys = new Set<string>()
  for (const m of description.matchAll(/(?<![a-z])([a-z]{1,6})[\s\-_/#.]*0*(\d{1,7})(?!\d)/gi)) keys.add(`${m[1]!.toUpperCase()}#${Number(m[2])}`)
  return keys
}

/** The words of a name that must all be in a description: three letters or more, "Ltd" and the like left out. */
const nameWords = (name: string) => name.toUpperCase().split(/[^A-Z0-9]+/).filter(w => w.length >= 3 && !['LTD', 'LIMITED', 'PLC', 'THE', 'AND', 'LLP'].includes(w))

/** A name's words in the description (every word of three letters or more, "Ltd" and the like left out). */
export function nameInDescription(name: string, description: string, words = nameWords(name)): boolean {
  if (!words.length) return false
  const text = ` ${description.toUpperCase().replace(/[^A-Z0-9]+/g, ' ')} `
  return words.every(w => text.includes(` ${w} `))
}

/** The last word of a person's name (four letters or more) in the description: how a transfer often names its payer. */
export function surnameInDescription(name: string, description: string, words = nameWords(name)): boolean {
  const last = words.at(-1)
  if (!last || last.length < 4 || words.length < 2) return false
  return ` ${description.toUpperCase().replace(/[^A-Z0-9]+/g, ' ')} `.includes(` ${last} `)
}

/**
 * Each invoice's reference key and name words worked out once for a whole statement, not once per
 * line (a year's statement against a busy firm's owing invoices: the bench's bank section).
 */
export interface MatchMemo { key: (reference: string) => string | null, words: (name: string) => string[] }
export function matchMemo(): MatchMemo {
  const keys = new Map<string, string | null>()
  const words = new Map<string, string[]>()
  return {
    key: (r) => {
      if (!keys.has(r)) keys.set(r, referenceKey(r))
      return keys.get(r)!
    },
    words: (n) => {
      if (!words.has(n)) words.set(n, nameWords(n))
      return words.get(n)!
    },
  }
}

const pounds = (p: number) => `£${(p / 100).toFixed(2)}`

/** The proposal for one line of money in, or null when nothing fits. */
export function proposeMoneyIn(line: MoneyInLine, open: readonly OpenInvoice[], memo: MatchMemo = matchMemo()): Proposal | null {
  if (line.amountPence <= 0) return null
  const base = { lineId: line.id, alternatives: [] as string[] }
  if (isStripePayout(line)) return { ...base, parts: [], certainty: 'sure', payout: true, reasons: ['a Stripe payout: its card payments were recorded as each was paid, so nothing more is recorded'] }
  const keys = keysInDescription(line.description)
  const byRef = open.filter(i => keys.has(memo.key(i.reference) ?? ''))
    .sort((a, b) => (a.dueOn ?? '').localeCompare(b.dueOn ?? ''))
  if (byRef.length) {
    const refs = byRef.map(i => i.reference).join(' and ')
    const why = `${byRef.length > 1 ? 'references' : 'reference'} ${refs} in the description`
    const owed = byRef.reduce((n, i) => n + i.outstandingPence, 0)
    if (line.amountPence === owed) return { ...base, parts: byRef.map(i => ({ invoiceId: i.id, amountPence: i.outstandingPence })), certainty: 'sure', reasons: [why, byRef.length > 1 ? 'amounts add up' : 'amount equal'] }
    if (byRef.length === 1 && byRef[0]!.untouched && byRef[0]!.cisDeductionPence > 0 && line.amountPence === owed + byRef[0]!.cisDeductionPence) {
      return { ...base, parts: [{ invoiceId: byRef[0]!.id, amountPence: owed }], certainty: 'likely', reasons: [why, `paid the total before the CIS deduction (${pounds(byRef[0]!.cisDeductionPence)} more than due): check with the contractor`] }
    }
    if (line.amountPence < owed) {
      // a part payment: to the oldest first
      let left = line.amountPence
      const parts = byRef.flatMap((i) => {
        const take = Math.min(left, i.outstandingPence)
        left -= take
        return take > 0 ? [{ invoiceId: i.id, amountPence: take }] : []
      })
      return { ...base, parts, certainty: 'sure', reasons: [why, `part payment: ${pounds(line.amountPence)} of ${pounds(owed)}`] }
    }
    return { ...base, parts: byRef.map(i => ({ invoiceId: i.id, amountPence: i.outstandingPence })), certainty: 'possible', reasons: [why, `${pounds(line.amountPence - owed)} more than is owed`] }
  }
  const named = (i: OpenInvoice) => nameInDescription(i.customerName, line.description, memo.words(i.customerName))
  const exact = open.filter(i => i.outstandingPence === line.amountPence)
  if (exact.length) {
    const withName = exact.filter(named)
    if (withName.length === 1) return { ...base, parts: [{ invoiceId: withName[0]!.id, amountPence: line.amountPence }], certainty: 'sure', reasons: ['amount equal', `${withName[0]!.customerName} in the description`] }
    if (exact.length === 1) return { ...base, parts: [{ invoiceId: exact[0]!.id, amountPence: line.amountPence }], certainty: 'likely', reasons: ['amount equal, and no other invoice is owed that much'] }
    // a surname alone ("FASTER PAYMENT DUNMORE"): likely the one whose customer it is, the others
    // owed as much shown beside it; never sure (two customers can share a surname)
    const bySurname = exact.filter(i => i.person && surnameInDescription(i.customerName, line.description, memo.words(i.customerName)))
    if (bySurname.length === 1) {
      const i = bySurname[0]!
      return { ...base, parts: [{ invoiceId: i.id, amountPence: line.amountPence }], certainty: 'likely', reasons: ['amount equal', `${i.customerName.split(/\s+/).at(-1)} in the description (the surname only): check it`], alternatives: exact.filter(x => x !== i).map(x => x.id) }
    }
    const pick = (withName.length ? withName : exact).sort((a, b) => (a.dueOn ?? '').localeCompare(b.dueOn ?? ''))
    return { ...base, parts: [{ invoiceId: pick[0]!.id, amountPence: line.amountPence }], certainty: 'possible', reasons: [`amount equal to ${exact.length} invoices: choose which`], alternatives: pick.slice(1).map(i => i.id) }
  }
  const theirs = open.filter(named).sort((a, b) => (a.dueOn ?? '').localeCompare(b.dueOn ?? ''))
  if (theirs.length) {
    const customer = theirs[0]!.customerName
    // two or three of their invoices adding up to the transfer
    const sum = subsetAddingUp(theirs, line.amountPence)
    if (sum) return { ...base, parts: sum.map(i => ({ invoiceId: i.id, amountPence: i.outstandingPence })), certainty: 'likely', reasons: [`${customer} in the description`, `${sum.length} of their invoices add up to it`] }
    const owed = theirs.reduce((n, i) => n + i.outstandingPence, 0)
    if (line.amountPence < owed) {
      return { ...base, parts: [{ invoiceId: theirs[0]!.id, amountPence: Math.min(line.amountPence, theirs[0]!.outstandingPence) }], certainty: 'possible', reasons: [`${customer} in the description`, `${pounds(line.amountPence)} of ${pounds(owed)} they owe: their oldest invoice first`] }
    }
  }
  return null
}

/** At most three invoices whose amounts still owed add up to `pence` (the first found, oldest first). */
function subsetAddingUp(invoices: readonly OpenInvoice[], pence: number): OpenInvoice[] | null {
  const list = invoices.slice(0, 30)
  for (let a = 0; a < list.length; a++) {
    for (let b = a + 1; b < list.length; b++) {
      const ab = list[a]!.outstandingPence + list[b]!.outstandingPence
      if (ab === pence) return [list[a]!, list[b]!]
      for (let c = b + 1; c < list.length; c++) {
        if (ab + list[c]!.outstandingPence === pence) return [list[a]!, list[b]!, list[c]!]
      }
    }
  }
  return null
}

/**
 * Proposals for a statement's lines of money in: what one line takes is no longer owed when the
 * next is looked at, so two transfers never both settle the same invoice. The lines that name an
 * owing invoice's reference go first (oldest first), then the rest: a guess on amount and name
 * never takes the invoice a later line names.
 */
export function proposeAll(lines: readonly MoneyInLine[], open: readonly OpenInvoice[], recorded: readonly RecordedPayment[] = []): Proposal[] {
  const left = new Map(open.map(i => [i.id, { ...i }]))
  const byAmount = recordedByAmount(recorded)
  const claimed = new Set<string>()
  const memo = matchMemo()
  const owingKeys = new Set(open.map(i => memo.key(i.reference)).filter(k => k !== null))
  const byDate = [...lines].sort((a, b) => a.date.localeCompare(b.date) || a.id.localeCompare(b.id))
  const naming = new Set(byDate.filter(l => [...keysInDescription(l.description)].some(k => owingKeys.has(k))))
  const out: Proposal[] = []
  for (const line of [...byDate.filter(l => naming.has(l)), ...byDate.filter(l => !naming.has(l))]) {
    const already = isStripePayout(line) ? null : alreadyRecorded(line, byAmount, claimed, naming.has(line))
    if (already) {
      claimed.add(already.recordedPaymentId!)
      out.push(already)
      continue
    }
    const p = proposeMoneyIn(line, [...left.values()].filter(i => i.outstandingPence > 0), memo)
    if (!p) continue
    out.push(p)
    for (const part of p.parts) {
      const i = left.get(part.invoiceId)!
      i.outstandingPence -= part.amountPence
      i.untouched = false
    }
  }
  return out
}

/**
 * The payment typed in by hand that this line of money in is: the same amount, received within
 * PURCHASE_DAYS of it (a transfer is often recorded the day the customer says it was sent), and
 * the description naming its invoice, its customer or what was typed as its reference. Without one
 * of those it is not taken for that payment: at a busy firm many payments are of the same amount.
 * Confirming it records nothing more, so the money is never counted twice. A line that names an
 * owing invoice (`referenceOnly`) is taken for a recorded payment only when it names that payment's
 * own invoice. `byAmount`: the
 * recorded payments by amount (recordedByAmount), looked up rather than scanned for each line.
 */
export function alreadyRecorded(line: MoneyInLine, byAmount: ReadonlyMap<number, readonly RecordedPayment[]>, taken: ReadonlySet<string> = new Set(), referenceOnly = false): Proposal | null {
  if (line.amountPence <= 0) return null
  const near = (byAmount.get(line.amountPence) ?? []).filter(r => !taken.has(r.id) && daysApart(r.receivedOn, line.date) <= PURCHASE_DAYS)
  if (!near.length) return null
  const keys = keysInDescription(line.description)
  const text = words(line.description)
  const pick = near.filter(r => keys.has(referenceKey(r.reference) ?? '') || (!referenceOnly && (nameInDescription(r.customerName, line.description)
    || (words(r.typed).trim().length >= 4 && text.includes(words(r.typed))))))
    .sort((a, b) => daysApart(a.receivedOn, line.date) - daysApart(b.receivedOn, line.date))[0]
  if (!pick) return null
  // the invoice still owing as much again: the line may be its next payment (a second half of the same amount)
  const more = (pick.invoiceOwingPence ?? 0) >= line.amountPence
  return {
    lineId: line.id, parts: [], alternatives: [], recordedPaymentId: pick.id, certainty: more ? 'likely' : 'sure',
    reasons: [`a payment of ${pounds(pick.amountPence)} on ${pick.reference} was recorded by hand already: nothing more is recorded`, 'its reference or the customer in the description',
      ...(more ? [`${pick.reference} still owes ${pounds(pick.invoiceOwingPence!)}: if this is its next payment, record it on the invoice instead`] : [])],
  }
}

/** Recorded payments by amount, for alreadyRecorded. */
export function recordedByAmount(recorded: readonly RecordedPayment[]): Map<number, RecordedPayment[]> {
  const out = new Map<number, RecordedPayment[]>()
  for (const r of recorded) out.set(r.amountPence, [...out.get(r.amountPence) ?? [], r])
  return out
}

/** A purchase the firm recorded (what it bought, from whom, when, for how much with VAT). */
export interface OpenPurchase { id: string, supplier: string, boughtOn: string, grossPence: number }
/** A refund to a customer the firm recorded (money out that is not a purchase). */
export interface RecordedRefund { id: string, reference: string, refundedOn: string, amountPence: number }
export interface MoneyOutProposal {
  lineId: string
  /** A recorded purchase or refund this line pays, or a new purchase to make from it. */
  match: { kind: 'purchase', purchaseId: string } | { kind: 'refund', refundId: string } | { kind: 'new-purchase', supplier: string, boughtOn: string, grossPence: number }
  certainty: Certainty
  reasons: string[]
  alternatives: string[]
}

/** How many days a card payment may reach the statement after (or before) the day of the purchase. */
export const PURCHASE_DAYS = 4
const daysApart = (a: string, b: string) => Math.abs(Date.parse(`${a}T00:00:00Z`) - Date.parse(`${b}T00:00:00Z`)) / 86_400_000
/** Words a bank puts before a merchant's name on a card payment. */
const CARD_WORDS = /^(?:card payment|card purchase|debit card|contactless|pos|visa|cpm?|dd|card)\b[\s:-]*(?:to\s+)?/i

/** When the purchase was made, against the day the card payment reached the statement. */
function boughtWhen(boughtOn: string, paidOn: string) {
  const days = daysApart(boughtOn, paidOn)
  if (days === 0) return 'bought the same day'
  return `bought ${days === 1 ? 'a day' : `${days} days`} ${boughtOn < paidOn ? 'before' : 'after'}`
}

/** The supplier's name in the description: its first word of three letters or more (card lines cut names short). */
function supplierInDescription(supplier: string, description: string): boolean {
  const first = supplier.toUpperCase().split(/[^A-Z0-9]+/).find(w => w.length >= 3 && !['THE', 'LTD'].includes(w))
  return !!first && ` ${description.toUpperCase().replace(/[^A-Z0-9]+/g, ' ')} `.includes(` ${first} `)
}

/** The proposal for one line of money out: a recorded purchase or refund, a new purchase from a card payment, or null. */
export function proposeMoneyOut(line: MoneyInLine, purchases: readonly OpenPurchase[], refunds: readonly RecordedRefund[] = []): MoneyOutProposal | null {
  if (line.amountPence >= 0) return null
  const pence = -line.amountPence
  const base = { lineId: line.id, alternatives: [] as string[] }
  const keys = keysInDescription(line.description)
  const refund = refunds.find(r => r.amountPence === pence && daysApart(r.refundedOn, line.date) <= PURCHASE_DAYS)
  if (refund) {
    const referenced = keys.has(referenceKey(refund.reference) ?? '')
    return { ...base, match: { kind: 'refund', refundId: refund.id }, certainty: referenced ? 'sure' : 'likely', reasons: [`a refund of ${pounds(pence)} recorded on ${refund.reference}`, ...(referenced ? ['its reference in the description'] : [])] }
  }
  const near = purchases.filter(p => p.grossPence === pence && daysApart(p.boughtOn, line.date) <= PURCHASE_DAYS)
    .sort((a, b) => daysApart(a.boughtOn, line.date) - daysApart(b.boughtOn, line.date))
  const named = near.filter(p => supplierInDescription(p.supplier, line.description))
  const pick = named.length === 1 ? named : near
  if (pick.length === 1) {
    const p = pick[0]!
    return { ...base, match: { kind: 'purchase', purchaseId: p.id }, certainty: named.length === 1 ? 'sure' : 'likely', reasons: ['amount equal', boughtWhen(p.boughtOn, line.date), ...(named.length === 1 ? [`${p.supplier} in the description`] : [])] }
  }
  if (pick.length > 1) {
    return { ...base, match: { kind: 'purchase', purchaseId: pick[0]!.id }, certainty: 'possible', reasons: [`amount equal to ${pick.length} purchases within ${PURCHASE_DAYS} days: choose which`], alternatives: pick.slice(1).map(p => p.id) }
  }
  if (CARD_WORDS.test(line.description)) {
    const supplier = line.description.replace(CARD_WORDS, '').replace(/\s+on\s+\d{1,2}\s+[a-z]{3}.*$/i, '').trim()
    if (supplier) return { ...base, match: { kind: 'new-purchase', supplier, boughtOn: line.date, grossPence: pence }, certainty: 'possible', reasons: ['a card payment with no purchase recorded: make it a purchase, waiting for its receipt'] }
  }
  return null
}

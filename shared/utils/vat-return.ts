// The nine boxes of a VAT Return for one period, worked from the firm's sales (invoices and credit
// notes), the payments received against them and its purchases, with the breakdown of which
// documents make up each box and which were left out and why.
//
// A rule of thumb for the product, not tax advice: the figures drive what the firm pays HMRC, so
// the product says wherever it shows them that HMRC's guidance and the firm's accountant decide,
// and that the return is checked before it is sent. Nothing here submits a return.
//
// Sources:
// - The boxes (HMRC VAT Notice 700/12 "How to fill in and submit your VAT Return", section 3, box
//   by box): box 1 VAT due on sales; box 2 VAT due on acquisitions of goods from the EU (Northern
//   Ireland goods only: always 0 for this trade here); box 3 = box 1 + box 2; box 4 VAT reclaimed on
//   purchases; box 5 the difference between boxes 3 and 4 (section 3.6), paid to HMRC or reclaimed;
//   box 6 total sales excluding VAT; box 7 total purchases excluding VAT; boxes 8 and 9 goods to and
//   from the EU (Northern Ireland only: 0 here). Boxes 6 to 9 are whole pounds. Credit notes issued
//   reduce the boxes.
// - Domestic reverse charge for construction services (gov.uk "How to use the VAT domestic reverse
//   charge if you supply building and construction services"; VAT Notice 700/12 section 4.6): the
//   supplier puts the net in box 6 only; the customer accounts for the VAT, so nothing in box 1.
// - Cash accounting (HMRC VAT Notice 731; VAT Regulations 1995 reg. 57): output VAT is due when the
//   customer pays, not when the invoice is issued. A part payment carries its share of the VAT
//   (the apportionment below is our reading: a fair share by value).
// - Reverse-charge sales are kept out of the cash accounting scheme and accounted for under the
//   reverse charge, on the invoice (gov.uk reverse charge guidance and HMRC manual VATREVCON35200,
//   both from memory: check them): on the cash basis they count when
//   issued, box 6 only, and payments against them add nothing.
//
// Our rules on top (as briefed):
// - Invoice basis: a sale counts when its issuedOn is in [start, end], both days included.
// - Cash basis: a payment counts when its receivedOn is in [start, end]. Its share of the invoice
//   is payment / amountDuePence, and amountDuePence is the gross less any CIS deduction, so a CIS
//   deduction counts as paid along with the payment it was taken from. The payment adds
//   net x share to box 6 and VAT x share to box 1, each rounded once to the penny, halves away from
//   zero (so a refund, a negative payment, takes back exactly what the same payment added), in
//   exact BigInt arithmetic. Credit notes do not count on the cash basis (money goes back as
//   refunds); they are listed in `excluded`.
// - Sales issued when the firm was not VAT registered are left out, and listed in `excluded`.
// - Purchases are receipts, paid when bought, so both bases count them by boughtOn: VAT in box 4,
//   net in box 7.
// - Boxes 6 to 9 in whole pounds drop the pence, toward zero (-123.45 -> -123).
// - Bad input (a date that is not a real YYYY-MM-DD date, start after end, pence that are not
//   whole numbers or are negative where they cannot be, a sale id given twice, a counted payment
//   for an unknown invoice, a credit note or an invoice with nothing due) is a RangeError naming
//   the field.
import { formatPence } from './money'
import { isoDate, pence, shareOf, text, toSafe } from './checks/exact'

export type VatTreatment = 'standard' | 'reverse-charge' | 'not-registered'
export interface VatSale {
  id: string
  reference: string
  issuedOn: string
  kind: 'invoice' | 'credit-note'
  vat: VatTreatment
  /** Positive for invoices and credit notes alike; a credit note reduces the boxes. */
  netPence: number
  vatPence: number
  /** Gross less any CIS deduction: what the customer pays. */
  amountDuePence: number
  customerName: string
}
/** Refunds are negative. */
export interface VatPayment { id: string, invoiceId: string, receivedOn: string, amountPence: number }
export interface VatPurchase { id: string, reference: string, supplier: string, boughtOn: string, netPence: number, vatPence: number }
export type VatBox = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9
export interface VatEntry {
  box: 1 | 4 | 6 | 7
  source: 'invoice' | 'credit-note' | 'payment' | 'purchase'
  /** The document's id (the payment's own id for a payment). */
  id: string
  /** The document's reference (the invoice's reference for a payment). */
  reference: string
  date: string
  party: string
  /** Signed as it goes into the return: negative for credit notes and refunds. */
  netPence: number
  vatPence: number
  note: string
}
export interface VatReturn {
  basis: 'invoice' | 'cash'
  start: string
  end: string
  /** Pence; boxes 6 to 9 also in whole pounds below. */
  boxes: Record<VatBox, number>
  /** Boxes 6 to 9 in whole pounds, pence dropped toward zero (VAT Notice 700/12). */
  wholePounds: { 6: number, 7: number, 8: number, 9: number }
  /** True when box 3 >= box 4 (the firm pays box 5); false when it reclaims. */
  toPay: boolean
  /**
   * What makes up each box, one entry per document per box it feeds: boxes 1 and 4 are the sums of
   * their entries' vatPence, boxes 6 and 7 of their entries' netPence.
   */
  entries: VatEntry[]
  excluded: { id: string, reference: string, reason: string }[]
}
export interface VatReturnInput { basis: 'invoice' | 'cash', start: string, end: string, sales: VatSale[], payments: VatPayment[], purchases: VatPurchase[] }

const REASON_NOT_REGISTERED = 'Issued when the firm was not VAT registered: no VAT to account for, so it is left out of the return.'
const REASON_CASH_CREDIT = 'Credit notes do not count on the cash basis: any money paid back counts instead, as a refund against the invoice.'
const REASON_CASH_REVERSE = 'Payment for a reverse-charge invoice: reverse-charge sales stay out of cash accounting and count when the invoice is issued (HMRC\'s reverse charge guidance).'

function oneOf<T extends string>(value: unknown, allowed: readonly T[], field: string): T {
  if (!allowed.includes(value as T)) throw new RangeError(`${field} must be one of ${allowed.join(', ')}, got ${String(value)}`)
  return value as T
}

const inRange = (date: string, start: string, end: string) => start <= date && date <= end

/**
 * The VAT Return for [start, end] on the invoice or the cash basis (see the file's note for the
 * rules, the sources and the rounding). Rules of thumb for the product, not tax advice: HMRC's
 * guidance and the firm's accountant decide.
 */
export function vatReturn(input: VatReturnInput): VatReturn {
  const basis = oneOf(input.basis, ['invoice', 'cash'] as const, 'basis')
  const start = isoDate(input.start, 'start')
  const end = isoDate(input.end, 'end')
  if (start > end) throw new RangeError(`start (${start}) must not be after end (${end})`)
  if (!Array.isArray(input.sales)) throw new RangeError('sales must be a list')
  if (!Array.isArray(input.payments)) throw new RangeError('payments must be a list')
  if (!Array.isArray(input.purchases)) throw new RangeError('purchases must be a list')

  const sales = new Map<string, VatSale & { net: bigint, tax: bigint, due: bigint }>()
  input.sales.forEach((s, i) => {
    const f = `sales[${i}]`
    const id = text(s.id, `${f}.id`)
    if (sales.has(id)) throw new RangeError(`${f}.id ${id} is given twice`)
    text(s.reference, `${f}.reference`)
    text(s.customerName, `${f}.customerName`)
    isoDate(s.issuedOn, `${f}.issuedOn`)
    oneOf(s.kind, ['invoice', 'credit-note'] as const, `${f}.kind`)
    oneOf(s.vat, ['standard', 'reverse-charge', 'not-registered'] as const, `${f}.vat`)
    sales.set(id, { ...s, net: pence(s.netPence, `${f}.netPence`), tax: pence(s.vatPence, `${f}.vatPence`), due: pence(s.amountDuePence, `${f}.amountDuePence`) })
  })
  const payments = input.payments.map((p, i) => {
    const f = `payments[${i}]`
    text(p.id, `${f}.id`)
    text(p.invoiceId, `${f}.invoiceId`)
    isoDate(p.receivedOn, `${f}.receivedOn`)
    return { ...p, amount: pence(p.amountPence, `${f}.amountPence`, null), field: f }
  })
  const purchases = input.purchases.map((p, i) => {
    const f = `purchases[${i}]`
    text(p.id, `${f}.id`)
    text(p.reference, `${f}.reference`)
    text(p.supplier, `${f}.supplier`)
    isoDate(p.boughtOn, `${f}.boughtOn`)
    return { ...p, net: pence(p.netPence, `${f}.netPence`), vat: pence(p.vatPence, `${f}.vatPence`) }
  })

  const entries: VatEntry[] = []
  const excluded: VatReturn['excluded'] = []
  const excludedIds = new Set<string>()
  const exclude = (id: string, reference: string, reason: string) => {
    if (excludedIds.has(id)) return
    excludedIds.add(id)
    excluded.push({ id, reference, reason })
  }
  const totals = { 1: 0n, 4: 0n, 6: 0n, 7: 0n }
  const add = (e: Omit<VatEntry, 'netPence' | 'vatPence'>, net: bigint, vat: bigint) => {
    totals[e.box] += e.box === 1 || e.box === 4 ? vat : net
    entries.push({ ...e, netPence: toSafe(net, `${e.id} net`), vatPence: toSafe(vat, `${e.id} VAT`) })
  }

  // Sales by the day they were issued: every sale on the invoice basis; on the cash basis only
  // reverse-charge sales (VATREVCON35200), with the credit notes listed as left out.
  for (const s of sales.values()) {
    if (!inRange(s.issuedOn, start, end)) continue
    if (s.vat === 'not-registered') {
      exclude(s.id, s.reference, REASON_NOT_REGISTERED)
      continue
    }
    const credit = s.kind === 'credit-note'
    if (basis === 'cash' && s.vat === 'standard') {
      if (credit) exclude(s.id, s.reference, REASON_CASH_CREDIT)
      continue
    }
    const sign = credit ? -1n : 1n
    const base = { source: s.kind, id: s.id, reference: s.reference, date: s.issuedOn, party: s.customerName }
    if (s.vat === 'reverse-charge') {
      add({ ...base, box: 6, note: `${credit ? 'Credit note on a reverse-charge sale' : 'Reverse-charge sale'}: box 6 only, the customer accounts for the VAT` }, sign * s.net, 0n)
    }
    else {
      const note = credit ? 'Credit note: reduces the sales and their VAT' : 'Sale with VAT charged'
      add({ ...base, box: 6, note }, sign * s.net, sign * s.tax)
      add({ ...base, box: 1, note }, sign * s.net, sign * s.tax)
    }
  }

  // Payments received, on the cash basis: each carries its share of the invoice's net and VAT.
  if (basis === 'cash') {
    for (const p of payments) {
      if (!inRange(p.receivedOn, start, end)) continue
      const s = sales.get(p.invoiceId)
      if (!s) throw new RangeError(`${p.field}.invoiceId ${p.invoiceId} is not one of the sales given`)
      if (s.kind !== 'invoice') throw new RangeError(`${p.field}.invoiceId ${p.invoiceId} is a credit note: a refund is a negative payment against the invoice`)
      if (s.due === 0n) throw new RangeError(`${p.field}.invoiceId ${p.invoiceId}: the invoice has an amountDuePence of 0, so a payment's share of it cannot be worked out`)
      if (s.vat === 'not-registered') {
        exclude(s.id, s.reference, REASON_NOT_REGISTERED)
        continue
      }
      if (s.vat === 'reverse-charge') {
        exclude(p.id, s.reference, REASON_CASH_REVERSE)
        continue
      }
      const net = shareOf(s.net, p.amount, s.due)
      const vat = shareOf(s.tax, p.amount, s.due)
      const what = p.amount < 0n ? `Refund of ${formatPence(-p.amountPence)}` : `Payment of ${formatPence(p.amountPence)}`
      const note = `${what} against ${formatPence(s.amountDuePence)} due: that share of the net and the VAT`
      const base = { source: 'payment' as const, id: p.id, reference: s.reference, date: p.receivedOn, party: s.customerName, note }
      add({ ...base, box: 6 }, net, vat)
      add({ ...base, box: 1 }, net, vat)
    }
  }

  // Purchases (receipts, paid when bought) by the day bought, on both bases.
  for (const p of purchases) {
    if (!inRange(p.boughtOn, start, end)) continue
    const base = { source: 'purchase' as const, id: p.id, reference: p.reference, date: p.boughtOn, party: p.supplier, note: 'Purchase' }
    add({ ...base, box: 7 }, p.net, p.vat)
    add({ ...base, box: 4 }, p.net, p.vat)
  }

  const box3 = totals[1] // box 2 is always 0 here
  const box5 = box3 >= totals[4] ? box3 - totals[4] : totals[4] - box3
  const boxes: Record<VatBox, number> = {
    1: toSafe(totals[1], 'box 1'),
    2: 0,
    3: toSafe(box3, 'box 3'),
    4: toSafe(totals[4], 'box 4'),
    5: toSafe(box5, 'box 5'),
    6: toSafe(totals[6], 'box 6'),
    7: toSafe(totals[7], 'box 7'),
    8: 0,
    9: 0,
  }
  // BigInt division truncates toward zero, and gives 0, never -0
  const pounds = (p: bigint) => Number(p / 100n)
  entries.sort((a, b) => a.box - b.box || (a.date < b.date ? -1 : a.date > b.date ? 1 : 0))
  return {
    basis,
    start,
    end,
    boxes,
    wholePounds: { 6: pounds(totals[6]), 7: pounds(totals[7]), 8: 0, 9: 0 },
    toPay: box3 >= totals[4],
    entries,
    excluded,
  }
}

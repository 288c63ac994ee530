// Totals of a quote or an invoice: net, VAT (standard, domestic reverse charge, not registered),
// and the CIS deduction a contractor takes from the labour. Pence are integers; quantities are
// read from their decimal digits, so nothing is lost to floating point.
//
// Sources (../shared/DOMAIN.md, "Money rules"): the total VAT of an invoice may be rounded down to
// a whole penny (HMRC VAT Notice 700 para 17.5; VATREC12010); the reverse-charge invoice charges
// no VAT but states the VAT the customer accounts for (gov.uk reverse-charge guidance); CIS is
// deducted from the labour only, never from materials or VAT (gov.uk CIS guidance; HMRC
// COG909250). These are the rules as we read them, not tax advice: the firm's accountant and
// HMRC's guidance decide, and the product says so where the figures are shown.
//
// Input rules (our decisions):
// - quantity: finite, 0 or more, at most 3 decimals; unitPence: a whole number. Anything else is a
//   RangeError. A line may take off (a negative unit price) only what the same invoice charges: a
//   final invoice made from a quote carries the quote's lines and takes off what was invoiced
//   before ("Less invoiced before: BP-3"); labour, materials and the VAT each stay 0 or more, or it
//   is a RangeError. A credit is its own document (a credit note, totalled the same way and shown
//   as a credit), so "round the VAT down" never has to mean rounding a negative total. A negative
//   line's net is rounded half away from zero, so it takes off exactly what the same positive line
//   adds.
// - 'reverse-charge' needs a CIS rate (0, 20 or 30): the domestic reverse charge applies only to
//   payments reported under CIS, so a reverse charge without CIS is refused as a mistake.

export interface TaxLine { kind: 'labour' | 'materials', quantity: number, unitPence: number, vatRatePercent: 0 | 5 | 20 }
export interface TaxContext { vat: 'standard' | 'reverse-charge' | 'not-registered', cisRatePercent: 0 | 20 | 30 | null }
export interface InvoiceTotals {
  labourNetPence: number
  materialsNetPence: number
  netPence: number
  /** VAT charged on this invoice: 0 under the reverse charge and when not registered. */
  vatPence: number
  /** Under the reverse charge, the VAT the customer must account for to HMRC (shown, not charged). */
  reverseChargeVatPence: number
  grossPence: number
  /** What the contractor withholds under CIS (0 when CIS does not apply). */
  cisDeductionPence: number
  amountDuePence: number
}

const VAT_RATES = [0, 5, 20] as const
const CIS_RATES = [0, 20, 30] as const

/** A quantity as thousandths (12.345 -> 12345n); RangeError when negative, not finite or over 3 decimals. */
function thousandths(q: number): bigint {
  if (!Number.isFinite(q) || q < 0) throw new RangeError(`quantity must be a number of 0 or more, got ${q}`)
  // String() gives the shortest decimal that reads back as q: 12.345 -> '12.345'
  const m = /^(\d+)(?:\.(\d+))?$/.exec(String(q))
  if (!m || (m[2] ?? '').length > 3) throw new RangeError(`quantity may have at most 3 decimals, got ${q}`)
  return BigInt(m[1]!) * 1000n + BigInt((m[2] ?? '').padEnd(3, '0') || '0')
}

function toSafe(n: bigint, what: string): number {
  const x = Number(n)
  if (!Number.isSafeInteger(x)) throw new RangeError(`${what} is too large`)
  return x
}

/** One line's net in pence: quantity x unit price, rounded half up to the penny (a line taking off: half away from zero). */
export function lineNetPence(line: Pick<TaxLine, 'quantity' | 'unitPence'>): number {
  if (!Number.isSafeInteger(line.unitPence)) throw new RangeError(`unitPence must be a whole number of pence, got ${line.unitPence}`)
  const size = (thousandths(line.quantity) * BigInt(Math.abs(line.unitPence)) + 500n) / 1000n
  return toSafe(line.unitPence < 0 ? -size : size, 'the line net')
}

/**
 * The totals of an invoice (or a quote):
 * - each line's net is rounded half up to the penny; labour and materials nets are their sums;
 * - 'standard': vatPence = sum of (line net x its rate), the invoice total rounded down to a whole
 *   penny (VAT Notice 700 para 17.5); 'reverse-charge': vatPence 0, reverseChargeVatPence worked
 *   the same way; 'not-registered': both 0;
 * - grossPence = net + vatPence;
 * - CIS (cisRatePercent not null): the rate on the labour net only, rounded down to the penny;
 *   amountDuePence = gross - the CIS deduction.
 * Rules of thumb for the product, not tax advice (see the file's note).
 */
export function invoiceTotals(lines: readonly TaxLine[], context: TaxContext): InvoiceTotals {
  if (!['standard', 'reverse-charge', 'not-registered'].includes(context.vat)) throw new RangeError(`unknown VAT treatment ${String(context.vat)}`)
  if (context.cisRatePercent !== null && !CIS_RATES.includes(context.cisRatePercent)) throw new RangeError(`CIS rate must be 0, 20 or 30, got ${context.cisRatePercent}`)
  if (context.vat === 'reverse-charge' && context.cisRatePercent === null) throw new RangeError('the reverse charge applies only to payments under CIS: give the CIS rate')

  let labour = 0n
  let materials = 0n
  let vatHundredths = 0n // sum of net pence x rate percent, i.e. VAT in hundredths of a penny
  for (const l of lines) {
    if (l.kind !== 'labour' && l.kind !== 'materials') throw new RangeError(`a line is labour or materials, got ${String(l.kind)}`)
    if (!VAT_RATES.includes(l.vatRatePercent)) throw new RangeError(`VAT rate must be 0, 5 or 20, got ${l.vatRatePercent}`)
    const net = BigInt(lineNetPence(l))
    if (l.kind === 'labour') labour += net
    else materials += net
    vatHundredths += net * BigInt(l.vatRatePercent)
  }
  // lines taking off what was invoiced before never take off more than the invoice charges
  if (labour < 0n || materials < 0n || vatHundredths < 0n) throw new RangeError('lines taking off may not come to more than the work they are taken from')
  const net = labour + materials
  const vatDue = vatHundredths / 100n // BigInt division of non-negatives rounds down
  const vat = context.vat === 'standard' ? vatDue : 0n
  const reverse = context.vat === 'reverse-charge' ? vatDue : 0n
  const gross = net + vat
  const cis = context.cisRatePercent === null ? 0n : (labour * BigInt(context.cisRatePercent)) / 100n
  return {
    labourNetPence: toSafe(labour, 'the labour net'),
    materialsNetPence: toSafe(materials, 'the materials net'),
    netPence: toSafe(net, 'the net'),
    vatPence: toSafe(vat, 'the VAT'),
    reverseChargeVatPence: toSafe(reverse, 'the reverse-charge VAT'),
    grossPence: toSafe(gross, 'the gross'),
    cisDeductionPence: toSafe(cis, 'the CIS deduction'),
    amountDuePence: toSafe(gross - cis, 'the amount due'),
  }
}

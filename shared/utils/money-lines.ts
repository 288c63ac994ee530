// The priced lines of a quote or an invoice as typed (pounds and quantities as text) and as sent
// (whole pence, thousandths of a unit). Used by useLineForm (app/composables/useLineForm.ts); the
// API checks what is sent with shared/schemas/line.ts.
import { parsePounds, penceToDecimal } from './money'
import { formatQuantity, parseQuantity } from './quantity'
import { invoiceTotals, lineNetPence, type InvoiceTotals } from './tax'

export type LineKind = 'labour' | 'materials'
export type LineVatRate = 0 | 5 | 20

/** A line as the editor holds it: what was typed, kept as typed until it is sent. */
export interface TypedLine {
  kind: LineKind
  description: string
  quantity: string
  unit: string
  unitPrice: string
  vatRatePercent: LineVatRate
  /** A quote's line: how its quantity was worked out. Empty on an invoice. */
  derivation: string
  /** An invoice's line: extra work beyond the job's agreed price. False on a quote. */
  extraWork: boolean
}

/** A line as the API sends and takes it. */
export interface SentLine {
  kind: LineKind
  description: string
  quantityX1000: number
  unit: string
  unitPence: number
  vatRatePercent: number
  derivation?: string
  extraWork?: boolean
}

/**
 * A unit price as typed: pounds, or pounds after a minus sign on an invoice's line taking off what
 * was invoiced before ("-120.00"); null when it cannot be read. The API says whether a negative
 * price is allowed where it is sent (only on an invoice, never more than the invoice charges).
 */
export function parseUnitPrice(input: string): number | null {
  const m = /^\s*[-\u2212]\s*(.*)$/.exec(input)
  if (!m) return parsePounds(input)
  const pence = parsePounds(m[1]!)
  return pence === null || pence === 0 ? null : -pence
}

export const LINE_QUANTITY_ERROR = 'Enter a quantity, like 1 or 8.40.'
export const LINE_PRICE_ERROR = 'Enter a price in pounds, like 18.00.'

/** A saved line, ready to be edited. */
export function typedLine(l: SentLine): TypedLine {
  return {
    kind: l.kind,
    description: l.description,
    quantity: formatQuantity(l.quantityX1000),
    unit: l.unit,
    unitPrice: penceToDecimal(l.unitPence),
    vatRatePercent: ([0, 5, 20].includes(l.vatRatePercent) ? l.vatRatePercent : 20) as LineVatRate,
    derivation: l.derivation ?? '',
    extraWork: l.extraWork ?? false,
  }
}

/**
 * The lines as the API takes them, and the quantities and prices that could not be read, keyed as
 * the API names its fields (`lines.2.unitPence`). A line that cannot be read is sent as 0, which is
 * only used for a preview: the editor does not send while there are errors.
 */
export function sentLines(lines: readonly TypedLine[]): { lines: Required<SentLine>[], errors: Record<string, string> } {
  const errors: Record<string, string> = {}
  const sent = lines.map((l, i) => {
    const quantityX1000 = parseQuantity(l.quantity)
    const unitPence = parseUnitPrice(l.unitPrice)
    if (quantityX1000 === null) errors[`lines.${i}.quantityX1000`] = LINE_QUANTITY_ERROR
    if (unitPence === null) errors[`lines.${i}.unitPence`] = LINE_PRICE_ERROR
    return { kind: l.kind, description: l.description, quantityX1000: quantityX1000 ?? 0, unit: l.unit, unitPence: unitPence ?? 0, vatRatePercent: l.vatRatePercent, derivation: l.derivation, extraWork: l.extraWork }
  })
  return { lines: sent, errors }
}

/** What one typed line comes to before VAT, or null while its quantity or price cannot be read. */
export function typedLineNetPence(l: Pick<TypedLine, 'quantity' | 'unitPrice'>): number | null {
  const quantityX1000 = parseQuantity(l.quantity)
  const unitPence = parseUnitPrice(l.unitPrice)
  return quantityX1000 === null || unitPence === null ? null : lineNetPence({ quantity: quantityX1000 / 1000, unitPence })
}

/** The VAT treatment and CIS rate a quote or an invoice is totalled under. */
export interface LinesTreatment { vat: 'standard' | 'reverse-charge' | 'not-registered', cisRatePercent: number | null }

/**
 * The totals of a quote's or an invoice's lines: the ONE computation both use (shared/utils/tax.ts
 * invoiceTotals: each line's net rounded, VAT on the lines' nets rate by rate, rounded down once on
 * the total), so an invoice carrying a quote's lines under its treatment is the quote to the penny.
 */
export function linesTotals(lines: readonly Pick<SentLine, 'kind' | 'quantityX1000' | 'unitPence' | 'vatRatePercent'>[], treatment: LinesTreatment): InvoiceTotals {
  return invoiceTotals(
    lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })),
    { vat: treatment.vat, cisRatePercent: (treatment.cisRatePercent ?? null) as 0 | 20 | 30 | null },
  )
}

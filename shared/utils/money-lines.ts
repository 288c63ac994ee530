// The priced lines of a quote or an invoice as typed (pounds and quantities as text) and as sent
// (whole pence, thousandths of a unit). Used by useLineForm (app/composables/useLineForm.ts); the
// API checks what is sent with shared/schemas/line.ts.
import { parsePounds, penceToDecimal } from './money'
import { formatQuantity, parseQuantity } from './quantity'
import { lineNetPence } from './tax'

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
    const unitPence = parsePounds(l.unitPrice)
    if (quantityX1000 === null) errors[`lines.${i}.quantityX1000`] = LINE_QUANTITY_ERROR
    if (unitPence === null) errors[`lines.${i}.unitPence`] = LINE_PRICE_ERROR
    return { kind: l.kind, description: l.description, quantityX1000: quantityX1000 ?? 0, unit: l.unit, unitPence: unitPence ?? 0, vatRatePercent: l.vatRatePercent, derivation: l.derivation, extraWork: l.extraWork }
  })
  return { lines: sent, errors }
}

/** What one typed line comes to before VAT, or null while its quantity or price cannot be read. */
export function typedLineNetPence(l: Pick<TypedLine, 'quantity' | 'unitPrice'>): number | null {
  const quantityX1000 = parseQuantity(l.quantity)
  const unitPence = parsePounds(l.unitPrice)
  return quantityX1000 === null || unitPence === null ? null : lineNetPence({ quantity: quantityX1000 / 1000, unitPence })
}

import { z } from 'zod'
import { text } from './common'
import { formatPence } from '../utils/money'

/**
 * The most one unit of a priced line may cost, £1,000,000.00. The invoice's own check keeps the
 * line and the whole invoice within what an invoice can come to (shared/schemas/invoice.ts).
 */
export const MAX_UNIT_PENCE = 1_000_000_00

/**
 * One priced line of a quote or an invoice, as the line editor sends it (MoneyLineEditor and
 * useLineForm): labour or materials, what it is, how many of what unit at what price, and its
 * VAT rate. A quote's line also says how its quantity was worked out (derivation); an invoice's
 * line says whether it is extra work beyond the job's agreed price. Each resource takes its own
 * view of this one schema (quoteLineSchema, invoiceLineSchema), so the fields they share are
 * checked, and worded, the same way.
 */
export const moneyLineSchema = z.object({
  kind: z.enum(['labour', 'materials'], { error: 'Labour or materials?' }),
  description: text({ error: 'Describe the line.' }).trim().min(1, { error: 'Describe the line.' }).max(500),
  quantityX1000: z.int({ error: 'Enter the quantity.' }).min(1, { error: 'The quantity must be more than 0.' }).max(100_000_000),
  unit: text().trim().min(1).max(20).default('item'),
  unitPence: z.int({ error: 'Enter the unit price in pounds and pence.' }).min(0, { error: 'The unit price cannot be negative.' }).max(MAX_UNIT_PENCE, { error: 'The unit price looks too high.' }),
  vatRatePercent: z.union([z.literal(0), z.literal(5), z.literal(20)]).default(20),
  /** A quote's line: how the quantity was worked out ("3.20 m x 2.40 m = 7.68 m²"). */
  derivation: text().max(4000).default(''),
  /** An invoice's line: work beyond the job's agreed price, confirmed by the person: not counted against the price. */
  extraWork: z.boolean({ error: 'Say whether this line is extra work.' }).default(false),
})
export type MoneyLineInput = z.input<typeof moneyLineSchema>

/** A quote's line: the money line with how it was worked out, never extra work (a quote is the price). */
export const quoteLineSchema = moneyLineSchema.omit({ extraWork: true })

/**
 * An invoice's line: the money line with its extra-work flag (an invoice keeps no working). Its unit
 * price may be negative on a line taking off what was invoiced before (a final invoice made from a
 * quote: "Less invoiced before: BP-3"); the invoice's own check keeps labour, materials and VAT at
 * 0 or more (shared/schemas/invoice.ts).
 */
export const invoiceLineSchema = moneyLineSchema.omit({ derivation: true }).extend({
  unitPence: z.int({ error: 'Enter the unit price in pounds and pence.' }).min(-MAX_UNIT_PENCE, { error: 'The amount taken off looks too high.' }).max(MAX_UNIT_PENCE, { error: 'The unit price looks too high.' }),
})

/** The most a quote may come to with its VAT, as an invoice may (MAX_INVOICE_PENCE): what a job's totals can hold. */
export const MAX_QUOTE_PENCE = 20_000_000_00

/**
 * A quote's lines, each and all together with their VAT, within MAX_QUOTE_PENCE, so that accepting
 * it can always make its job. Exact (BigInt), and run by zod even when a line has errors of its own,
 * so lines that are not whole numbers are left to those.
 */
export function checkQuoteLinesFit(lines: unknown, ctx: z.RefinementCtx) {
  const whole = (n: unknown) => Number.isSafeInteger(n) && (n as number) >= 0
  type Line = { quantityX1000: number, unitPence: number, vatRatePercent?: number }
  if (!Array.isArray(lines) || !lines.every((l: Line) => whole(l?.quantityX1000) && whole(l?.unitPence))) return
  const max = BigInt(MAX_QUOTE_PENCE)
  // within Number's exact range: 200 lines of at most 10^8 x 10^8 / 1000 pence
  const words = (n: bigint) => formatPence(Number(n))
  let gross = 0n
  let tooBig = false
  ;(lines as Line[]).forEach((l, i) => {
    const net = (BigInt(l.quantityX1000) * BigInt(l.unitPence) + 500n) / 1000n
    if (net > max) {
      tooBig = true
      ctx.addIssue({ code: 'custom', path: ['lines', i, 'unitPence'], message: `This line comes to more than ${words(max)}, the most a quote can be: check the quantity and the price.` })
    }
    gross += net + (net * BigInt(l.vatRatePercent ?? 20) + 50n) / 100n
  })
  if (!tooBig && gross > max) {
    ctx.addIssue({ code: 'custom', path: ['lines'], message: `The quote comes to ${words(gross)} with VAT; one quote can be at most ${words(max)}. Split the work across quotes.` })
  }
}

import { z } from 'zod'
import { queryWholeNumber, text } from './common'
import { PURCHASE_CATEGORIES } from './purchase'

/** A bank account of the firm, by the name the firm knows it by ("Business current account"). */
export const bankAccountSchema = z.object({
  name: text({ error: 'Name the account, as the firm knows it.' }).trim().min(1, 'Name the account, as the firm knows it.').max(80, 'At most 80 characters.'),
})

const column = z.int().min(0).max(50)
/** Which column of a CSV statement holds what (shared/utils/bank-csv.ts BankMapping), and the header row's index (-1: none). */
export const bankLayoutSchema = z.object({
  headerRow: z.int().min(-1).max(20),
  mapping: z.object({
    date: column,
    description: z.array(column).min(1, 'Choose the column with the description.').max(5),
    amount: column.optional(),
    paidIn: column.optional(),
    paidOut: column.optional(),
    balance: column.optional(),
  }).refine(m => m.amount !== undefined || m.paidIn !== undefined || m.paidOut !== undefined, { message: 'Choose the amount column, or the paid-in and paid-out columns.', path: ['amount'] }),
})

/** GET /api/bank-accounts/:id/lines: which lines (the open ones by default), and how many of the newest (200; a year of a busy firm's lines at most). */
export const bankLinesQuery = z.object({
  state: z.enum(['open', 'matched', 'ignored']).default('open'),
  limit: queryWholeNumber('limit', 1, 5000, 200),
})

const money = z.int({ error: 'Enter the amount in pounds and pence.' }).min(1, { error: 'Enter an amount above nothing.' }).max(1_000_000_00)
/** POST /api/bank-lines/:id/match: what the line is (server/utils/bank.ts confirmLine). */
export const bankMatchSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('payment'),
    parts: z.array(z.object({ invoiceId: z.uuid({ error: 'Choose the invoice.' }), amountPence: money }), { error: 'Choose the invoices it pays.' })
      .min(1, { error: 'Choose the invoices it pays.' }).max(20, { error: 'At most 20 invoices in one transfer.' })
      .refine(parts => new Set(parts.map(p => p.invoiceId)).size === parts.length, { error: 'Each invoice once.' }),
  }),
  z.object({ kind: z.literal('refund'), paymentId: z.uuid({ error: 'Choose the refund.' }) }),
  z.object({ kind: z.literal('recorded'), paymentId: z.uuid({ error: 'Choose the payment.' }) }),
  z.object({ kind: z.literal('purchase'), purchaseId: z.uuid({ error: 'Choose the purchase.' }) }),
  z.object({
    kind: z.literal('new-purchase'),
    supplier: text({ error: 'Enter who was paid.' }).trim().min(1, 'Enter who was paid.').max(120, 'At most 120 characters.'),
    category: z.enum(PURCHASE_CATEGORIES, { error: 'Choose materials, tools, fuel, vehicle, labour paid to others, or other.' }),
  }),
  z.object({ kind: z.literal('payout') }),
], { error: 'Choose what the line is: invoices, a purchase, a refund or a Stripe payout.' })

/** PATCH /api/bank-lines/:id: a note for later, or the line set aside or brought back. */
export const bankLineChangeSchema = z.object({
  note: text().trim().max(500, 'At most 500 characters.').optional(),
  state: z.enum(['open', 'ignored'], { error: 'Set the line aside, or bring it back.' }).optional(),
}).refine(c => c.note !== undefined || c.state !== undefined, { error: 'Write a note, or set the line aside.' })

/** POST /api/bank-accounts/:id/confirmations: the sure proposals the partner saw, confirmed together (each still sure is). */
export const bankConfirmAllSchema = z.object({
  lineIds: z.array(z.uuid({ error: 'Not found.' })).min(1, { error: 'Nothing to confirm.' }).max(1000, { error: 'At most 1,000 lines at once.' }),
})

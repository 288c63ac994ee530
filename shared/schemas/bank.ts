import { z } from 'zod'
import { queryWholeNumber, text } from './common'

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

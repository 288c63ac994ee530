import { z } from 'zod'
import { isoDate } from './common'
import { CUSTOMER_KINDS, type CustomerKind } from '../utils/ledger'
import { daysBetween } from '../utils/dates'

/** The longest period one request may ask for, counting both ends. */
export const PROFIT_MAX_DAYS = 366

/** The query of the profit table and its CSV: a period of at most 366 days, and optionally one kind of customer. */
export const profitQuerySchema = z.object({
  from: isoDate('Pick the first day of the period (YYYY-MM-DD).'),
  to: isoDate('Pick the last day of the period (YYYY-MM-DD).'),
  // '' is "every kind" (an empty choice in a form)
  customerKind: z.enum(['', ...CUSTOMER_KINDS], { error: 'Choose homeowner, landlord, builder or business, or every kind.' })
    .optional().transform(v => (v ? v as CustomerKind : undefined)),
})
  .refine(q => q.from <= q.to, { path: ['to'], error: 'The last day is before the first.' })
  // counting both ends: 1 January to 31 December of a leap year is 366 days
  .refine(q => q.from > q.to || !(daysBetween(q.from, q.to) + 1 > PROFIT_MAX_DAYS), { path: ['to'], error: `Ask for at most ${PROFIT_MAX_DAYS} days at a time.` })
export type ProfitQuery = z.output<typeof profitQuerySchema>

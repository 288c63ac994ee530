import { z } from 'zod'
import { isoDate } from './common'
import { CUSTOMER_KINDS, type CustomerKind } from '../utils/ledger'
import { daysBetween } from '../utils/dates'

/** The longest period one request may ask for, counting both ends. */
export const PROFIT_MAX_DAYS = 366

/** Jobs still on site kept apart from the totals (the default), or counted in them. */
export const PROFIT_ON_SITE = ['apart', 'include'] as const
export type ProfitOnSite = (typeof PROFIT_ON_SITE)[number]

/**
 * The query of the profit table and its CSV: a period of at most 366 days, optionally one kind of
 * customer, and whether the totals count the jobs still on site (`onSite=include`; by default they
 * are listed apart and left out).
 */
export const profitQuerySchema = z.object({
  from: isoDate('Pick the first day of the period (YYYY-MM-DD).'),
  to: isoDate('Pick the last day of the period (YYYY-MM-DD).'),
  // '' is "every kind" (an empty choice in a form)
  customerKind: z.enum(['', ...CUSTOMER_KINDS], { error: 'Choose homeowner, landlord, builder or business, or every kind.' })
    .optional().transform(v => (v ? v as CustomerKind : undefined)),
  // '' is the default (a toggle left off)
  onSite: z.enum(['', ...PROFIT_ON_SITE], { error: 'Choose whether the totals count the jobs still on site: apart or include.' })
    .optional().transform((v): ProfitOnSite => (v ? v as ProfitOnSite : 'apart')),
})
  .refine(q => q.from <= q.to, { path: ['to'], error: 'The last day is before the first.' })
  // counting both ends: 1 January to 31 December of a leap year is 366 days
  .refine(q => q.from > q.to || !(daysBetween(q.from, q.to) + 1 > PROFIT_MAX_DAYS), { path: ['to'], error: `Ask for at most ${PROFIT_MAX_DAYS} days at a time.` })
export type ProfitQuery = z.output<typeof profitQuerySchema>

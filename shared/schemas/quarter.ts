// Inputs of the quarter's summaries and exports: a period (a VAT quarter by any date in it, or
// from and to), and a contractor's CIS statement.
import { z } from 'zod'
import { daysBetween } from '../utils/dates'
import { isoDate, text, whenObject } from './common'

const pickDate = isoDate('Pick a date.')
const MAX_DAYS = 400

/** A period: `quarterOf` (the VAT quarter that date falls in) or `from` and `to`; at most about a year (exports of more come a year at a time). */
export const periodQuery = z.object({
  quarterOf: pickDate.optional(),
  from: pickDate.optional(),
  to: pickDate.optional(),
})
  .refine(v => Boolean(v.quarterOf) !== Boolean(v.from || v.to), { path: ['quarterOf'], error: 'Pick a VAT quarter, or a from and to date.', when: whenObject })
  .refine(v => !(v.from || v.to) || Boolean(v.from && v.to), { path: ['to'], error: 'Pick both dates.', when: whenObject })
  .refine(v => !(v.from && v.to) || v.from <= v.to, { path: ['to'], error: 'The end is before the start.', when: whenObject })
  .refine(v => !(v.from && v.to) || !(daysBetween(v.from, v.to) >= MAX_DAYS), { path: ['to'], error: 'Pick at most a year at a time.', when: whenObject })
export type PeriodQuery = z.infer<typeof periodQuery>

const pence = (what: string) => z.int({ error: `Enter ${what} in pounds and pence.` }).min(0, { error: `${what} cannot be negative.` }).max(10_000_000_00, { error: `${what} looks too high.` })

/** What a contractor's monthly CIS statement says (gov.uk: gross paid excluding VAT, materials, the deduction). */
export const cisStatementSchema = z.object({
  customerId: z.uuid({ error: 'Choose the contractor.' }),
  taxMonthStart: pickDate.refine(d => d.endsWith('-06'), { error: 'A CIS tax month starts on the 6th: pick the 6th.' }),
  grossPence: pence('The gross amount paid'),
  materialsPence: pence('The materials').default(0),
  deductionPence: pence('The deduction'),
  reference: text().trim().max(200, { error: 'Keep it under 200 characters.' }).default(''),
  notes: text().trim().max(2000, { error: 'Keep it under 2000 characters.' }).default(''),
})
  .refine(v => typeof v.grossPence !== 'number' || typeof v.materialsPence !== 'number' || v.materialsPence <= v.grossPence, { path: ['materialsPence'], error: 'The materials cannot be more than the gross amount.', when: whenObject })
  .refine(v => typeof v.grossPence !== 'number' || typeof v.deductionPence !== 'number' || v.deductionPence <= v.grossPence, { path: ['deductionPence'], error: 'The deduction cannot be more than the gross amount.', when: whenObject })

export const cisStatementListQuery = z.object({
  from: pickDate.optional(),
  to: pickDate.optional(),
  customerId: z.uuid({ error: 'Choose the contractor.' }).optional(),
})

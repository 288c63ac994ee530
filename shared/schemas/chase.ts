import { z } from 'zod'
import { isoDate, text, whenObject } from './common'
import { MAX_INVOICE_PENCE } from './invoice'
import { CHASE_KINDS, CHASE_OUTCOMES, PROMISE_DATE_PAST, promiseDateProblem } from '../utils/chase'
import { londonToday } from '../utils/dates'

/**
 * One entry in an invoice's chase log: a call, a message or a letter, how it went, and when they
 * promised to pay, the amount and the day (today or later in London; the route also checks the
 * amount against what is still owed). `today` is for tests and the form; the route uses London's.
 */
export function chaseEntrySchemaFor(today: () => string = () => londonToday()) {
  return z.object({
    kind: z.enum(CHASE_KINDS, { error: 'A call, a message or a letter?' }),
    outcome: z.enum(CHASE_OUTCOMES, { error: 'Choose how it went.' }),
    note: text().trim().max(2000).default(''),
    promisedPence: z.int({ error: 'Enter the amount they promised in pounds and pence, like 250.00.' })
      .min(1, { error: 'Enter the amount they promised.' })
      .max(MAX_INVOICE_PENCE, { error: 'That is more than an invoice can be: check the amount.' })
      .nullable().default(null),
    promisedOn: isoDate('Pick the day they promised to pay by.').nullable().default(null),
  })
    .refine(v => v.outcome !== 'promised' || v.promisedPence !== null, { path: ['promisedPence'], error: 'Enter the amount they promised to pay.', when: whenObject })
    .refine(v => v.outcome !== 'promised' || v.promisedOn !== null, { path: ['promisedOn'], error: 'Pick the day they promised to pay by.', when: whenObject })
    .refine(v => v.outcome === 'promised' || (v.promisedPence === null && v.promisedOn === null), { path: ['outcome'], error: 'An amount and a day go with "Promised to pay": choose it, or leave them out.', when: whenObject })
    .refine(v => typeof v.promisedOn !== 'string' || promiseDateProblem(v.promisedOn, today()) === null, { path: ['promisedOn'], error: PROMISE_DATE_PAST, when: whenObject })
}

export const chaseEntrySchema = chaseEntrySchemaFor()
export type ChaseEntryInput = z.infer<typeof chaseEntrySchema>

/** An entry of an invoice's chase log, by its invoice and its own id. */
export const chaseEntryParam = z.object({ id: z.uuid({ error: 'Not found.' }), noteId: z.uuid({ error: 'Not found.' }) })

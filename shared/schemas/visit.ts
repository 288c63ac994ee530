import { z } from 'zod'
import { doneAtProblem, visitStartProblem } from '../utils/visit-status'
import { isoDateTime, queryWholeNumber, text } from './common'

/** A start time the rules take for a booking or a move (shared/utils/visit-status.ts), checked when the body is read. */
const startTime = (kind: 'book' | 'move') => isoDateTime('Pick the date and time of the visit.')
  .superRefine((v, ctx) => {
    const problem = visitStartProblem(new Date(v), new Date(), kind)
    if (problem) ctx.addIssue({ code: 'custom', message: problem })
  })

export const visitSchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }),
  enquiryId: z.uuid().nullable().default(null),
  startsAt: startTime('book'),
  durationMinutes: z.int({ error: 'Enter how long, in minutes.' }).min(10, { error: 'At least 10 minutes.' }).max(8 * 60, { error: 'At most 8 hours.' }).default(60),
  visitorUserId: z.uuid().nullable().default(null),
  notes: text().trim().max(2000).default(''),
})
export type VisitInput = z.input<typeof visitSchema>

/**
 * Move a visit (a new start), make it longer or shorter, send someone else, or change its notes.
 * Its status changes only through POST .../done and .../cancel, which have rules of their own.
 */
export const visitUpdateSchema = z.object({
  startsAt: startTime('move').optional(),
  durationMinutes: visitSchema.shape.durationMinutes.optional(),
  visitorUserId: z.uuid().nullable().optional(),
  notes: visitSchema.shape.notes.optional(),
})

/** Mark a visit done. `at` defaults to now; `clientId` is made on the phone so a resend is known for one. */
export const visitDoneSchema = z.object({
  at: isoDateTime('Pick when the visit was done.').superRefine((v, ctx) => {
    const problem = doneAtProblem(new Date(v), new Date())
    if (problem) ctx.addIssue({ code: 'custom', message: problem })
  }).optional(),
  clientId: z.uuid({ error: 'The id made on the phone is not right.' }).optional(),
})
export type VisitDoneInput = z.input<typeof visitDoneSchema>

/** Cancel a visit: the reason is kept with it and in the audit log. */
export const visitCancelSchema = z.object({
  reason: text({ error: 'Say why the visit is cancelled.' }).trim().min(1, { error: 'Say why the visit is cancelled.' }).max(500, { error: 'At most 500 characters.' }),
})
export type VisitCancelInput = z.input<typeof visitCancelSchema>

/** Which visits a list shows: those still to do (booked), or those done and cancelled. */
export const VISIT_LIST_SHOWS = ['to-do', 'finished'] as const

export const visitListQuery = z.object({
  show: z.enum(VISIT_LIST_SHOWS, { error: 'Show to-do or finished visits.' }).default('to-do'),
  from: isoDateTime().optional(),
  to: isoDateTime().optional(),
  limit: queryWholeNumber('The limit', 1, 200, 50),
})

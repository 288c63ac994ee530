import { z } from 'zod'
import { VISIT_STATUSES } from '../utils/ledger'
import { isoDateTime, queryWholeNumber, text } from './common'

export const visitSchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }),
  enquiryId: z.uuid().nullable().default(null),
  startsAt: isoDateTime('Pick the date and time of the visit.'),
  durationMinutes: z.int({ error: 'Enter how long, in minutes.' }).min(10, { error: 'At least 10 minutes.' }).max(8 * 60, { error: 'At most 8 hours.' }).default(60),
  visitorUserId: z.uuid().nullable().default(null),
  notes: text().trim().max(2000).default(''),
})
export type VisitInput = z.input<typeof visitSchema>

export const visitUpdateSchema = z.object({
  startsAt: visitSchema.shape.startsAt.optional(),
  durationMinutes: visitSchema.shape.durationMinutes.optional(),
  visitorUserId: z.uuid().nullable().optional(),
  status: z.enum(VISIT_STATUSES, { error: 'Choose booked, done or cancelled.' }).optional(),
  notes: visitSchema.shape.notes.optional(),
})

export const visitListQuery = z.object({
  from: isoDateTime().optional(),
  to: isoDateTime().optional(),
  limit: queryWholeNumber('The limit', 1, 200, 50),
})

import { z } from 'zod'
import { VISIT_STATUSES } from '../utils/ledger'

export const visitSchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }),
  enquiryId: z.uuid().nullable().default(null),
  startsAt: z.iso.datetime({ offset: true, error: 'Pick the date and time of the visit.' }),
  durationMinutes: z.int({ error: 'Enter how long, in minutes.' }).min(10, { error: 'At least 10 minutes.' }).max(8 * 60, { error: 'At most 8 hours.' }).default(60),
  visitorUserId: z.uuid().nullable().default(null),
  notes: z.string().trim().max(2000).default(''),
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
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
})

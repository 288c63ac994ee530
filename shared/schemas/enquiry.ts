import { z } from 'zod'
import { ENQUIRY_SOURCES, ENQUIRY_STATUSES } from '../utils/ledger'
import { emailField, isoDate, queryWholeNumber, text } from './common'

const pickDate = isoDate('Pick a date.')

export const enquirySchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }).nullable().default(null),
  source: z.enum(ENQUIRY_SOURCES, { error: 'Choose how they got in touch.' }),
  description: text({ error: 'Say what they want done.' }).trim().min(1, { error: 'Say what they want done.' }).max(4000),
  preferredDates: text().trim().max(500).default(''),
  followUpOn: pickDate.nullable().default(null),
})
export type EnquiryInput = z.input<typeof enquirySchema>

export const enquiryUpdateSchema = enquirySchema.omit({ customerId: true })

export const enquiryMoveSchema = z.object({
  to: z.enum(ENQUIRY_STATUSES, { error: 'Choose the new status.' }),
  reason: text().trim().max(500).default(''),
}).refine(v => v.to !== 'lost' || v.reason.length > 0, { path: ['reason'], error: 'Say why it was lost (price, timing, went elsewhere…).' })

export const enquiryListQuery = z.object({
  status: z.enum(ENQUIRY_STATUSES).optional(),
  page: queryWholeNumber('A page', 1, 10_000, 1),
  pageSize: queryWholeNumber('A page size', 1, 100, 25),
})

/** The public enquiry form. `website` is a honeypot: people never see it, bots fill it in. */
export const publicEnquirySchema = z.object({
  name: text({ error: 'Enter your name.' }).trim().min(1, { error: 'Enter your name.' }).max(120),
  email: emailField,
  phone: text().trim().max(30).refine(v => v === '' || v.replace(/\D/g, '').length >= 10, { error: 'Enter a phone number like 07700 900123, or leave it empty.' }).default(''),
  addressLine1: text({ error: 'Enter the address of the work.' }).trim().min(1, { error: 'Enter the address of the work.' }).max(200),
  town: text().trim().max(100).default(''),
  postcode: text({ error: 'Enter the postcode.' }).trim().toUpperCase().min(5, { error: 'Enter the postcode, like KB4 7QZ.' }).max(10),
  description: text({ error: 'Tell us what you would like done.' }).trim().min(10, { error: 'Tell us a little more (at least 10 characters).' }).max(4000),
  preferredDates: text().trim().max(500).default(''),
  website: text().max(500).default(''),
})
export type PublicEnquiryInput = z.input<typeof publicEnquirySchema>

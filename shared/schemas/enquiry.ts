import { z } from 'zod'
import { ENQUIRY_SOURCES, ENQUIRY_STATUSES } from '../utils/ledger'
import { emailField } from './common'

const isoDate = z.iso.date({ error: 'Pick a date.' })

export const enquirySchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }).nullable().default(null),
  source: z.enum(ENQUIRY_SOURCES, { error: 'Choose how they got in touch.' }),
  description: z.string({ error: 'Say what they want done.' }).trim().min(1, { error: 'Say what they want done.' }).max(4000),
  preferredDates: z.string().trim().max(500).default(''),
  followUpOn: isoDate.nullable().default(null),
})
export type EnquiryInput = z.input<typeof enquirySchema>

export const enquiryUpdateSchema = enquirySchema.omit({ customerId: true })

export const enquiryMoveSchema = z.object({
  to: z.enum(ENQUIRY_STATUSES, { error: 'Choose the new status.' }),
  reason: z.string().trim().max(500).default(''),
}).refine(v => v.to !== 'lost' || v.reason.length > 0, { path: ['reason'], error: 'Say why it was lost (price, timing, went elsewhere…).' })

export const enquiryListQuery = z.object({
  status: z.enum(ENQUIRY_STATUSES).optional(),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
})

/** The public enquiry form. `website` is a honeypot: people never see it, bots fill it in. */
export const publicEnquirySchema = z.object({
  name: z.string({ error: 'Enter your name.' }).trim().min(1, { error: 'Enter your name.' }).max(120),
  email: emailField,
  phone: z.string().trim().max(30).refine(v => v === '' || v.replace(/\D/g, '').length >= 10, { error: 'Enter a phone number like 07700 900123, or leave it empty.' }).default(''),
  addressLine1: z.string({ error: 'Enter the address of the work.' }).trim().min(1, { error: 'Enter the address of the work.' }).max(200),
  town: z.string().trim().max(100).default(''),
  postcode: z.string({ error: 'Enter the postcode.' }).trim().toUpperCase().min(5, { error: 'Enter the postcode, like KB4 7QZ.' }).max(10),
  description: z.string({ error: 'Tell us what you would like done.' }).trim().min(10, { error: 'Tell us a little more (at least 10 characters).' }).max(4000),
  preferredDates: z.string().trim().max(500).default(''),
  website: z.string().max(500).default(''),
})
export type PublicEnquiryInput = z.input<typeof publicEnquirySchema>

import { z } from 'zod'
import { queryWholeNumber, text, whenObject } from './common'
import { CUSTOMER_KINDS } from '../utils/ledger'

const upTo = (max: number) => text().trim().max(max, { error: `Keep it under ${max} characters.` })
const optionalEmail = z.union([
  z.literal(''),
  text().trim().toLowerCase().max(254, { error: 'An e-mail address is at most 254 characters.' }).pipe(z.email({ error: 'Enter an e-mail address like name@example.co.uk.' })),
])
/** UK phone numbers as people write them: digits, spaces, +, brackets, dashes; 10 to 13 digits. */
const phone = text().trim().max(30, { error: 'That phone number is too long.' })
  .refine(v => v === '' || (/^[\d\s()+-]+$/.test(v) && v.replace(/\D/g, '').length >= 10 && v.replace(/\D/g, '').length <= 13), { error: 'Enter a phone number like 07700 900123.' })
const vatNumber = text().trim().toUpperCase().transform(v => v.replace(/\s+/g, ''))
  .pipe(text().regex(/^(GB)?(\d{9}|\d{12})$/, { error: 'A UK VAT number is GB then 9 digits, for example GB123456789.' }))

/**
 * A customer, with the tax flags validated together:
 * - a homeowner is never VAT-registered for our purposes, never pays under CIS and is never an intermediary;
 * - paying under CIS needs a rate of 0, 20 or 30 (and no rate without CIS);
 * - VAT-registered needs a VAT number.
 */
export const customerSchema = z.object({
  kind: z.enum(CUSTOMER_KINDS, { error: 'Choose what kind of customer this is.' }),
  name: text({ error: 'Enter the customer\'s name.' }).trim().min(1, { error: 'Enter the customer\'s name.' }).max(160, { error: 'Keep it under 160 characters.' }),
  contactName: upTo(120).default(''),
  email: optionalEmail.default(''),
  phone: phone.default(''),
  billingLine1: upTo(200).default(''),
  billingLine2: upTo(200).default(''),
  billingTown: upTo(100).default(''),
  billingPostcode: upTo(10).transform(v => v.toUpperCase()).default(''),
  notes: upTo(4000).default(''),
  vatRegistered: z.boolean().default(false),
  vatNumber: z.union([z.literal('').transform(() => null), vatNumber]).nullable().default(null),
  paysUnderCis: z.boolean().default(false),
  cisRatePercent: z.union([z.literal(0), z.literal(20), z.literal(30)], { error: 'The CIS rate is 0, 20 or 30%.' }).nullable().default(null),
  endUserNotified: z.boolean().default(false),
})
  .refine(v => v.kind !== 'homeowner' || !v.paysUnderCis, { path: ['paysUnderCis'], error: 'A homeowner never pays under CIS.', when: whenObject })
  .refine(v => v.kind !== 'homeowner' || !v.vatRegistered, { path: ['vatRegistered'], error: 'Record a homeowner as not VAT-registered.', when: whenObject })
  .refine(v => v.kind !== 'homeowner' || !v.endUserNotified, { path: ['endUserNotified'], error: 'End-user notices come from businesses, not homeowners.', when: whenObject })
  .refine(v => !v.paysUnderCis || v.cisRatePercent !== null, { path: ['cisRatePercent'], error: 'Choose the CIS rate they deduct: 0, 20 or 30%.', when: whenObject })
  .refine(v => v.paysUnderCis || v.cisRatePercent === null, { path: ['cisRatePercent'], error: 'Only a customer paying under CIS has a CIS rate.', when: whenObject })
  .refine(v => !v.vatRegistered || Boolean(v.vatNumber), { path: ['vatNumber'], error: 'A VAT-registered customer needs their VAT number.', when: whenObject })
export type CustomerInput = z.input<typeof customerSchema>
export type Customer = z.output<typeof customerSchema>

export const siteSchema = z.object({
  label: upTo(80).default(''),
  line1: text({ error: 'Enter the first line of the address.' }).trim().min(1, { error: 'Enter the first line of the address.' }).max(200),
  line2: upTo(200).default(''),
  town: upTo(100).default(''),
  postcode: upTo(10).transform(v => v.toUpperCase()).default(''),
  accessNotes: upTo(2000).default(''),
})
export type SiteInput = z.input<typeof siteSchema>

export const CUSTOMER_SORTS = ['name', '-name', 'created', '-created', 'postcode', '-postcode'] as const
export const customerListQuery = z.object({
  q: text().trim().max(100).default(''),
  page: queryWholeNumber('A page', 1, 10_000, 1),
  pageSize: queryWholeNumber('A page size', 1, 100, 25),
  sort: z.enum(CUSTOMER_SORTS).default('name'),
  /** Only contractors that pay the firm under CIS (the CIS statements form). */
  cis: z.enum(['yes'], { error: 'Use cis=yes or leave it out.' }).optional(),
})

/** A new customer, with their first site when given. */
export const newCustomerSchema = z.object({ customer: customerSchema, site: siteSchema.nullable().default(null) })

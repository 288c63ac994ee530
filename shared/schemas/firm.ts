import { z } from 'zod'
import { nameField, text, whenObject } from './common'

const upTo = (max: number) => text().trim().max(max, { error: `Keep it under ${max} characters.` })

/** UK VAT registration number: GB then 9 digits (12 for a branch), spaces allowed. */
const vatNumber = text().trim().toUpperCase().transform(v => v.replace(/\s+/g, ''))
  .pipe(text().regex(/^(GB)?(\d{9}|\d{12})$/, { error: 'A UK VAT number is GB then 9 digits, for example GB123456789.' }))

/** Unique Taxpayer Reference: 10 digits. */
const utr = text().trim().transform(v => v.replace(/\s+/g, ''))
  .pipe(text().regex(/^\d{10}$/, { error: 'A UTR is 10 digits.' }))

export const firmSettingsSchema = z.object({
  tradingName: nameField('the trading name'),
  addressLine1: upTo(200),
  addressLine2: upTo(200),
  town: upTo(100),
  postcode: upTo(10),
  email: z.union([z.literal(''), text().trim().toLowerCase().max(254, { error: 'An e-mail address is at most 254 characters.' }).pipe(z.email({ error: 'Enter an e-mail address like name@example.co.uk.' }))]),
  phone: upTo(40),
  vatRegistered: z.boolean(),
  vatNumber: z.union([z.literal('').transform(() => null), vatNumber]).nullable(),
  cisStatus: z.enum(['not-registered', 'registered', 'gross'], { error: 'Choose a CIS status.' }),
  utr: z.union([z.literal('').transform(() => null), utr]).nullable(),
  dayRatePence: z.int({ error: 'Enter the day rate in pounds.' }).min(0, { error: 'The day rate cannot be negative.' }).max(10_000_00, { error: 'That day rate looks too high.' }),
  paymentTermsDays: z.int({ error: 'Enter the payment terms in days.' }).min(0, { error: 'Payment terms cannot be negative.' }).max(120, { error: 'Keep payment terms to 120 days or fewer.' }),
  invoicePrefix: text().trim().max(12, { error: 'Keep the prefix to 12 characters.' }).regex(/^[A-Z0-9/-]*$/i, { error: 'Use letters, digits, - or / only.' }),
  // optional, so a client that does not know them leaves them as they are
  creditNoteNumbering: z.enum(['shared', 'own'], { error: 'Number credit notes with the invoices, or on their own.' }).optional(),
  creditNotePrefix: text().trim().max(12, { error: 'Keep the prefix to 12 characters.' }).regex(/^[A-Z0-9/-]*$/i, { error: 'Use letters, digits, - or / only.' }).optional(),
  bankDetails: upTo(500).optional(),
  vatStagger: z.union([z.literal(1), z.literal(2), z.literal(3)], { error: 'Choose the months the VAT quarters end in.' }).optional(),
  vatCashAccounting: z.boolean({ error: 'Say whether the firm uses cash accounting.' }).optional(),
})
  // `when` runs these even while other fields have errors, so every problem shows at once
  .refine(v => !(v.vatRegistered === true && !v.vatNumber), { path: ['vatNumber'], message: 'A VAT-registered firm needs its VAT number.', when: whenObject })
  .refine(v => !(v.cisStatus !== 'not-registered' && !v.utr), { path: ['utr'], message: 'CIS registration needs the firm\'s UTR.', when: whenObject })
export type FirmSettingsInput = z.infer<typeof firmSettingsSchema>

import { z } from 'zod'
import { isoDate, nameField, queryWholeNumber, text, whenObject } from './common'
import { accountNumberProblem, digitsOnly, sortCodeProblem } from '../utils/bank-details'

const upTo = (max: number) => text().trim().max(max, { error: `Keep it under ${max} characters.` })

/** UK VAT registration number: GB then 9 digits (12 for a branch), spaces allowed. */
const vatNumber = text().trim().toUpperCase().transform(v => v.replace(/\s+/g, ''))
  .pipe(text().regex(/^(GB)?(\d{9}|\d{12})$/, { error: 'A UK VAT number is GB then 9 digits, for example GB123456789.' }))

/** Unique Taxpayer Reference: 10 digits. */
const utr = text().trim().transform(v => v.replace(/\s+/g, ''))
  .pipe(text().regex(/^\d{10}$/, { error: 'A UTR is 10 digits.' }))

/** A part of the bank account: blank, or as the check in shared/utils/bank-details.ts allows, kept as digits only. */
const bankDigits = (problem: (typed: string) => string | null) => text().trim()
  .superRefine((v, ctx) => {
    const p = v === '' ? null : problem(v)
    if (p) ctx.addIssue({ code: 'custom', message: p })
  })
  .transform(digitsOnly)

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
  // the bank account customers pay by transfer into (optional, so a client that does not know
  // them leaves them as they are); blanks are kept: issuing an invoice asks for them
  takesTransfer: z.boolean({ error: 'Say whether invoices offer payment by bank transfer.' }).optional(),
  bankAccountName: upTo(140).optional(),
  bankSortCode: bankDigits(sortCodeProblem).optional(),
  bankAccountNumber: bankDigits(accountNumberProblem).optional(),
  vatStagger: z.union([z.literal(1), z.literal(2), z.literal(3)], { error: 'Choose the months the VAT quarters end in.' }).optional(),
  vatCashAccounting: z.boolean({ error: 'Say whether the firm uses cash accounting.' }).optional(),
  // optional, so a client that does not know it leaves it as it is
  quoteChaseDays: z.int({ error: 'Enter the days in whole days.' }).min(1, { error: 'Follow up after at least 1 day.' }).max(90, { error: 'Keep it to 90 days or fewer.' }).optional(),
})
  // `when` runs these even while other fields have errors, so every problem shows at once
  .refine(v => !(v.vatRegistered === true && !v.vatNumber), { path: ['vatNumber'], message: 'A VAT-registered firm needs its VAT number.', when: whenObject })
  .refine(v => !(v.cisStatus !== 'not-registered' && !v.utr), { path: ['utr'], message: 'CIS registration needs the firm\'s UTR.', when: whenObject })
export type FirmSettingsInput = z.infer<typeof firmSettingsSchema>

/** The firm's Bank Rate table, replaced whole (the owner keeps it up to date from the Bank of England's figures). */
export const bankRatesSchema = z.object({
  rates: z.array(z.object({
    fromDate: isoDate('Pick the date the rate took effect.'),
    rateBp: z.int({ error: 'Enter the rate in hundredths of a percent (4.25% is 425).' }).min(0).max(2500, { error: 'Over 25%? Check the figure.' }),
  })).min(1, { error: 'Keep at least one rate.' }).max(200),
}).superRefine((v, ctx) => {
  const seen = new Set<string>()
  v.rates.forEach((r, i) => {
    if (seen.has(r.fromDate)) ctx.addIssue({ code: 'custom', path: ['rates', i, 'fromDate'], message: 'Two rates from the same day.' })
    seen.add(r.fromDate)
  })
})

/** The reminder schedule and its words, replaced whole (an empty list stops reminders). */
export const reminderRulesSchema = z.object({
  rules: z.array(z.object({
    offsetDays: z.int({ error: 'Enter whole days.' }).min(-60, { error: 'At most 60 days before.' }).max(365, { error: 'At most a year after.' }),
    subject: text().trim().min(1, { error: 'Write the subject.' }).max(200),
    body: text().trim().min(1, { error: 'Write the message.' }).max(4000),
  })).max(10, { error: 'At most 10 reminders.' }),
}).superRefine((v, ctx) => {
  const seen = new Set<number>()
  v.rules.forEach((r, i) => {
    if (seen.has(r.offsetDays)) ctx.addIssue({ code: 'custom', path: ['rules', i, 'offsetDays'], message: 'Two reminders on the same day.' })
    seen.add(r.offsetDays)
  })
})

/** The audit log's query: how many of the newest entries. */
export const auditQuery = z.object({ limit: queryWholeNumber('limit', 1, 500, 100) })

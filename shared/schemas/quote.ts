import { z } from 'zod'
import { isoDate, text, whenObject } from './common'
import { checkQuoteLinesFit, quoteLineSchema } from './line'

const pence = (what: string) => z.int({ error: `Enter ${what} in pounds and pence.` }).min(0, { error: `${what} cannot be negative.` }).max(100_000_00, { error: `${what} looks too high.` })
const percent = (max = 100) => z.int({ error: 'Enter a whole percentage.' }).min(0).max(max)

/** A making-good item of the price book: what it is, what it is priced by, and its price. */
export const makingGoodItemSchema = z.object({
  name: text({ error: 'Name the item.' }).trim().min(2, { error: 'Name the item, like "Make good round a socket".' }).max(120, { error: 'Keep the name under 120 characters.' }),
  unit: text({ error: 'Enter the unit, like item.' }).trim().min(1, { error: 'Enter the unit, like item.' }).max(20, { error: 'Keep the unit short, like item or metre.' }),
  pricePence: pence('The price'),
})
export type MakingGoodItemInput = z.infer<typeof makingGoodItemSchema>

/** A time of the working day as minutes after midnight: 0 (00:00) to 1439 (23:59). */
const dayTime = (what: string) => z.int({ error: `Enter ${what} of the working day as a time, like 08:00.` })
  .min(0, { error: `Enter ${what} of the working day as a time, like 08:00.` })
  .max(1439, { error: `Enter ${what} of the working day as a time, like 16:30.` })

const stockLength = z.int({ error: 'A bead length is a whole number of millimetres.' })
  .min(500, { error: 'A bead length is at least 0.5 m.' })
  .max(6000, { error: 'A bead length is at most 6 m.' })

export const priceBookSchema = z.object({
  skimWallsPerM2Pence: pence('The wall skim rate'),
  skimCeilingsPerM2Pence: pence('The ceiling skim rate'),
  undercoatPerM2Pence: pence('The undercoat rate'),
  revealsPerLmPence: pence('The reveal rate'),
  beadsPerLmPence: pence('The bead rate'),
  scrimPerLmPence: pence('The scrim rate'),
  materialsMarkupPercent: percent(200),
  minDeductCm2: z.union([z.literal(0), z.literal(5000)], { error: 'Deduct every opening (0) or leave voids up to 0.5 m² in (5000 cm²).' }),
  narrowMaxMm: z.int().min(50).max(1000),
  beadStockLengthsMm: z.array(stockLength, { error: 'Enter the bead lengths you buy.' })
    .min(1, { error: 'Enter at least one bead length, like 2.5, 3.0.' })
    .max(4, { error: 'Four bead lengths at most.' })
    .refine(a => new Set(a).size === a.length, { error: 'Each bead length once only.' }),
  beadWastePercent: percent(50),
  materialsWastePercent: percent(50),
  m2PerDay: z.int({ error: 'Enter the square metres finished in a day.' }).min(1).max(500),
  // site rules: optional, so a client that does not know them leaves them as they are
  drySkimDays: z.int({ error: 'Enter whole days.' }).min(0).max(90, { error: 'Over 90 days? Check the figure.' }).optional(),
  dryUndercoatDays: z.int({ error: 'Enter whole days.' }).min(0).max(120, { error: 'Over 120 days? Check the figure.' }).optional(),
  dryColdOrDampExtraDays: z.int({ error: 'Enter whole days.' }).min(0).max(90, { error: 'Over 90 days? Check the figure.' }).optional(),
  cornerTrowelMm: z.int({ error: 'Enter the width in whole mm.' }).min(20, { error: 'At least 20 mm.' }).max(400, { error: 'Over 400 mm? Check the figure.' }).optional(),
  outOfTrueToleranceMm: z.int({ error: 'Enter whole mm.' }).min(0).max(100, { error: 'Over 100 mm? Check the figure.' }).optional(),
  bagsPerPersonPerSet: z.int({ error: 'Enter whole bags.' }).min(1, { error: 'At least one bag.' }).max(20, { error: 'Over 20 bags? Check the figure.' }).optional(),
  // optional, like the site rules: a client that does not know them leaves the list as it is
  makingGoodItems: z.array(makingGoodItemSchema).max(40, { error: 'Forty making-good items at most.' })
    .refine(a => new Set(a.map(i => i.name.trim().toLowerCase())).size === a.length, { error: 'Each making-good item needs its own name.' })
    .optional(),
  // issue 16, optional like the site rules: corner work on the quote, the planner's ceilings rule,
  // and the figures of the day's timeline (rules of thumb the firm sets)
  packedBeadPerLmPence: pence('The rate for packing out a bead').optional(),
  narrowReturnPerLmPence: pence('The rate for a narrow return').optional(),
  ceilingsFirst: z.boolean({ error: 'Tick the box or leave it clear.' }).optional(),
  quoteWorkPage: z.boolean({ error: 'Tick the box or leave it clear.' }).optional(),
  mixMinutes: z.int({ error: 'Enter whole minutes.' }).min(1, { error: 'At least 1 minute.' }).max(120, { error: 'Over 120 minutes to mix? Check the figure.' }).optional(),
  goOffMinutes: z.int({ error: 'Enter whole minutes.' }).min(20, { error: 'At least 20 minutes: check the figure.' }).max(360, { error: 'Over 6 hours (360 minutes)? Check the figure.' }).optional(),
  dayStartMinutes: dayTime('the start').optional(),
  dayEndMinutes: dayTime('the end').optional(),
})
  // the working day: both ends together (so the rule is checked on the whole day, never against a
  // stored half), the end after the start
  .superRefine((v, ctx) => {
    const start = v.dayStartMinutes
    const end = v.dayEndMinutes
    if (start === undefined && end !== undefined) ctx.addIssue({ code: 'custom', path: ['dayStartMinutes'], message: 'Enter when the working day starts as well as when it ends.' })
    if (end === undefined && start !== undefined) ctx.addIssue({ code: 'custom', path: ['dayEndMinutes'], message: 'Enter when the working day ends as well as when it starts.' })
    if (typeof start === 'number' && typeof end === 'number' && end <= start) ctx.addIssue({ code: 'custom', path: ['dayEndMinutes'], message: 'The working day must end after it starts.' })
  }, { when: whenObject })
export type PriceBookInput = z.infer<typeof priceBookSchema>

export { quoteLineSchema }

export const quoteVersionSchema = z.object({
  pricing: z.enum(['measure', 'days', 'fixed'], { error: 'Choose how the quote is priced.' }),
  estimatedDaysX100: z.int().min(0).max(100_000),
  fixedPricePence: pence('The fixed price').nullable().default(null),
  vat: z.enum(['standard', 'reverse-charge', 'not-registered']),
  cisRatePercent: z.union([z.literal(0), z.literal(20), z.literal(30)]).nullable().default(null),
  validUntil: isoDate('Pick the date the quote is good until.'),
  terms: text().trim().max(4000).default(''),
  notes: text().trim().max(4000).default(''),
  cautions: z.array(text().max(500)).max(10).default([]),
  lines: z.array(quoteLineSchema).max(200).default([]),
})
  .refine(v => v.pricing !== 'fixed' || v.fixedPricePence !== null, { path: ['fixedPricePence'], error: 'Enter the fixed price.', when: whenObject })
  .refine(v => v.vat !== 'reverse-charge' || v.cisRatePercent !== null, { path: ['cisRatePercent'], error: 'The reverse charge applies to work paid under CIS: choose the CIS rate.', when: whenObject })
  .refine(v => v.pricing !== 'days' || v.estimatedDaysX100 > 0, { path: ['estimatedDaysX100'], error: 'Enter the days it will take.', when: whenObject })
  .superRefine((v, ctx) => checkQuoteLinesFit(v.lines, ctx))
export type QuoteVersionInput = z.input<typeof quoteVersionSchema>

export const newQuoteSchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid().nullable().default(null),
  enquiryId: z.uuid().nullable().default(null),
  visitId: z.uuid().nullable().default(null),
})

/** The customer accepts a quote at its link, typing their name. */
export const acceptQuoteSchema = z.object({ name: text({ error: 'Type your name to accept.' }).trim().min(2, { error: 'Type your full name to accept.' }).max(120) })

/** The customer declines a quote at its link, with a reason. */
export const declineQuoteSchema = z.object({ reason: text({ error: 'Tell the firm why, so they can do better.' }).trim().min(2, { error: 'Tell the firm why (a few words is fine).' }).max(1000) })

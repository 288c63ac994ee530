import { z } from 'zod'
import { isoDate, isoDateTime, queryWholeNumber, text, whenObject } from './common'
import { daysBetween } from '../utils/dates'
import { DAY_PORTIONS, JOB_STATUSES, LOG_COATS } from '../utils/jobs'
import { inTheFuture, MAX_PACKS_X1000, setTooLong } from '../utils/set-log'
import { PLAN_ACTIONS } from '../utils/plan-actions'

const pickDate = isoDate('Pick a date.')
const upTo = (max: number) => text().trim().max(max, { error: `Keep it under ${max} characters.` })

/** A price in whole pence, 0 or more (£1,000,000 at most). */
const pence = (what: string) => z.int({ error: `Enter the ${what} in pounds and pence.` })
  .min(0, { error: `The ${what} cannot be negative.` })
  .max(100_000_000, { error: `That ${what} looks too high: check the figure.` })

/**
 * The price of a job agreed without a quote, net of VAT: labour and materials. The server works
 * out the net and the gross (VAT as the firm and customer call for). Only someone with
 * money:write may send them.
 */
export const JOB_PRICE_FIELDS = ['labourNetPence', 'materialsNetPence'] as const
const jobPrice = {
  labourNetPence: pence('labour price').optional(),
  materialsNetPence: pence('materials price').optional(),
}

/** A job made directly (not from a quote). */
export const newJobSchema = z.object({
  customerId: z.uuid({ error: 'Choose the customer.' }),
  siteId: z.uuid({ error: 'Choose the site.' }).nullable().default(null),
  visitId: z.uuid().nullable().default(null),
  title: text({ error: 'Say what the job is.' }).trim().min(1, { error: 'Say what the job is, like Skim the front bedroom.' }).max(200),
  estimatedDaysX100: z.int().min(0).max(100_000).default(0),
  notes: upTo(4000).default(''),
  ...jobPrice,
})

/** A change to a job: its title, and its notes and price when given (left as they are when not). */
export const jobUpdateSchema = z.object({
  title: text({ error: 'Say what the job is.' }).trim().min(1, { error: 'Say what the job is.' }).max(200, { error: 'Keep it under 200 characters.' }),
  notes: upTo(4000).optional(),
  ...jobPrice,
})

export const jobMoveSchema = z.object({
  to: z.enum(JOB_STATUSES, { error: 'Choose the new status.' }),
  reason: upTo(500).default(''),
}).refine(v => v.to !== 'cancelled' || v.reason.length > 0, { path: ['reason'], error: 'Say why the job is cancelled.' })

export const jobDaySchema = z.object({
  day: pickDate,
  userId: z.uuid({ error: 'Choose who works the day.' }),
  portion: z.enum(DAY_PORTIONS).default('day'),
})
/** The whole booking of a job: every day and who works it (days already worked are kept as worked). */
export const jobDaysSchema = z.object({
  days: z.array(jobDaySchema).max(200, { error: 'At most 200 booked days on one job.' }),
}).superRefine((v, ctx) => {
  const seen = new Set<string>()
  v.days.forEach((d, i) => {
    const key = `${d.day}|${d.userId}`
    if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['days', i, 'userId'], message: 'That person is already booked on that day.' })
    seen.add(key)
  })
})

export const dayWorkedSchema = z.object({ worked: z.boolean({ error: 'Worked or not?' }), portion: z.enum(DAY_PORTIONS).optional() })

export const planSettingsSchema = z.object({
  people: z.int({ error: 'Enter how many people lay on.' }).min(1, { error: 'At least one person.' }).max(12, { error: 'More than 12 on one job? Check the figure.' }),
  bagsPerPersonPerSet: z.int({ error: 'Enter whole bags.' }).min(1, { error: 'At least one bag.' }).max(20, { error: 'Over 20 bags each in one set? Check the figure.' }),
  /** Tenths of a square metre a bag covers at the skim thickness (10 m² = 100). */
  coverageM2PerBagX10: z.int({ error: 'Enter the square metres a bag covers.' }).min(1).max(1000),
  /** Surfaces moved by hand now: surface id -> the set number as seen on the plan. Kept with earlier moves. */
  moves: z.record(z.uuid(), z.int().min(1).max(200)).default({}),
  /** Forget every move made by hand: back to the planner's own plan. */
  resetMoves: z.boolean().default(false),
})

export const setLogSchema = z.object({
  kind: z.enum(['set', 'problem']).default('set'),
  setNumber: z.int().min(1).max(200).nullable().default(null),
  startedAt: isoDateTime('Enter the start time.').nullable().default(null),
  endedAt: isoDateTime('Enter the end time.').nullable().default(null),
  coat: z.enum(LOG_COATS, { error: 'Choose the coat.' }).nullable().default(null),
  surfaceIds: z.array(z.uuid()).max(200).default([]),
  /** The plan's tasks of the set ticked as done (each on that set of the plan, checked by the route). */
  tasks: z.array(z.object({
    surfaceId: z.uuid({ error: 'That surface is not on this job.' }),
    action: z.enum(PLAN_ACTIONS, { error: 'Choose fill, undercoat, tight coat or skim.' }),
  })).max(400).default([]),
  /** Made on the phone when the form opened: a resend of the same entry is stored once (POST only). */
  clientId: z.uuid({ error: 'The entry\'s id from the phone is not an id.' }).nullable().default(null),
  userIds: z.array(z.uuid()).max(20).default([]),
  coldOrDamp: z.boolean().default(false),
  notes: upTo(2000).default(''),
  materials: z.array(z.object({
    materialId: z.uuid({ error: 'Choose the material.' }),
    packsX1000: z.int({ error: 'Enter the bags mixed.' }).min(1, { error: 'Enter the bags mixed, like 1.5.' }).max(MAX_PACKS_X1000, { error: `More than ${MAX_PACKS_X1000 / 1000} in one set? Check the figure.` }),
  })).max(20).default([]),
})
  .refine(v => v.kind !== 'set' || v.coat !== null, { path: ['coat'], error: 'Choose the coat: fill, tight coat, first or second.', when: whenObject })
  .refine(v => v.kind !== 'set' || !Array.isArray(v.surfaceIds) || v.surfaceIds.length > 0, { path: ['surfaceIds'], error: 'Tick the surfaces done in this set.', when: whenObject })
  .refine(v => v.kind !== 'problem' || typeof v.notes !== 'string' || v.notes.length > 0, { path: ['notes'], error: 'Say what the problem is.', when: whenObject })
  .refine(v => !(typeof v.startedAt === 'string' && typeof v.endedAt === 'string') || Date.parse(v.endedAt) >= Date.parse(v.startedAt), { path: ['endedAt'], error: 'The end is before the start.', when: whenObject })
  .superRefine((v, ctx) => {
    if (typeof v.startedAt !== 'string' || typeof v.endedAt !== 'string') return
    const why = setTooLong(v.startedAt, v.endedAt)
    if (why) ctx.addIssue({ code: 'custom', path: ['endedAt'], message: why })
  }, { when: whenObject })
  .refine(v => !Array.isArray(v.materials) || new Set(v.materials.map(m => m?.materialId)).size === v.materials.length, { path: ['materials'], error: 'Each material once: add the bags together.', when: whenObject })
  .refine(v => !Array.isArray(v.tasks) || new Set(v.tasks.map(t => `${t?.surfaceId}|${t?.action}`)).size === v.tasks.length, { path: ['tasks'], error: 'Each task once.', when: whenObject })
  .superRefine((v, ctx) => {
    // times still to come (beyond a few minutes' slack for a phone's clock) are not a set done
    for (const key of ['startedAt', 'endedAt'] as const) {
      const at = v[key]
      const why = typeof at === 'string' ? inTheFuture(at) : null
      if (why) ctx.addIssue({ code: 'custom', path: [key], message: why })
    }
  }, { when: whenObject })

export const diaryQuery = z.object({
  from: pickDate,
  to: pickDate,
}).refine(v => v.from <= v.to, { path: ['to'], error: 'The end is before the start.' })
  .refine(v => !(daysBetween(v.from, v.to) > 62), { path: ['to'], error: 'Ask for at most two months at a time.' })

/** The jobs list's query: one status, or every one, a page at a time. */
export const jobListQuery = z.object({
  status: z.enum(JOB_STATUSES, { error: 'Choose one of the job statuses.' }).optional(),
  page: queryWholeNumber('A page', 1, 10_000, 1),
  pageSize: queryWholeNumber('A page size', 1, 200, 50),
})

/** A job's log entry in the path: /api/jobs/:id/logs/:logId. */
export const jobLogParam = z.object({ id: z.uuid({ error: 'Not found.' }), logId: z.uuid({ error: 'Not found.' }) })

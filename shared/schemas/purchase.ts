import { z } from 'zod'
import { isoDate, text, whenObject } from './common'

export const PURCHASE_CATEGORIES = ['materials', 'tools', 'fuel', 'vehicle', 'labour', 'other'] as const
export const PURCHASE_CATEGORY_LABELS: Record<(typeof PURCHASE_CATEGORIES)[number], string> = { materials: 'Materials', tools: 'Tools', fuel: 'Fuel', vehicle: 'Vehicle', labour: 'Labour paid to others', other: 'Other' }

const pence = (what: string) => z.int({ error: `Enter ${what} in pounds and pence.` }).min(0, { error: `${what} cannot be negative.` }).max(10_000_000_00, { error: `${what} looks too high.` })

/** A purchase, with its net split across jobs (the split may not add up to more than the net). */
export const purchaseSchema = z.object({
  supplier: text({ error: 'Name the supplier.' }).trim().min(1, { error: 'Name the supplier.' }).max(200),
  boughtOn: isoDate('Pick the date of the receipt.'),
  category: z.enum(PURCHASE_CATEGORIES, { error: 'Choose materials, tools, fuel, vehicle, labour paid to others, or other.' }),
  netPence: pence('The amount before VAT'),
  vatPence: pence('The VAT').default(0),
  reference: text().trim().max(200).default(''),
  notes: text().trim().max(2000).default(''),
  jobs: z.array(z.object({ jobId: z.uuid({ error: 'Choose the job.' }), netPence: pence('The amount for this job').refine(n => n > 0, { error: 'Enter the amount for this job.' }) })).max(20).default([]),
})
  .refine(p => !(typeof p.netPence === 'number' && p.netPence >= 0) || !Array.isArray(p.jobs) || p.jobs.reduce((s, j) => s + (j?.netPence ?? 0), 0) <= p.netPence, { path: ['jobs'], error: 'The jobs add up to more than the purchase.', when: whenObject })
  .refine(p => !Array.isArray(p.jobs) || new Set(p.jobs.map(j => j?.jobId)).size === p.jobs.length, { path: ['jobs'], error: 'Each job once: add its amounts together.', when: whenObject })

export const purchaseListQuery = z.object({
  from: isoDate().optional(),
  to: isoDate().optional(),
  jobId: z.uuid().optional(),
})

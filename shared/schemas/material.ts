import { z } from 'zod'
import { text, whenObject } from './common'

export const MATERIAL_TYPES = ['finish', 'bonding-undercoat', 'browning', 'bead', 'scrim', 'bonding-agent', 'other'] as const
export const MATERIAL_TYPE_LABELS: Record<(typeof MATERIAL_TYPES)[number], string> = {
  'finish': 'Finish plaster',
  'bonding-undercoat': 'Bonding undercoat',
  'browning': 'Browning or other undercoat',
  'bead': 'Bead',
  'scrim': 'Scrim',
  'bonding-agent': 'Bonding agent',
  'other': 'Other',
}
/** Kinds measured by area (m² a pack at a thickness) and by length (metres a pack). */
export const AREA_TYPES: readonly string[] = ['finish', 'bonding-undercoat', 'browning']
export const LENGTH_TYPES: readonly string[] = ['bead', 'scrim']

/**
 * One material of the firm's catalogue. Coverage is either by area (cm² a pack, so 10.5 m² is
 * 105000, at a thickness in mm) or by length (mm a pack); which one follows from the kind.
 */
export const materialSchema = z.object({
  type: z.enum(MATERIAL_TYPES, { error: 'Choose the kind of material.' }),
  name: text({ error: 'Name the material.' }).trim().min(1, { error: 'Name the material, like Finish plaster.' }).max(120, { error: 'Keep the name under 120 characters.' }),
  packLabel: text({ error: 'Describe the pack.' }).trim().min(1, { error: 'Describe the pack, like 25 kg bag.' }).max(60),
  // at least 0.1 m² a pack (1,000 cm²): below that a figure is a slip of the finger (a 25 kg bag of
  // finish covers about 10 to 12 m² at 2 mm, of bonding 2.5 to 3.5 m² at 8 to 11 mm: common practice)
  coverageCm2PerPack: z.int({ error: 'Enter the square metres a pack covers.' }).min(1000, { error: 'A pack covers at least 0.1 m²: enter the square metres, like 10.5.' }).max(10_000_000, { error: 'That coverage looks too big.' }).nullable().default(null),
  atThicknessMm: z.int({ error: 'Enter the thickness in whole mm.' }).min(1, { error: 'The thickness must be at least 1 mm.' }).max(50, { error: 'Over 50 mm? Check the figure.' }).nullable().default(null),
  coverageMmPerPack: z.int({ error: 'Enter the metres in a pack.' }).min(1, { error: 'A pack must hold more than 0 m.' }).max(10_000_000, { error: 'That length looks too big.' }).nullable().default(null),
  costPence: z.int({ error: 'Enter the price in pounds and pence.' }).min(0, { error: 'The price cannot be negative.' }).max(100_000_00, { error: 'That price looks too high.' }),
  supplier: text().trim().max(120, { error: 'Keep the supplier under 120 characters.' }).default(''),
  active: z.boolean().default(true),
})
  .refine(m => !AREA_TYPES.includes(m.type) || m.coverageCm2PerPack !== null, { path: ['coverageCm2PerPack'], error: 'Enter the square metres a pack covers.', when: whenObject })
  .refine(m => !AREA_TYPES.includes(m.type) || m.atThicknessMm !== null, { path: ['atThicknessMm'], error: 'Enter the thickness that coverage is for.', when: whenObject })
  .refine(m => !LENGTH_TYPES.includes(m.type) || m.coverageMmPerPack !== null, { path: ['coverageMmPerPack'], error: 'Enter the metres in a pack (a bead\'s length, a roll\'s length).', when: whenObject })
  .refine(m => !(m.coverageCm2PerPack !== null && m.coverageMmPerPack !== null), { path: ['coverageMmPerPack'], error: 'Give coverage by area or by length, not both.', when: whenObject })
export type MaterialInput = z.input<typeof materialSchema>

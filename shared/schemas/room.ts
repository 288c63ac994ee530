import { z } from 'zod'
import { BACKGROUNDS, CONDITION_KINDS, CORNER_KINDS, OPENING_KINDS, SURFACE_KINDS } from '../utils/ledger'
import { rectCm2 } from '../utils/measure'
import { text } from './common'

// A room is saved whole: its surfaces (each with openings and conditions) and the corners
// between them. Every item carries an id made by the client, so a draft kept on the phone
// while offline saves to the same rows when the signal comes back.

const mm = (what: string, max: number) => z.int({ error: `Enter the ${what} in metres.` })
  .min(1, { error: `The ${what} must be more than 0.` })
  .max(max, { error: `The ${what} looks too big (over ${max / 1000} m).` })

export const openingSchema = z.object({
  id: z.uuid(),
  kind: z.enum(OPENING_KINDS, { error: 'Choose door, window or other void.' }),
  widthMm: mm('width', 10_000),
  heightMm: mm('height', 10_000),
  /** Where it is, when it was measured: from the surface's left end, and from the floor (null: drawn centred). */
  fromLeftMm: z.int({ error: 'Enter the distance in metres.' }).min(0, { error: 'Type metres, like 0.60, or leave it empty.' }).max(100_000, { error: 'That distance looks too big.' }).nullable().default(null),
  fromFloorMm: z.int({ error: 'Enter the distance in metres.' }).min(0, { error: 'Type metres, like 0.90, or leave it empty.' }).max(20_000, { error: 'That distance looks too big.' }).nullable().default(null),
})

export const conditionSchema = z.object({
  id: z.uuid(),
  kind: z.enum(CONDITION_KINDS, { error: 'Choose what was found.' }),
  areaCm2: z.int().min(1, { error: 'Enter the patch area.' }).max(2_000_000).nullable().default(null),
  lengthMm: z.int().min(1).max(100_000).nullable().default(null),
  outOfTrueMm: z.int().min(1, { error: 'Enter by how many mm.' }).max(200, { error: 'Over 200 mm out of true? Check the figure.' }).nullable().default(null),
  scrimmed: z.boolean().default(false),
  notes: text().trim().max(1000).default(''),
})
  .refine(c => !c.kind.startsWith('patch-') || c.areaCm2 !== null, { path: ['areaCm2'], error: 'Enter the patch area in m².' })
  .refine(c => !['crack', 'frame-gap'].includes(c.kind) || c.lengthMm !== null, { path: ['lengthMm'], error: 'Enter the length in metres.' })
  .refine(c => c.kind !== 'out-of-true' || c.outOfTrueMm !== null, { path: ['outOfTrueMm'], error: 'Enter by how many mm it is out of true.' })

export const surfaceSchema = z.object({
  id: z.uuid(),
  kind: z.enum(SURFACE_KINDS, { error: 'Choose the kind of surface.' }),
  label: text().trim().max(60).default(''),
  lengthMm: mm('length', 100_000),
  secondMm: mm('second measurement', 20_000),
  background: z.enum(BACKGROUNDS).default('sound-plaster'),
  notes: text().trim().max(1000).default(''),
  openings: z.array(openingSchema).max(20, { error: 'At most 20 openings on one surface.' }).default([]),
  conditions: z.array(conditionSchema).max(30, { error: 'At most 30 findings on one surface.' }).default([]),
}).superRefine((s, ctx) => {
  const area = rectCm2(s.lengthMm, s.secondMm)
  const holes = s.openings.reduce((sum, o) => sum + rectCm2(o.widthMm, o.heightMm), 0)
  if (holes > area) ctx.addIssue({ code: 'custom', path: ['openings'], message: 'The openings add up to more than the surface.' })
  s.openings.forEach((o, i) => {
    if (o.fromLeftMm !== null && o.fromLeftMm + o.widthMm > s.lengthMm) ctx.addIssue({ code: 'custom', path: ['openings', i, 'fromLeftMm'], message: 'The opening runs past the end of the surface.' })
    if (o.fromFloorMm !== null && o.fromFloorMm + o.heightMm > s.secondMm) ctx.addIssue({ code: 'custom', path: ['openings', i, 'fromFloorMm'], message: 'The opening runs past the top of the surface.' })
  })
  s.conditions.forEach((c, i) => {
    if (c.areaCm2 !== null && c.areaCm2 > area) ctx.addIssue({ code: 'custom', path: ['conditions', i, 'areaCm2'], message: 'The patch is bigger than the surface.' })
  })
})

export const cornerSchema = z.object({
  id: z.uuid(),
  surfaceAId: z.uuid(),
  surfaceBId: z.uuid(),
  kind: z.enum(CORNER_KINDS, { error: 'Choose internal or external.' }),
  lengthMm: mm('corner length', 20_000),
  returnWidthMm: z.int().min(1).max(2_000).nullable().default(null),
  needsBead: z.boolean().default(false),
  packedOut: z.boolean().default(false),
})

export const roomSchema = z.object({
  /** The revision this draft started from (0 for a new room); an older one than saved is a 409. */
  revision: z.int().min(0),
  name: text({ error: 'Name the room.' }).trim().min(1, { error: 'Name the room, like Front bedroom.' }).max(80),
  position: z.int().min(0).max(1000).default(0),
  notes: text().trim().max(2000).default(''),
  surfaces: z.array(surfaceSchema).max(60, { error: 'At most 60 surfaces in one room.' }).default([]),
  corners: z.array(cornerSchema).max(60).default([]),
}).superRefine((r, ctx) => {
  const ids = new Set(r.surfaces.map(s => s.id))
  if (ids.size !== r.surfaces.length) ctx.addIssue({ code: 'custom', path: ['surfaces'], message: 'Two surfaces have the same id.' })
  r.corners.forEach((c, i) => {
    if (!ids.has(c.surfaceAId) || !ids.has(c.surfaceBId)) ctx.addIssue({ code: 'custom', path: ['corners', i], message: 'A corner joins two surfaces of this room.' })
    else if (c.surfaceAId === c.surfaceBId) ctx.addIssue({ code: 'custom', path: ['corners', i], message: 'A corner joins two different surfaces.' })
    if (c.packedOut && !c.needsBead) ctx.addIssue({ code: 'custom', path: ['corners', i, 'packedOut'], message: 'Only a beaded corner is packed out.' })
  })
})
export type RoomInput = z.input<typeof roomSchema>
export type Room = z.output<typeof roomSchema>

/** A room's route: the visit's id and the room's. */
export const roomParams = z.object({ id: z.uuid(), roomId: z.uuid() })

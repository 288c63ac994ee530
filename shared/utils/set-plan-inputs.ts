// From what was recorded on the visit to what the set planner reads (./set-plan.ts).
//
// The rooms are the saved rooms (`Room` in ../schemas/room.ts fits): surfaces in whole
// millimetres with their openings and conditions, and the corners between them. This turns them
// into planner surfaces and corners by the trade's rules (../shared/DOMAIN.md, "Planning the
// sets", common practice), with the firm's own figures for what counts as difficult:
// - the area of each surface is the net area the take-off prices for the skim (openings deducted
//   by the same small-voids rule as the quote, via takeoffRoom), so the plan and the quote agree;
// - a difficult corner (`dryCorner`) is an internal corner whose return is narrower than the
//   firm's corner trowel, or where either wall is out of true by more than the firm's tolerance;
// - patches back to the undercoat or to masonry (the `patch-` conditions) become `patches`;
// - a gap round a frame or a crack bridged with scrim becomes `scrimmedGap`;
// - a packed-out bead becomes `packedBead`, its face being the surface with the larger area.
// A surface back to masonry or to the undercoat all over takes undercoat over the whole surface
// before it is skimmed (as the take-off counts it); its patches are under that undercoat, so they
// are not filled on their own.
//
// One source for quantities: given the take-off's undercoat figures (`undercoatTakeoff` in
// ./materials.ts: the catalogue's undercoat, its thickness and the firm's waste), each surface's
// patch fill (`fillBags`) and whole-surface undercoat (`undercoatBags`, a task of its own in an
// earlier set than the skim) are the quote's own sum (`areaBags`) over that surface's take-off
// lines, rounded UP to tenths of a bag per surface (the quote rounds its total up to whole packs
// once): a 0.5 m² patch the quote counts as 0.61 bag of undercoat is 0.7 bag in the plan. Without
// those figures (or with no undercoat in the catalogue) a patch fill is counted at the skim's
// coverage by the planner, and a whole-surface undercoat is left to a note. Pure: no database, no Vue.
import type { Background, ConditionKind, CornerKind, OpeningKind, SurfaceKind } from './ledger'
import { BACKGROUND_LABELS, SURFACE_KIND_LABELS } from './ledger'
import type { UndercoatTakeoff } from './materials'
import { areaBags, tenthsUp } from './materials'
import type { PlanCorner, PlanSurface } from './set-plan'
import { takeoffRoom } from './takeoff'

export interface PlanInputCondition {
  kind: ConditionKind
  areaCm2?: number | null
  lengthMm?: number | null
  outOfTrueMm?: number | null
  scrimmed?: boolean
}
export interface PlanInputSurface {
  id: string
  kind: SurfaceKind
  label?: string
  lengthMm: number
  secondMm: number
  background?: Background
  openings?: { kind: OpeningKind, widthMm: number, heightMm: number }[]
  conditions?: PlanInputCondition[]
}
export interface PlanInputCorner {
  kind: CornerKind
  surfaceAId: string
  surfaceBId: string
  /** How wide the return is, in mm; null or missing when it was not measured (then it is not counted as narrow). */
  returnWidthMm?: number | null
  packedOut?: boolean
}
export interface PlanInputRoom {
  name: string
  surfaces: PlanInputSurface[]
  corners?: PlanInputCorner[]
}

export interface PlanInputRules {
  /** The width of the firm's corner trowel in mm: a return narrower than this makes the corner difficult. */
  cornerTrowelMm: number
  /** How far out of true (mm) a wall may be before its corners count as difficult; more than this is difficult. */
  outOfTrueToleranceMm: number
  /** The quote's small-voids rule: openings of this area (cm²) or less stay in. Default 0: every opening comes off. */
  minDeductCm2?: number
}

export interface PlanInputs {
  surfaces: PlanSurface[]
  corners: PlanCorner[]
  /** A name for each surface id, for the planner's reasons: "Front bedroom · Wall 2 (window wall)". */
  labels: Record<string, string>
  /** Things the plan does not cover, in plain words (an undercoat over a whole surface, say). */
  notes: string[]
}

const AREA_KEYS = new Set(['skim-walls', 'skim-ceilings', 'reveals-area', 'reveals-lm'])
const WHOLE_UNDERCOAT: readonly Background[] = ['masonry', 'undercoat']

function checkRules(rules: PlanInputRules): void {
  if (typeof rules.cornerTrowelMm !== 'number' || !Number.isFinite(rules.cornerTrowelMm) || rules.cornerTrowelMm <= 0) {
    throw new RangeError(`cornerTrowelMm must be a width in mm over 0, got ${String(rules.cornerTrowelMm)}`)
  }
  if (typeof rules.outOfTrueToleranceMm !== 'number' || !Number.isFinite(rules.outOfTrueToleranceMm) || rules.outOfTrueToleranceMm < 0) {
    throw new RangeError(`outOfTrueToleranceMm must be a number of mm, 0 or more, got ${String(rules.outOfTrueToleranceMm)}`)
  }
}

/** "Front bedroom · Wall 2 (window wall)": the room, the kind (numbered when the room has more than one), the label the plasterer gave. */
function labelsFor(room: PlanInputRoom): string[] {
  const total = new Map<SurfaceKind, number>()
  for (const s of room.surfaces) total.set(s.kind, (total.get(s.kind) ?? 0) + 1)
  const seen = new Map<SurfaceKind, number>()
  return room.surfaces.map((s) => {
    const n = (seen.get(s.kind) ?? 0) + 1
    seen.set(s.kind, n)
    const kind = SURFACE_KIND_LABELS[s.kind] + ((total.get(s.kind) ?? 0) > 1 ? ` ${n}` : '')
    const label = s.label?.trim() ?? ''
    const own = label && label.toLowerCase() !== SURFACE_KIND_LABELS[s.kind].toLowerCase() ? ` (${label})` : ''
    return `${room.name.trim()} · ${kind}${own}`
  })
}

/** Each surface's net skim area, patch fill area and whole-surface undercoat area in cm², in the room's order, exactly as the take-off works them out. */
function takeoffAreasCm2(room: PlanInputRoom, minDeductCm2: number): { net: number, fill: number, undercoat: number }[] {
  // corners are left out: only the surface lines are wanted; each surface gives exactly one area
  // line first, then its undercoat and patch lines
  const lines = takeoffRoom({ name: room.name, surfaces: room.surfaces, corners: [] }, { minDeductCm2 })
  const out: { net: number, fill: number, undercoat: number }[] = []
  for (const l of lines) {
    if (AREA_KEYS.has(l.key)) out.push({ net: l.key === 'reveals-lm' ? l.areaCm2 ?? 0 : l.quantity, fill: 0, undercoat: 0 })
    else if (l.key === 'fill-patches' && out.length) out[out.length - 1]!.fill += l.quantity
    else if (l.key === 'undercoat' && out.length) out[out.length - 1]!.undercoat += l.quantity
  }
  return out
}

/**
 * The planner's surfaces, corners and labels for a job's rooms. With `takeoff` (the quote's
 * undercoat figures, `undercoatTakeoff`), the patch fill and whole-surface undercoat bags are the
 * quote's (see the file's note). Throws a RangeError naming the field for a bad rule (or a bad
 * measurement, from the take-off); a corner naming a surface that is not there is passed on, for
 * `planSets` to warn about.
 */
export function planInputsFromRooms(rooms: PlanInputRoom[], rules: PlanInputRules, takeoff?: UndercoatTakeoff): PlanInputs {
  checkRules(rules)
  const coverage = takeoff?.coverage ?? null
  /** Bags of undercoat over an area, as the quote counts them, rounded up to tenths. */
  const undercoatBags = (cm2: number): number => tenthsUp(areaBags(cm2, takeoff!.thicknessMm, coverage!, takeoff!.wastePercent, 'The undercoat')) / 10
  const minDeductCm2 = rules.minDeductCm2 ?? 0
  const surfaces: PlanSurface[] = []
  const corners: PlanCorner[] = []
  const labels: Record<string, string> = {}
  const notes: string[] = []
  const areaCm2 = new Map<string, number>()
  const outOfTrueMm = new Map<string, number>()

  for (const room of rooms) {
    const names = labelsFor(room)
    const areas = takeoffAreasCm2(room, minDeductCm2)
    room.surfaces.forEach((s, i) => {
      const net = areas[i]?.net ?? 0
      const name = names[i]!
      if (!(s.id in labels)) labels[s.id] = name
      if (!areaCm2.has(s.id)) areaCm2.set(s.id, net)
      const conditions = s.conditions ?? []
      let worst = outOfTrueMm.get(s.id) ?? 0
      for (const c of conditions) if (c.kind === 'out-of-true' && c.outOfTrueMm) worst = Math.max(worst, c.outOfTrueMm)
      outOfTrueMm.set(s.id, worst)

      const whole = s.background !== undefined && WHOLE_UNDERCOAT.includes(s.background)
      const patches = conditions.filter(c => c.kind.startsWith('patch-') && c.areaCm2).map(c => ({ areaM2: c.areaCm2! / 10_000 }))
      const scrimmed = conditions.some(c => (c.kind === 'frame-gap' || c.kind === 'crack') && c.scrimmed === true)
      if (whole && !coverage) {
        const back = BACKGROUND_LABELS[s.background!].toLowerCase()
        notes.push(`${name} is ${back}: undercoat the whole surface before these sets (as the quote counts it)${patches.length ? '; its patches go under that undercoat, so they are not filled on their own' : ''}.`)
      }
      const out: PlanSurface = { id: s.id, areaM2: net / 10_000, kind: s.kind, room: room.name }
      if (patches.length && !whole) out.patches = patches
      if (coverage && patches.length && !whole && (areas[i]?.fill ?? 0) > 0) out.fillBags = undercoatBags(areas[i]!.fill)
      if (coverage && whole && (areas[i]?.undercoat ?? 0) > 0) out.undercoatBags = undercoatBags(areas[i]!.undercoat)
      if (scrimmed) out.scrimmedGap = true
      surfaces.push(out)
    })
  }

  for (const room of rooms) {
    for (const c of room.corners ?? []) {
      const a = c.surfaceAId
      const b = c.surfaceBId
      const out: PlanCorner = { a, b, kind: c.kind }
      const narrow = c.returnWidthMm !== null && c.returnWidthMm !== undefined && c.returnWidthMm < rules.cornerTrowelMm
      const outOfTrue = (outOfTrueMm.get(a) ?? 0) > rules.outOfTrueToleranceMm || (outOfTrueMm.get(b) ?? 0) > rules.outOfTrueToleranceMm
      if (c.kind === 'internal' && (narrow || outOfTrue)) out.dryCorner = true
      // The face of a packed-out bead is the broad side and the return the narrow one (a reveal, the
      // side of a chimney breast), so the face is taken to be the surface with more to skim; on a tie,
      // the corner's first surface. The plasterer can swap them on site.
      if (c.packedOut) out.packedBead = { face: (areaCm2.get(b) ?? 0) > (areaCm2.get(a) ?? 0) ? b : a }
      corners.push(out)
    }
  }
  return { surfaces, corners, labels, notes }
}

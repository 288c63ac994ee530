// The take-off: from measured rooms to the quantities a quote is priced on (square metres of
// skim and undercoat, linear metres of reveals, beads and scrim, whole lengths of bead).
// Lengths are whole millimetres, areas whole square centimetres, and every figure is worked in
// integers so 2.55 x 5.2 is 13.26 and never 13.259999. Each line carries its derivation in words
// and numbers, so the plasterer and the customer can check it.
//
// The rules below are the trade's rules of thumb (../shared/DOMAIN.md, "Quantities and
// materials": common practice, and from memory where it says so). They are a starting point for
// a quote, not a survey: the plasterer checks the figures against the job.
import type { Background, ConditionKind, CornerKind, OpeningKind, SurfaceKind } from './ledger'
import { OPENING_KIND_LABELS, SURFACE_KIND_LABELS } from './ledger'
import { formatMetres, formatSquareMetres, parseMetres } from './measure'

/** Older UK measurement rules (SMM7) left voids of 0.5 m² or less in: 5000 cm² (DOMAIN.md, "Areas"). */
export const SMM7_MIN_DEDUCT_CM2 = 5000

function wholeNonNegative(n: number, what: string): void {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`${what} must be a whole number of 0 or more, got ${n}`)
}

function metresToMm(m: number, what: string): number {
  if (!Number.isFinite(m) || m < 0) throw new RangeError(`${what} must be a length of 0 or more in metres, got ${m}`)
  // metres have at most 3 decimals (whole mm); Math.round absorbs the float's last bit (1.005 * 1000 = 1004.999...)
  return Math.round(m * 1000)
}

/** mm² to whole cm², half up (areas are never negative here). */
function mm2ToCm2(mm2: number): number {
  return Math.floor((mm2 + 50) / 100)
}

/**
 * Net area of a wall in m², rounded half up to 2 decimals: length x height less every opening whose
 * own area is greater than `rule.minDeductM2` (default 0: every opening is deducted; 0.5 is the SMM7
 * rule, under which a void of exactly 0.5 m² stays in). Never below 0. Metres are taken to whole
 * millimetres and the sum is done in mm², so no floating-point error reaches the answer.
 */
export function netWallAreaM2(
  wall: { lengthM: number, heightM: number, openings?: { widthM: number, heightM: number }[] },
  rule: { minDeductM2: number } = { minDeductM2: 0 },
): number {
  if (!Number.isFinite(rule.minDeductM2) || rule.minDeductM2 < 0) throw new RangeError(`minDeductM2 must be 0 or more, got ${rule.minDeductM2}`)
  const minMm2 = Math.round(rule.minDeductM2 * 1_000_000)
  let net = metresToMm(wall.lengthM, 'lengthM') * metresToMm(wall.heightM, 'heightM')
  for (const o of wall.openings ?? []) {
    const hole = metresToMm(o.widthM, 'opening widthM') * metresToMm(o.heightM, 'opening heightM')
    if (hole > minMm2) net -= hole
  }
  // hundredths of a m² are units of 10 000 mm²; half up
  return Math.floor((Math.max(0, net) + 5_000) / 10_000) / 100
}

// ---------------------------------------------------------------------------------------------
// Take-off from saved rooms

export interface TakeoffOptions {
  /** Openings of this area or less stay in the measured area: 0 (deduct all) or 5000 (SMM7, 0.5 m²). */
  minDeductCm2: number
  /** Reveals and strips up to this width are priced by the linear metre (300 mm, from memory). */
  narrowMaxMm: number
  /** Bead stock lengths on sale (2500 and 3000 mm, supplier listings). */
  beadStockLengthsMm: number[]
  /** Extra bead lengths for waste, a whole percentage (10%, common practice). */
  beadWastePercent: number
  /**
   * The firm's corner trowel, in mm (the price book's `cornerTrowelMm`, 100 mm by default, a common
   * size from memory): an internal corner whose return is narrower is made good by hand.
   */
  cornerTrowelMm: number
}

export const DEFAULT_TAKEOFF_OPTIONS: TakeoffOptions = {
  minDeductCm2: 0,
  narrowMaxMm: 300,
  beadStockLengthsMm: [2500, 3000],
  beadWastePercent: 10,
  cornerTrowelMm: 100,
}

export type TakeoffKey = 'skim-walls' | 'skim-ceilings' | 'reveals-lm' | 'reveals-area' | 'undercoat' | 'fill-patches' | 'scrim' | 'beads' | 'packed-bead' | 'narrow-return' | 'bead-lengths'
export type TakeoffUnit = 'm2' | 'lm' | 'lengths' | 'item'

export interface TakeoffLine {
  key: TakeoffKey
  /** The room's name; 'All rooms' for the job-wide bead order of `takeoffRooms`. */
  roomName: string
  surfaceId?: string
  cornerId?: string
  unit: TakeoffUnit
  /** In the smallest unit: cm² for 'm2', mm for 'lm', a count for 'lengths' and 'item'. */
  quantity: number
  /** The working in words and numbers, e.g. `Window wall 4.00 x 2.40 - window 1.20 x 1.00 = 8.40 m²`. */
  derivation: string
  /** On 'reveals-lm' lines: the face area (length x depth, cm²) that still takes plaster. */
  areaCm2?: number
  /** On 'bead-lengths' lines: which stock length is counted. */
  stockLengthMm?: number
}

/** What the take-off reads of a room: `Room` from shared/schemas/room.ts fits. */
export interface TakeoffSurface {
  id: string
  kind: SurfaceKind
  label?: string
  lengthMm: number
  secondMm: number
  background?: Background
  openings?: { kind: OpeningKind, widthMm: number, heightMm: number }[]
  conditions?: { kind: ConditionKind, areaCm2?: number | null, lengthMm?: number | null, scrimmed?: boolean }[]
}
export interface TakeoffCorner {
  id: string
  kind: CornerKind
  lengthMm: number
  /** The width of the corner's return (the narrower face), when measured. */
  returnWidthMm?: number | null
  needsBead?: boolean
  /** The bead has to be packed out (only a beaded corner is: shared/schemas/room.ts). */
  packedOut?: boolean
  surfaceAId?: string
  surfaceBId?: string
}
export interface TakeoffRoom {
  name: string
  surfaces: TakeoffSurface[]
  corners?: TakeoffCorner[]
}

function checkOptions(o: TakeoffOptions): void {
  wholeNonNegative(o.minDeductCm2, 'minDeductCm2')
  wholeNonNegative(o.narrowMaxMm, 'narrowMaxMm')
  wholeNonNegative(o.beadWastePercent, 'beadWastePercent')
  if (!Number.isSafeInteger(o.cornerTrowelMm) || o.cornerTrowelMm <= 0) throw new RangeError(`cornerTrowelMm must be a whole number of mm over 0, got ${o.cornerTrowelMm}`)
  if (o.beadStockLengthsMm.length === 0) throw new RangeError('beadStockLengthsMm needs at least one stock length')
  for (const s of o.beadStockLengthsMm) {
    if (!Number.isSafeInteger(s) || s <= 0) throw new RangeError(`a bead stock length must be a whole number of mm over 0, got ${s}`)
  }
}

/** A stock length for people: 2500 -> '2.5', 3000 -> '3.0', 2440 -> '2.44'. */
export function formatStockLength(mm: number): string {
  const s = (mm / 1000).toFixed(3).replace(/0+$/, '')
  return s.endsWith('.') ? `${s}0` : s
}

/**
 * The bead stock lengths as a person types them, in metres separated by commas or spaces
 * ('2.5, 3.0', '2.5 3'), to whole mm sorted shortest first; or what is wrong, in words for the
 * field. One to four lengths, each from 0.5 m to 6 m, each once. A decimal comma is not read here
 * (the comma separates the lengths).
 */
export function parseStockLengths(input: string): { ok: true, mm: number[] } | { ok: false, message: string } {
  const parts = input.split(/[\s,;]+/).filter(Boolean)
  if (!parts.length) return { ok: false, message: 'Enter the bead lengths you buy, in metres, like 2.5, 3.0.' }
  const mm: number[] = []
  for (const p of parts) {
    const n = /^\d*\.?\d+$|^\d+\.$/.test(p) ? parseMetres(p) : null
    if (n === null) return { ok: false, message: `"${p}" is not a length in metres: write them like 2.5, 3.0.` }
    if (n < 500 || n > 6000) return { ok: false, message: `${formatStockLength(n)} m? A bead length is from 0.5 m to 6 m.` }
    if (mm.includes(n)) return { ok: false, message: `${formatStockLength(n)} m is there twice: list each length once.` }
    mm.push(n)
  }
  if (mm.length > 4) return { ok: false, message: 'Four bead lengths at most.' }
  return { ok: true, mm: mm.sort((a, b) => a - b) }
}

function surfaceName(s: TakeoffSurface): string {
  return s.label?.trim() || SURFACE_KIND_LABELS[s.kind]
}

/**
 * How one corner is beaded: whole lengths of a single stock length, choosing the stock length that
 * wastes least on that corner; on a tie, the one needing fewer lengths (fewer joints), then the
 * shorter. Mixing stock lengths on one corner is left to the plasterer.
 * 2.40 m -> 1 x 2.5 m; 2.70 m -> 1 x 3.0 m; 5.00 m -> 2 x 2.5 m; 15.00 m -> 5 x 3.0 m.
 */
export function beadLengthsFor(cornerMm: number, stockLengthsMm: number[]): { count: number, stockMm: number } {
  wholeNonNegative(cornerMm, 'cornerMm')
  let best: { count: number, stockMm: number, waste: number } | null = null
  for (const stockMm of stockLengthsMm) {
    if (!Number.isSafeInteger(stockMm) || stockMm <= 0) throw new RangeError(`a bead stock length must be a whole number of mm over 0, got ${stockMm}`)
    const count = Math.ceil(cornerMm / stockMm) // integers: exact
    const waste = count * stockMm - cornerMm
    if (!best || waste < best.waste || (waste === best.waste && (count < best.count || (count === best.count && stockMm < best.stockMm)))) {
      best = { count, stockMm, waste }
    }
  }
  if (!best) throw new RangeError('beadLengthsFor needs at least one stock length')
  return { count: best.count, stockMm: best.stockMm }
}

/** Whole lengths with a whole-number waste percentage, rounded up: exact (2 + 10% -> 3, 10 + 10% -> 11). */
export function withWasteRoundedUp(count: number, wastePercent: number): number {
  wholeNonNegative(count, 'count')
  wholeNonNegative(wastePercent, 'wastePercent')
  return Math.floor((count * (100 + wastePercent) + 99) / 100) // integers only: exact
}

/** count x (100 + w) / 100 as a short decimal for the derivation: 2, 10 -> '2.2'. */
function hundredthsText(n: number): string {
  const whole = Math.floor(n / 100)
  const frac = String(n % 100).padStart(2, '0').replace(/0+$/, '')
  return frac ? `${whole}.${frac}` : String(whole)
}

interface AreaWorking { netCm2: number, text: string }

/**
 * Net area of a surface with its working: gross less every opening whose own area is over
 * `minDeductCm2`; smaller ones are named as left in. Worked in mm², rounded half up to cm² once.
 */
function surfaceArea(s: TakeoffSurface, minDeductCm2: number): AreaWorking {
  let net = s.lengthMm * s.secondMm
  let text = `${surfaceName(s)} ${formatMetres(s.lengthMm)} x ${formatMetres(s.secondMm)}`
  for (const o of s.openings ?? []) {
    const hole = o.widthMm * o.heightMm
    const what = `${OPENING_KIND_LABELS[o.kind].toLowerCase()} ${formatMetres(o.widthMm)} x ${formatMetres(o.heightMm)}`
    if (hole > minDeductCm2 * 100) {
      net -= hole
      text += ` - ${what}`
    }
    else {
      text += ` - ${what} left in (${formatSquareMetres(mm2ToCm2(hole))} m², not over ${formatSquareMetres(minDeductCm2)} m²)`
    }
  }
  const netCm2 = mm2ToCm2(Math.max(0, net))
  return { netCm2, text: `${text} = ${formatSquareMetres(netCm2)} m²` }
}

const WHOLE_UNDERCOAT: readonly Background[] = ['masonry', 'undercoat']

/**
 * The quantity lines of one surface, in this order:
 * - walls and chimney breasts -> 'skim-walls', ceilings -> 'skim-ceilings' (m², net of the
 *   openings that are over the small-voids limit);
 * - reveals and strips up to `narrowMaxMm` wide -> 'reveals-lm' (their length; openings are not
 *   looked at), wider ones -> 'reveals-area' (m², like a wall);
 * - background back to masonry or to the undercoat -> 'undercoat' over the whole surface (the
 *   same area as its skim line: the skim goes on top and is already counted there);
 * - patches back to the undercoat or to masonry -> 'fill-patches' (their own area), unless the
 *   whole surface is already undercoated;
 * - gaps round frames that are scrimmed -> 'scrim' (their length).
 */
function surfaceLines(s: TakeoffSurface, roomName: string, o: TakeoffOptions): TakeoffLine[] {
  wholeNonNegative(s.lengthMm, 'lengthMm')
  wholeNonNegative(s.secondMm, 'secondMm')
  const lines: TakeoffLine[] = []
  const base = { roomName, surfaceId: s.id }
  const name = surfaceName(s)
  let plasteredCm2: number

  if (s.kind === 'reveal' || s.kind === 'strip') {
    const wide = s.kind === 'reveal' ? 'deep' : 'wide'
    if (s.secondMm <= o.narrowMaxMm) {
      plasteredCm2 = mm2ToCm2(s.lengthMm * s.secondMm)
      lines.push({
        ...base, key: 'reveals-lm', unit: 'lm', quantity: s.lengthMm, areaCm2: plasteredCm2,
        derivation: `${name} ${formatMetres(s.lengthMm)} m long, ${formatMetres(s.secondMm)} m ${wide} (not over ${formatMetres(o.narrowMaxMm)} m): ${formatMetres(s.lengthMm)} m`,
      })
    }
    else {
      const a = surfaceArea(s, o.minDeductCm2)
      plasteredCm2 = a.netCm2
      lines.push({ ...base, key: 'reveals-area', unit: 'm2', quantity: a.netCm2, derivation: `${a.text} (over ${formatMetres(o.narrowMaxMm)} m ${wide}, so by area)` })
    }
  }
  else {
    const a = surfaceArea(s, o.minDeductCm2)
    plasteredCm2 = a.netCm2
    lines.push({ ...base, key: s.kind === 'ceiling' ? 'skim-ceilings' : 'skim-walls', unit: 'm2', quantity: a.netCm2, derivation: a.text })
  }

  const whole = s.background !== undefined && WHOLE_UNDERCOAT.includes(s.background)
  if (whole) {
    const back = s.background === 'masonry' ? 'back to masonry' : 'back to the undercoat'
    lines.push({ ...base, key: 'undercoat', unit: 'm2', quantity: plasteredCm2, derivation: `${name} ${back}: undercoat over the whole surface, ${formatSquareMetres(plasteredCm2)} m² (then skimmed)` })
  }
  for (const c of s.conditions ?? []) {
    if ((c.kind === 'patch-undercoat' || c.kind === 'patch-masonry') && c.areaCm2) {
      wholeNonNegative(c.areaCm2, 'condition areaCm2')
      if (whole) continue
      const back = c.kind === 'patch-masonry' ? 'back to masonry' : 'back to the undercoat'
      lines.push({ ...base, key: 'fill-patches', unit: 'm2', quantity: c.areaCm2, derivation: `${name}: patch ${back}, filled with undercoat, ${formatSquareMetres(c.areaCm2)} m²` })
    }
    else if (c.kind === 'frame-gap' && c.scrimmed && c.lengthMm) {
      wholeNonNegative(c.lengthMm, 'condition lengthMm')
      lines.push({ ...base, key: 'scrim', unit: 'lm', quantity: c.lengthMm, derivation: `${name}: gap round a frame, scrimmed, ${formatMetres(c.lengthMm)} m` })
    }
  }
  return lines
}

interface BeadedCorner { line: TakeoffLine, count: number, stockMm: number }

/**
 * The lines of the room's corners, corner by corner in the order measured:
 * - an external corner that needs a bead -> 'beads' (linear metres), with the lengths it takes
 *   (kept in `beaded` for the bead order);
 * - a beaded corner whose bead is packed out -> 'packed-bead' (linear metres of bead packed: labour
 *   on top of fitting it);
 * - an internal corner whose return is narrower than the firm's corner trowel -> 'narrow-return'
 *   (linear metres of corner, made good by hand: the trowel does not fit).
 */
function cornerLines(room: TakeoffRoom, o: TakeoffOptions): { lines: TakeoffLine[], beaded: BeadedCorner[] } {
  const names = new Map(room.surfaces.map(s => [s.id, surfaceName(s)]))
  const lines: TakeoffLine[] = []
  const beaded: BeadedCorner[] = []
  for (const c of room.corners ?? []) {
    wholeNonNegative(c.lengthMm, 'corner lengthMm')
    const a = c.surfaceAId ? names.get(c.surfaceAId) : undefined
    const b = c.surfaceBId ? names.get(c.surfaceBId) : undefined
    const base = { roomName: room.name, cornerId: c.id, unit: 'lm' as const, quantity: c.lengthMm }
    const length = `${formatMetres(c.lengthMm)} m`
    if (c.kind === 'external' && c.needsBead) {
      const { count, stockMm } = beadLengthsFor(c.lengthMm, o.beadStockLengthsMm)
      const line: TakeoffLine = {
        ...base, key: 'beads',
        derivation: `${length} corner${a && b ? ` (${a} / ${b})` : ''}: ${count} x ${formatStockLength(stockMm)} m length${count === 1 ? '' : 's'}`,
      }
      lines.push(line)
      beaded.push({ line, count, stockMm })
    }
    if (c.needsBead && c.packedOut) {
      lines.push({ ...base, key: 'packed-bead', derivation: `Bead packed out along the ${length} corner${a && b ? ` between ${a} and ${b}` : ''}: ${length}` })
    }
    const width = c.returnWidthMm
    if (c.kind === 'internal' && width !== null && width !== undefined && width < o.cornerTrowelMm) {
      wholeNonNegative(width, 'corner returnWidthMm')
      lines.push({
        ...base, key: 'narrow-return',
        derivation: `Return ${width} mm wide${a && b ? ` (${a} / ${b})` : ''}, narrower than the ${o.cornerTrowelMm} mm corner trowel: made good by hand along ${length}`,
      })
    }
  }
  return { lines, beaded }
}

/**
 * The bead order: for each stock length, the lengths the corners take, plus the waste percentage,
 * rounded up to whole lengths ('bead-lengths', one line per stock length used).
 */
function beadOrder(corners: BeadedCorner[], roomName: string, o: TakeoffOptions): TakeoffLine[] {
  const byStock = new Map<number, number>()
  for (const c of corners) byStock.set(c.stockMm, (byStock.get(c.stockMm) ?? 0) + c.count)
  return [...byStock.entries()].sort((x, y) => x[0] - y[0]).map(([stockMm, count]) => {
    const total = withWasteRoundedUp(count, o.beadWastePercent)
    const exact = hundredthsText(count * (100 + o.beadWastePercent))
    return {
      key: 'bead-lengths' as const, roomName, unit: 'lengths' as const, quantity: total, stockLengthMm: stockMm,
      derivation: `${formatStockLength(stockMm)} m bead: ${count} length${count === 1 ? '' : 's'} + ${o.beadWastePercent}% waste = ${exact}, rounded up to ${total} length${total === 1 ? '' : 's'}`,
    }
  })
}

function resolve(options: Partial<TakeoffOptions>): TakeoffOptions {
  const o = { ...DEFAULT_TAKEOFF_OPTIONS, ...options }
  checkOptions(o)
  return o
}

/**
 * The take-off of one room: its surface lines (see above), then its corner lines (beads, packed-out
 * beads, narrow returns), then the room's bead order ('bead-lengths', waste added once for the room).
 * Rules of thumb to check against the job, not a survey.
 */
export function takeoffRoom(room: TakeoffRoom, options: Partial<TakeoffOptions> = {}): TakeoffLine[] {
  const o = resolve(options)
  const corners = cornerLines(room, o)
  return [
    ...room.surfaces.flatMap(s => surfaceLines(s, room.name, o)),
    ...corners.lines,
    ...beadOrder(corners.beaded, room.name, o),
  ]
}

/**
 * The take-off of a job: every room's surface and corner lines, then one bead order for the whole
 * job (roomName 'All rooms'), so the waste is added once and not rounded up room by room.
 */
export function takeoffRooms(rooms: TakeoffRoom[], options: Partial<TakeoffOptions> = {}): TakeoffLine[] {
  const o = resolve(options)
  const lines: TakeoffLine[] = []
  const corners: BeadedCorner[] = []
  for (const room of rooms) {
    lines.push(...room.surfaces.flatMap(s => surfaceLines(s, room.name, o)))
    const cs = cornerLines(room, o)
    lines.push(...cs.lines)
    corners.push(...cs.beaded)
  }
  return [...lines, ...beadOrder(corners, 'All rooms', o)]
}

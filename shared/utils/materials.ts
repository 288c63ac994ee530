// Materials from a take-off: bags of plaster, lengths of bead, rolls of scrim, and their cost.
// Coverage figures are rules of thumb (../shared/DOMAIN.md, "Coverage", common practice): real
// coverage depends on the background's suction and flatness, so the estimate is a starting point
// for ordering, not a guarantee. Check the maker's data sheet for the product actually used.
// Arithmetic is exact: decimals are read from their digits into BigInt, and packs are rounded up
// only once, at the end, so 100 m² at 10 m² a pack with 10% waste is 11 packs, not 12.
import type { TakeoffLine } from './takeoff'
import { formatStockLength } from './takeoff'
import { formatMetres, formatSquareMetres } from './measure'

/** A decimal number (at most `places` decimals, 0 or more) as an integer scaled by 10^places. */
function scaled(x: number, places: number, what: string): bigint {
  if (!Number.isFinite(x) || x < 0) throw new RangeError(`${what} must be a number of 0 or more, got ${x}`)
  // String() gives the shortest decimal that reads back as x: 12.345 -> '12.345', 0.1 -> '0.1'
  const m = /^(\d+)(?:\.(\d+))?$/.exec(String(x))
  if (!m || (m[2] ?? '').length > places) throw new RangeError(`${what} may have at most ${places} decimals, got ${x}`)
  return BigInt(m[1]!) * 10n ** BigInt(places) + BigInt((m[2] ?? '').padEnd(places, '0') || '0')
}

const ceilDiv = (a: bigint, b: bigint): bigint => (a + b - 1n) / b

/** a / b (both > 0 or a = 0) as a decimal with `places` decimals, half up, for the derivations. */
function ratioText(a: bigint, b: bigint, places = 2): string {
  const unit = 10n ** BigInt(places)
  const r = (a * unit * 2n + b) / (b * 2n)
  const whole = r / unit
  const frac = (r % unit).toString().padStart(places, '0')
  return `${whole}.${frac}`
}

interface PackSum { area: bigint, coverage: bigint /* m² x 10^4 (cm²) */, thickness: bigint, at: bigint, waste: bigint /* x 10^3 */ }

/** Exact numerator and denominator of area x thickness / at / coverage x (1 + waste / 100). */
function packRatio(p: PackSum): { num: bigint, den: bigint } {
  // scales: area 10^4, thickness 10^3, (100 + waste) 10^3 on top; coverage 10^4, at 10^3, 100 x 10^3 below
  const num = p.area * p.thickness * (100_000n + p.waste)
  const den = p.coverage * p.at * 100_000n
  return { num, den }
}

/**
 * Whole packs that cover `areaM2` at `thicknessMm`, for a pack covering `coverageM2PerPack` at
 * `atThicknessMm`, plus `wastePercent` (default 0), rounded up:
 * ceil(areaM2 x thicknessMm / atThicknessMm / coverageM2PerPack x (1 + wastePercent / 100)).
 * Exact at the boundaries. areaM2 and coverageM2PerPack have at most 4 decimals (whole cm²), the
 * thicknesses and wastePercent at most 3; anything else, or a negative figure, is a RangeError.
 * Coverage is a rule of thumb: see the file's note.
 */
export function packsNeeded(o: { areaM2: number, thicknessMm: number, coverageM2PerPack: number, atThicknessMm: number, wastePercent?: number }): number {
  const p: PackSum = {
    area: scaled(o.areaM2, 4, 'areaM2'),
    thickness: scaled(o.thicknessMm, 3, 'thicknessMm'),
    at: scaled(o.atThicknessMm, 3, 'atThicknessMm'),
    coverage: scaled(o.coverageM2PerPack, 4, 'coverageM2PerPack'),
    waste: scaled(o.wastePercent ?? 0, 3, 'wastePercent'),
  }
  if (p.at === 0n) throw new RangeError('atThicknessMm must be more than 0')
  if (p.coverage === 0n) throw new RangeError('coverageM2PerPack must be more than 0')
  const { num, den } = packRatio(p)
  return Number(ceilDiv(num, den))
}

// ---------------------------------------------------------------------------------------------
// The catalogue

export type MaterialType = 'finish' | 'bonding-undercoat' | 'browning' | 'bead' | 'scrim' | 'bonding-agent' | 'other'
export type Coverage = { kind: 'area', m2PerPack: number, atThicknessMm: number } | { kind: 'length', metresPerPack: number }

export interface Material {
  key: string
  type: MaterialType
  name: string
  packLabel: string
  coverage: Coverage
  /** Price of one pack in pence. In DEFAULT_MATERIALS these are invented demo prices. */
  costPence: number
  /** Where the coverage figure comes from. */
  source: string
}

/** Said of every starting price (they are invented): the firm enters its supplier's. */
export const STARTING_PRICE = 'The price is a starting figure: set your own from your supplier.'
const DEMO = STARTING_PRICE

/**
 * Generic starting catalogue (no brands). Coverage from ../shared/DOMAIN.md; prices are invented
 * demo prices, to be replaced by the firm's own.
 */
export const DEFAULT_MATERIALS: readonly Material[] = [
  {
    key: 'finish-plaster', type: 'finish', name: 'Gypsum finish plaster', packLabel: '25 kg bag',
    coverage: { kind: 'area', m2PerPack: 10, atThicknessMm: 2 }, costPence: 1200,
    source: `Common practice (generic guides): a 25 kg bag covers about 10 to 12 m² at 2 mm; the low end, 10 m², is used. ${DEMO}`,
  },
  {
    key: 'bonding-undercoat', type: 'bonding-undercoat', name: 'Gypsum bonding undercoat', packLabel: '25 kg bag',
    coverage: { kind: 'area', m2PerPack: 3, atThicknessMm: 10 }, costPence: 1500,
    source: `Common practice (generic guides): a 25 kg bag covers about 2.5 to 3.5 m² at 8 to 11 mm; 3 m² at 10 mm is used. ${DEMO}`,
  },
  {
    key: 'angle-bead-2500', type: 'bead', name: 'Angle bead, 2.5 m', packLabel: '2.5 m length',
    coverage: { kind: 'length', metresPerPack: 2.5 }, costPence: 250,
    source: `Supplier listings: beads come in 2.5 m and 3.0 m lengths. ${DEMO}`,
  },
  {
    key: 'angle-bead-3000', type: 'bead', name: 'Angle bead, 3.0 m', packLabel: '3.0 m length',
    coverage: { kind: 'length', metresPerPack: 3 }, costPence: 300,
    source: `Supplier listings: beads come in 2.5 m and 3.0 m lengths. ${DEMO}`,
  },
  {
    key: 'scrim-tape', type: 'scrim', name: 'Scrim tape', packLabel: '90 m roll',
    coverage: { kind: 'length', metresPerPack: 90 }, costPence: 400,
    source: `A roll of scrim tape is usually about 90 m: check the rolls you buy. ${DEMO}`,
  },
]

/** The columns of a catalogue row for one of the generic defaults. */
export function defaultMaterialRow(m: Material) {
  return {
    key: m.key, type: m.type, name: m.name, packLabel: m.packLabel, costPence: m.costPence, source: m.source,
    ...(m.coverage.kind === 'area'
      ? { coverageCm2PerPack: Math.round(m.coverage.m2PerPack * 10_000), atThicknessMm: m.coverage.atThicknessMm, coverageMmPerPack: null }
      : { coverageCm2PerPack: null, atThicknessMm: null, coverageMmPerPack: Math.round(m.coverage.metresPerPack * 1000) }),
  }
}

/** The waste allowance commonly added to materials (DOMAIN.md: 10% is common). */
export const DEFAULT_WASTE_PERCENT = 10

export interface EstimateOptions {
  /** Finish (skim) thickness: 2 to 3 mm (common practice). */
  finishThicknessMm: number
  /** Gypsum undercoat thickness: about 11 mm (common practice). */
  undercoatThicknessMm: number
  /** Added to plaster and scrim; bead lengths carry their own waste from the take-off. */
  wastePercent: number
}

export const DEFAULT_ESTIMATE_OPTIONS: EstimateOptions = { finishThicknessMm: 2, undercoatThicknessMm: 11, wastePercent: DEFAULT_WASTE_PERCENT }

export interface MaterialLine {
  /** The catalogue key; null when the catalogue has nothing of the kind needed (then packs and cost are 0). */
  materialKey: string | null
  name: string
  packs: number
  packLabel: string
  costPence: number
  derivation: string
}

function pluralPacks(n: number, label: string): string {
  return `${n} x ${label}`
}

/**
 * Undercoats the estimate takes for an undercoat area, in order of preference: a bonding undercoat,
 * else a browning (or another undercoat the catalogue lists under those types). The plasterer picks
 * the one that suits the background (bonding for low suction, browning for masonry: common practice).
 */
export const UNDERCOAT_TYPES: readonly MaterialType[] = ['bonding-undercoat', 'browning']

/** The catalogue's first area material of the first of `types` it has. */
function firstAreaMaterial(catalogue: readonly Material[], types: readonly MaterialType[]): Material | undefined {
  for (const type of types) {
    const m = catalogue.find(x => x.type === type && x.coverage.kind === 'area')
    if (m) return m
  }
  return undefined
}

/** An exact number of bags, num / den (den > 0). */
export interface ExactBags { num: bigint, den: bigint }

/**
 * The exact bags (not rounded) of an area material over `areaCm2` (whole cm²) at `thicknessMm`,
 * for a pack covering `coverage.m2PerPack` at `coverage.atThicknessMm`, plus `wastePercent`:
 * areaM2 x thicknessMm / atThicknessMm / m2PerPack x (1 + waste / 100). The quote's materials
 * (estimateMaterials, through areaLine) and the set plan's fill and undercoat bags
 * (planInputsFromRooms) are both this one sum; the quote rounds up to whole packs once, the plan
 * rounds each surface up to tenths of a bag. `what` names the material in a RangeError.
 */
export function areaBags(areaCm2: number, thicknessMm: number, coverage: { m2PerPack: number, atThicknessMm: number }, wastePercent: number, what = 'the material'): ExactBags {
  if (!Number.isSafeInteger(areaCm2) || areaCm2 < 0) throw new RangeError(`areaCm2 must be a whole number of cm², 0 or more, got ${areaCm2}`)
  const p: PackSum = {
    area: BigInt(areaCm2),
    thickness: scaled(thicknessMm, 3, 'thickness'),
    at: scaled(coverage.atThicknessMm, 3, 'atThicknessMm'),
    coverage: scaled(coverage.m2PerPack, 4, 'm2PerPack'),
    waste: scaled(wastePercent, 3, 'wastePercent'),
  }
  if (p.at === 0n || p.coverage === 0n) throw new RangeError(`${what}: coverage must be more than 0`)
  return packRatio(p)
}

/** Exact bags rounded up to whole tenths of a bag, as a count of tenths: 0.605 -> 7 (0.7 bag). */
export function tenthsUp(bags: ExactBags): number {
  return Number(ceilDiv(bags.num * 10n, bags.den))
}

/** The undercoat the estimate takes for undercoat areas (UNDERCOAT_TYPES, in that order), or undefined when the catalogue has none. */
export function undercoatMaterial(catalogue: readonly Material[]): Material | undefined {
  return firstAreaMaterial(catalogue, UNDERCOAT_TYPES)
}

/** What the set plan needs from the take-off to count its undercoat bags as the quote does (planInputsFromRooms' `takeoff`). */
export interface UndercoatTakeoff {
  /** The catalogue's undercoat's coverage (undercoatMaterial); null when it has none. */
  coverage: { m2PerPack: number, atThicknessMm: number } | null
  thicknessMm: number
  wastePercent: number
}

/** The undercoat figures of the materials estimate (the same material, thickness and waste as estimateMaterials). */
export function undercoatTakeoff(catalogue: readonly Material[], options: Partial<EstimateOptions> = {}): UndercoatTakeoff {
  const o = { ...DEFAULT_ESTIMATE_OPTIONS, ...options }
  const m = undercoatMaterial(catalogue)
  return {
    coverage: m && m.coverage.kind === 'area' ? { m2PerPack: m.coverage.m2PerPack, atThicknessMm: m.coverage.atThicknessMm } : null,
    thicknessMm: o.undercoatThicknessMm,
    wastePercent: o.wastePercent,
  }
}

function areaLine(what: string, types: readonly MaterialType[], areaCm2: number, thicknessMm: number, catalogue: readonly Material[], wastePercent: number): MaterialLine {
  const m = firstAreaMaterial(catalogue, types)
  if (!m || m.coverage.kind !== 'area') {
    return { materialKey: null, name: what, packs: 0, packLabel: '', costPence: 0, derivation: `${formatSquareMetres(areaCm2)} m² needs ${what.toLowerCase()}, but the catalogue has none: add one to estimate it.` }
  }
  const { num, den } = areaBags(areaCm2, thicknessMm, m.coverage, wastePercent, m.name)
  const packs = Number(ceilDiv(num, den))
  return {
    materialKey: m.key, name: m.name, packs, packLabel: m.packLabel, costPence: packs * m.costPence,
    derivation: `${formatSquareMetres(areaCm2)} m² at ${thicknessMm} mm, ${m.coverage.m2PerPack} m² a pack at ${m.coverage.atThicknessMm} mm, + ${wastePercent}% waste = ${ratioText(num, den)}, rounded up to ${pluralPacks(packs, m.packLabel)}`,
  }
}

/**
 * Materials for a take-off, each rounded up to whole packs, cost = packs x the catalogue price:
 * - skim areas ('skim-walls', 'skim-ceilings', 'reveals-area', and the face area of 'reveals-lm')
 *   -> the first 'finish' material, at `finishThicknessMm`, plus waste;
 * - undercoat areas ('undercoat', 'fill-patches') -> the first 'bonding-undercoat', or failing
 *   that the first 'browning' (UNDERCOAT_TYPES), at `undercoatThicknessMm`, plus waste (the skim
 *   on top is already in the skim area);
 * - 'bead-lengths' -> the 'bead' material of that stock length, as many as the take-off says
 *   (it has added the waste already; its working is carried into the line's derivation);
 * - 'scrim' -> rolls of the first 'scrim' material, plus waste.
 * A kind of material the catalogue lacks gives a line with materialKey null that says so.
 * Rules of thumb for ordering, not a guarantee of what the job will use.
 */
export function estimateMaterials(lines: readonly TakeoffLine[], catalogue: readonly Material[], options: Partial<EstimateOptions> = {}): MaterialLine[] {
  const o = { ...DEFAULT_ESTIMATE_OPTIONS, ...options }
  let skimCm2 = 0
  let undercoatCm2 = 0
  let scrimMm = 0
  const beads = new Map<number, number>()
  const beadWorking = new Map<number, string[]>()
  for (const l of lines) {
    if (l.key === 'skim-walls' || l.key === 'skim-ceilings' || l.key === 'reveals-area') skimCm2 += l.quantity
    else if (l.key === 'reveals-lm') skimCm2 += l.areaCm2 ?? 0
    else if (l.key === 'undercoat' || l.key === 'fill-patches') undercoatCm2 += l.quantity
    else if (l.key === 'scrim') scrimMm += l.quantity
    else if (l.key === 'bead-lengths' && l.stockLengthMm) {
      beads.set(l.stockLengthMm, (beads.get(l.stockLengthMm) ?? 0) + l.quantity)
      if (l.derivation) beadWorking.set(l.stockLengthMm, [...(beadWorking.get(l.stockLengthMm) ?? []), l.derivation])
    }
  }
  const out: MaterialLine[] = []
  if (skimCm2 > 0) out.push(areaLine('Finish plaster', ['finish'], skimCm2, o.finishThicknessMm, catalogue, o.wastePercent))
  if (undercoatCm2 > 0) out.push(areaLine('Undercoat', UNDERCOAT_TYPES, undercoatCm2, o.undercoatThicknessMm, catalogue, o.wastePercent))
  for (const [stockMm, count] of [...beads.entries()].sort((a, b) => a[0] - b[0])) {
    const m = catalogue.find(x => x.type === 'bead' && x.coverage.kind === 'length' && scaled(x.coverage.metresPerPack, 3, 'metresPerPack') === BigInt(stockMm))
    if (!m) {
      out.push({ materialKey: null, name: `Bead, ${formatStockLength(stockMm)} m`, packs: 0, packLabel: '', costPence: 0, derivation: `${count} bead lengths of ${formatStockLength(stockMm)} m needed, but the catalogue has no bead of that length: add one to estimate it.` })
      continue
    }
    // the take-off's working ("2.5 m bead: 2 lengths + 10% waste = 2.2, rounded up to 3 lengths"), so it can be checked by hand
    const working = beadWorking.get(stockMm)?.join('; ')
    out.push({
      materialKey: m.key, name: m.name, packs: count, packLabel: m.packLabel, costPence: count * m.costPence,
      derivation: working ? `${working}: order ${pluralPacks(count, m.packLabel)}` : `${pluralPacks(count, m.packLabel)} from the take-off (waste included there)`,
    })
  }
  if (scrimMm > 0) {
    const m = catalogue.find(x => x.type === 'scrim' && x.coverage.kind === 'length')
    if (!m || m.coverage.kind !== 'length') {
      out.push({ materialKey: null, name: 'Scrim', packs: 0, packLabel: '', costPence: 0, derivation: `${formatMetres(scrimMm)} m of scrim needed, but the catalogue has none: add one to estimate it.` })
    }
    else {
      const perPackMm = scaled(m.coverage.metresPerPack, 3, 'metresPerPack')
      if (perPackMm === 0n) throw new RangeError(`${m.name}: coverage must be more than 0`)
      const waste = scaled(o.wastePercent, 3, 'wastePercent')
      const num = BigInt(scrimMm) * (100_000n + waste)
      const den = perPackMm * 100_000n
      const packs = Number(ceilDiv(num, den))
      out.push({
        materialKey: m.key, name: m.name, packs, packLabel: m.packLabel, costPence: packs * m.costPence,
        derivation: `${formatMetres(scrimMm)} m, ${m.coverage.metresPerPack} m a pack, + ${o.wastePercent}% waste = ${ratioText(num, den)}, rounded up to ${pluralPacks(packs, m.packLabel)}`,
      })
    }
  }
  return out
}

/** One room's materials estimate. */
export interface RoomMaterials { roomName: string, materials: MaterialLine[] }

/**
 * The materials estimate room by room: `estimateMaterials` of each room's own take-off (from
 * `takeoffRoom`, so each room has its own bead order with its own waste). Each room is rounded up
 * to whole packs on its own, so the rooms add up to at least the whole-quote estimate, usually a
 * little more: order by the whole quote, use the rooms to see where the materials go.
 * Rooms with nothing to estimate are left out.
 */
export function estimateMaterialsByRoom(roomTakeoffs: readonly { roomName: string, lines: readonly TakeoffLine[] }[], catalogue: readonly Material[], options: Partial<EstimateOptions> = {}): RoomMaterials[] {
  return roomTakeoffs
    .map(r => ({ roomName: r.roomName, materials: estimateMaterials(r.lines, catalogue, options) }))
    .filter(r => r.materials.length > 0)
}

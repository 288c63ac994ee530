// The words and the arithmetic of a job: its statuses and moves, the days booked and worked,
// materials used against the estimate, and the "ready to decorate from" date. Pure.
import { JOB_CAUTIONS } from './cautions'
import { addDays } from './dates'
import type { PlanAction } from './plan-actions'

export const JOB_STATUSES = ['booked', 'in-progress', 'finished', 'invoiced', 'paid', 'cancelled'] as const
export type JobStatus = (typeof JOB_STATUSES)[number]
export const JOB_STATUS_LABELS: Record<JobStatus, string> = {
  'booked': 'Booked',
  'in-progress': 'On site',
  'finished': 'Finished',
  'invoiced': 'Invoiced',
  'paid': 'Paid',
  'cancelled': 'Cancelled',
}
/**
 * Where a job may move by hand. Invoiced and paid follow from invoices and payments (the
 * invoicing issue moves them); by hand a job goes booked -> on site -> finished, or is
 * cancelled before it is invoiced, and a finished job can be reopened.
 */
export const JOB_MOVES: Record<JobStatus, readonly JobStatus[]> = {
  'booked': ['in-progress', 'cancelled'],
  'in-progress': ['finished', 'booked', 'cancelled'],
  'finished': ['in-progress', 'invoiced'],
  'invoiced': ['paid'],
  'paid': [],
  'cancelled': ['booked'],
}
/** Moves the invoicing makes, never a person on the job screen. */
export const SYSTEM_ONLY_MOVES: readonly JobStatus[] = ['invoiced', 'paid']

export function canMoveJob(from: JobStatus, to: JobStatus, byHand = true): boolean {
  if (!JOB_MOVES[from].includes(to)) return false
  return !(byHand && SYSTEM_ONLY_MOVES.includes(to))
}

export const LOG_COATS = ['fill', 'tight-coat', 'first', 'second'] as const
export type LogCoat = (typeof LOG_COATS)[number]
export const LOG_COAT_LABELS: Record<LogCoat, string> = {
  'fill': 'Fill',
  'tight-coat': 'Tight coat',
  'first': 'First coat',
  'second': 'Second coat',
}

export const DAY_PORTIONS = ['day', 'half-day'] as const
export type DayPortion = (typeof DAY_PORTIONS)[number]

// ---------------------------------------------------------------------------------------------
// Days worked

/** Days worked per person, in half days (a day is 2, half a day 1), from the booked days marked worked. */
export function daysWorked(days: readonly { userId: string, portion: DayPortion, worked: boolean }[]): Map<string, number> {
  const halves = new Map<string, number>()
  for (const d of days) {
    if (!d.worked) continue
    halves.set(d.userId, (halves.get(d.userId) ?? 0) + (d.portion === 'day' ? 2 : 1))
  }
  return halves
}

/** Half days as words: 3 -> '1.5 days', 2 -> '1 day', 1 -> 'half a day'. */
export function halfDaysWords(halves: number): string {
  if (halves === 1) return 'half a day'
  const days = halves % 2 === 0 ? String(halves / 2) : `${(halves - 1) / 2}.5`
  return `${days} ${halves === 2 ? 'day' : 'days'}`
}

// ---------------------------------------------------------------------------------------------
// Materials used against the estimate

export interface EstimatedMaterial { materialId: string | null, name: string, packs: number, costPence: number }
export interface MaterialUse { materialId: string, name: string, packsX1000: number, costPencePerPack: number }
export interface MaterialComparison {
  materialId: string | null
  name: string
  estimatedPacksX1000: number
  usedPacksX1000: number
  /** used - estimated: positive is more than estimated. */
  differencePacksX1000: number
  estimatedCostPence: number
  usedCostPence: number
  differenceCostPence: number
}

/** Cost of thousandths of a pack at a price per pack, rounded half up to the penny. */
export function packCostPence(packsX1000: number, pencePerPack: number): number {
  return Math.floor((packsX1000 * pencePerPack + 500) / 1000)
}

/**
 * Each material estimated or used, with the difference in packs and in money; estimated ones first.
 * A use matches an estimated material by its id; an estimated material with no id (the catalogue had
 * none of the kind when it was estimated) is matched by name instead, by the first material used
 * under that name.
 */
export function materialsAgainstEstimate(estimate: readonly EstimatedMaterial[], uses: readonly MaterialUse[]): MaterialComparison[] {
  const rows: MaterialComparison[] = []
  const byId = new Map<string, MaterialComparison>()
  /** Estimated rows with no material id, by name, until a use claims them. */
  const byName = new Map<string, MaterialComparison>()
  const newRow = (materialId: string | null, name: string): MaterialComparison => {
    const row = { materialId, name, estimatedPacksX1000: 0, usedPacksX1000: 0, differencePacksX1000: 0, estimatedCostPence: 0, usedCostPence: 0, differenceCostPence: 0 }
    rows.push(row)
    return row
  }
  for (const e of estimate) {
    const known = e.materialId === null ? byName.get(e.name) : byId.get(e.materialId)
    const row = known ?? newRow(e.materialId, e.name)
    if (e.materialId === null) byName.set(e.name, row)
    else byId.set(e.materialId, row)
    row.estimatedPacksX1000 += e.packs * 1000
    row.estimatedCostPence += e.costPence
  }
  for (const u of uses) {
    let row = byId.get(u.materialId)
    if (!row) {
      row = byName.get(u.name)
      if (row) byName.delete(u.name)
      else row = newRow(u.materialId, u.name)
      byId.set(u.materialId, row)
    }
    row.usedPacksX1000 += u.packsX1000
    row.usedCostPence += packCostPence(u.packsX1000, u.costPencePerPack)
  }
  return rows.map(r => ({ ...r, differencePacksX1000: r.usedPacksX1000 - r.estimatedPacksX1000, differenceCostPence: r.usedCostPence - r.estimatedCostPence }))
}

// ---------------------------------------------------------------------------------------------
// Ready to decorate

export interface DryingRules {
  /** Days after the last skim coat. Default 7: common practice (DOMAIN.md, 5 "The job": about a week). */
  skimDays: number
  /** Days after a fill or undercoat when it is the last coat on a surface. Default 14: from memory (DOMAIN.md says only "more for undercoats"). */
  undercoatDays: number
  /** Extra days when the room was cold or damp. Default 7: from memory (DOMAIN.md says only "more for cold or damp rooms"). */
  coldOrDampExtraDays: number
}
/** The firm's figures until it changes them in the price book: skim common practice; undercoat and cold or damp from memory (see DryingRules). */
export const DEFAULT_DRYING: DryingRules = { skimDays: 7, undercoatDays: 14, coldOrDampExtraDays: 7 }

export const READY_CAUTION: string = JOB_CAUTIONS.drying

/**
 * The date a room can be decorated from: the latest of, for each coat logged in it, the day it
 * was done plus the drying days for that kind of coat (skim: skimDays; fill or undercoat:
 * undercoatDays), plus coldOrDampExtraDays where the log says the room was cold or damp.
 * Null when nothing is logged. A rule of thumb: always shown with READY_CAUTION.
 */
export function readyToDecorateFrom(coats: readonly { day: string, coat: LogCoat, coldOrDamp: boolean }[], rules: DryingRules = DEFAULT_DRYING): string | null {
  if (rules === null || typeof rules !== 'object') throw new TypeError('rules must give skimDays, undercoatDays and coldOrDampExtraDays')
  for (const k of ['skimDays', 'undercoatDays', 'coldOrDampExtraDays'] as const) {
    const v: unknown = rules[k]
    if (!Number.isSafeInteger(v) || (v as number) < 0) throw new RangeError(`${k} must be a whole number of days, 0 or more, got ${String(v)}`)
  }
  let latest: string | null = null
  for (const c of coats) {
    const base = c.coat === 'first' || c.coat === 'second' ? rules.skimDays : rules.undercoatDays
    const ready = addDays(c.day, base + (c.coldOrDamp ? rules.coldOrDampExtraDays : 0))
    if (latest === null || ready > latest) latest = ready
  }
  return latest
}

/** A set log as the drying date reads it: the day it was done (londonDay), its coat, the surfaces, the set. */
export interface RoomLog { day: string, coat: LogCoat, coldOrDamp: boolean, surfaceIds: readonly string[], setNumber: number | null }
/** The parts of a set plan the drying date needs: what each set does to each surface. */
export interface PlanTasks { sets: readonly { number: number, tasks: readonly { surfaceId: string, action: PlanAction }[] }[] }
export interface RoomReady {
  /** The day the room can be decorated from; null until every surface in it has its final skim coat logged. */
  from: string | null
  /** Surfaces with their final (second) skim coat logged. */
  skimmed: number
  surfaces: number
}

/**
 * When a room can be decorated: null ("not finished") until every one of its surfaces has a
 * logged second coat of skim, its final coat; then readyToDecorateFrom over every coat logged
 * on its surfaces. A set log carries one coat for all its surfaces, so where the plan has only a
 * fill or a tight coat for a surface in the logged set, that surface's coat is read as the fill
 * or the tight coat (a "second coat" log of set 1 does not finish a wall that set 1 only
 * tight-coats). A rule of thumb: always shown with READY_CAUTION.
 */
export function roomReadyToDecorate(surfaceIds: readonly string[], logs: readonly RoomLog[], plan: PlanTasks, rules: DryingRules = DEFAULT_DRYING): RoomReady {
  const ids = new Set(surfaceIds)
  const skimmed = new Set<string>()
  const coats: { day: string, coat: LogCoat, coldOrDamp: boolean }[] = []
  for (const log of logs) {
    const set = log.setNumber === null ? undefined : plan.sets.find(s => s.number === log.setNumber)
    for (const id of new Set(log.surfaceIds)) {
      if (!ids.has(id)) continue
      const planned = set?.tasks.filter(t => t.surfaceId === id) ?? []
      let coat = log.coat
      if ((coat === 'first' || coat === 'second') && planned.length && !planned.some(t => t.action === 'skim')) {
        coat = planned.some(t => t.action === 'fill' || t.action === 'undercoat') ? 'fill' : 'tight-coat'
      }
      if (coat === 'second') skimmed.add(id)
      coats.push({ day: log.day, coat, coldOrDamp: log.coldOrDamp })
    }
  }
  // the rules and the days are checked even when the room is not finished
  const latest = readyToDecorateFrom(coats, rules)
  const done = ids.size > 0 && skimmed.size === ids.size
  return { from: done ? latest : null, skimmed: skimmed.size, surfaces: ids.size }
}

// ---------------------------------------------------------------------------------------------
// Plan options

/** The least a bag may cover in the plan: 0.1 m² (the plan's own unit, a tenth of a square metre). */
export const MIN_PLAN_COVERAGE_M2 = 0.1
/** Below this many m² a bag, the plan warns: a 25 kg bag of finish covers about 10 to 12 m² at 2 mm (common practice, DOMAIN.md). */
export const LOW_PLAN_COVERAGE_M2 = 2

/**
 * A bag of finish plaster's coverage at the skim thickness the plan uses (2 mm), to a tenth of a
 * square metre, never below MIN_PLAN_COVERAGE_M2: coverage scales inversely with thickness, so
 * 10 m² at 3 mm is 15 m² at 2 mm. Null for a figure that is not a number over 0.
 */
export function skimCoverageM2(m2PerPack: number, atThicknessMm: number): number | null {
  if (!Number.isFinite(m2PerPack) || !Number.isFinite(atThicknessMm) || m2PerPack <= 0 || atThicknessMm <= 0) return null
  return Math.max(MIN_PLAN_COVERAGE_M2, Math.round(m2PerPack * atThicknessMm / 2 * 10) / 10)
}

/** The options a plan may use, and what was wrong with the ones given: coverage below the floor is raised to it; a low one is warned about. */
export function safePlanOptions<T extends { coverageM2PerBag: number }>(options: T): { options: T, warnings: string[] } {
  const warnings: string[] = []
  let coverage = options.coverageM2PerBag
  if (typeof coverage !== 'number' || !Number.isFinite(coverage) || coverage < MIN_PLAN_COVERAGE_M2) {
    warnings.push(`The plan had ${Number.isFinite(coverage) ? `${coverage} m²` : 'no figure'} for what a bag covers, under the least it can plan with, so it is planned at ${MIN_PLAN_COVERAGE_M2} m² a bag. Set the figure under the plan, and check the finish plaster's coverage in Materials.`)
    coverage = MIN_PLAN_COVERAGE_M2
  }
  else if (coverage < LOW_PLAN_COVERAGE_M2) {
    warnings.push(`The plan counts ${coverage} m² a bag, far under the 10 to 12 m² a 25 kg bag of finish plaster usually covers at 2 mm (common practice), so the bags look high. Check the figure under the plan and the finish plaster's coverage in Materials.`)
  }
  return { options: { ...options, coverageM2PerBag: coverage }, warnings }
}

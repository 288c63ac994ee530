// The words and the arithmetic of a job: its statuses and moves, the days booked and worked,
// materials used against the estimate, and the "ready to decorate from" date. Pure.

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
  /** Days after the last skim coat (common practice, DOMAIN.md: about a week). */
  skimDays: number
  /** Days after undercoat when it is the last coat on a surface (from memory: longer than a skim). */
  undercoatDays: number
  /** Extra days when the room was cold or damp. */
  coldOrDampExtraDays: number
}
export const DEFAULT_DRYING: DryingRules = { skimDays: 7, undercoatDays: 14, coldOrDampExtraDays: 7 }

export const READY_CAUTION = 'Drying varies with the weather, heating and ventilation: this date is a rule of thumb, not a promise. Check the plaster has dried to an even pale colour before decorating, and follow the paint maker\'s advice.'

/** An ISO date plus whole days (calendar days, no time zone shifts). Throws for a date that is not a real one or days that are not whole. */
export function addDays(isoDate: string, days: number): string {
  const m = typeof isoDate === 'string' ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate) : null
  if (!m) throw new RangeError(`not an ISO date: ${String(isoDate)}`)
  if (!Number.isSafeInteger(days)) throw new RangeError(`days must be a whole number, got ${String(days)}`)
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])]
  // setUTCFullYear, not Date.UTC, which reads years 0 to 99 as 1900 to 1999
  const date = new Date(0)
  date.setUTCFullYear(y, mo - 1, d)
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== mo - 1 || date.getUTCDate() !== d) throw new RangeError(`not a real date: ${isoDate}`)
  date.setUTCDate(date.getUTCDate() + days)
  const out = Number.isNaN(date.getTime()) ? '' : date.toISOString().slice(0, 10)
  if (!/^\d{4}-\d{2}-\d{2}$/.test(out)) throw new RangeError(`${isoDate} plus ${days} days is outside the years 0000 to 9999`)
  return out
}

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

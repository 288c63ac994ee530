// A day that runs to time: when each set is mixed, laid on, ready for its second coat and
// trowelled up, person by person, for the day sheet and the job page. Pure. day-plan.ts places
// the sets on the booked days with it, so the sets listed for a day and its timeline agree.
//
// The model (a suggestion for the day, not a promise: the plasterer decides on site):
// - The firm's figures (job.timing, from its price book, which it can change): mixMinutes a mix,
//   goOffMinutes for finish plaster to go off after it is laid on (common practice: about 1.5 to
//   2 hours, ../shared/DOMAIN.md "Planning the sets"), and the working day (dayStartMinutes to
//   dayEndMinutes, minutes after midnight). Someone on a half day works the first half of it.
// - Mixing: one bag a mix (BAGS_A_MIX, from memory: a bag to a tub with a paddle), at least one mix
//   however small the set; the mixes are shared among the people on the set, each mix taking
//   mixMinutes, so two people mix three bags in two rounds.
// - Laying on: LAY_ON_MINUTES_A_BAG minutes a bag for each person's share of the bags (from
//   memory), starting as soon as the mixing is done.
// - The second coat goes on when the first has firmed: FIRM_SHARE of goOffMinutes after laying on
//   began (from memory: about 20 to 30 minutes for a usual finish), or as soon as the laying on is
//   done if that is later; it takes SECOND_COAT_MINUTES_A_BAG a bag each (from memory).
// - The set has gone off goOffMinutes after laying on began; trowelling up starts then (or when
//   the second coat is on, if that is later: a set too big for its people) and takes
//   TROWEL_MINUTES_A_BAG a bag each (from memory). The set is done when it is trowelled up.
// - Every stretch of work is rounded up to whole STEP_MINUTES (the times read 08:45, not 08:43).
// - Everyone on the day works each set together (as the day plan shares the bags); a half-day
//   person is on a set only when it is trowelled up within their half, else the whole-day people
//   do it alone. Between the second coat and trowelling up the people are free: a set that does
//   not wait may be mixed and laid on then, when its whole pattern fits around the work already
//   placed (nobody does two things at once). Sets start in plan order.
// - A set waits for an earlier one when its tasks must follow that set's: a fill, tight coat or
//   undercoat before a later coat on the same surface, a packed-out bead's face before its return,
//   the two faces of a difficult corner (read from the plan's sets and corners, `setWaits`). A set
//   that waits is not mixed until the set it waits for has gone off. A set it waits for on an
//   earlier day has gone off overnight. A set that waits for a LATER one (a move by hand broke the
//   order: the plan warns) is placed in plan order all the same.
import type { DayPortion } from './jobs'
import type { PlanCorner } from './set-plan'

/** The firm's figures (the price book; GET /api/jobs/:id `timing`). Minutes; the day's from midnight. */
export interface DayTiming { mixMinutes: number, goOffMinutes: number, dayStartMinutes: number, dayEndMinutes: number }

/** The price book's defaults (migration 0026): what the timeline falls back to when the firm's figures do not make sense. */
export const DEFAULT_TIMING: DayTiming = { mixMinutes: 15, goOffMinutes: 105, dayStartMinutes: 480, dayEndMinutes: 990 }

/** Bags in one mix (from memory: a bag to a tub). */
export const BAGS_A_MIX = 1
/** Minutes to lay on a bag's worth of first coat, for one person (from memory). */
export const LAY_ON_MINUTES_A_BAG = 15
/** How far into going off the first coat has firmed enough for the second (from memory: a quarter). */
export const FIRM_SHARE = 0.25
/** Minutes to lay on a bag's worth of second coat, for one person (from memory). */
export const SECOND_COAT_MINUTES_A_BAG = 10
/** Minutes to trowel up a bag's worth, for one person (from memory). */
export const TROWEL_MINUTES_A_BAG = 10
/** Every stretch of work is rounded up to this. */
export const STEP_MINUTES = 5

/** Beside every timeline, for the firm (never on a customer's page). */
export const TIMELINE_CAUTION = 'How fast plaster goes off depends on the product, the background (its suction) and the weather: follow the plaster maker\'s instructions and what the wall tells you on the day. These times are a guide, not a promise.'

export type WorkPhase = 'mix' | 'lay-on' | 'second-coat' | 'trowel-up'
export const PHASES: readonly WorkPhase[] = ['mix', 'lay-on', 'second-coat', 'trowel-up']
export const PHASE_WORDS: Record<WorkPhase, string> = { 'mix': 'mix', 'lay-on': 'lay on', 'second-coat': 'second coat', 'trowel-up': 'trowel up' }

/** One stretch of one set's work, in minutes after midnight (from inclusive, to exclusive). */
export interface TimelineBlock { set: number, phase: WorkPhase, from: number, to: number, done: boolean }
/** When a set is worked, minutes after midnight. */
export interface SetTimings { mixAt: number, layOnAt: number, secondCoatAt: number, goneOffAt: number, trowelUpAt: number, doneAt: number }

/** A set's pattern of work, as minutes from the start of its mixing. */
export interface SetPattern { blocks: { phase: WorkPhase, from: number, to: number }[], goneOff: number, end: number }

/** A set's pattern for `bags` bags and `people` people on it (the model above). */
export function setPattern(bags: number, people: number, timing: DayTiming): SetPattern {
  const n = Math.max(1, Math.floor(people))
  const tenths = Math.max(0, Math.round(bags * 10))
  const share = tenths / 10 / n
  const up = (m: number) => Math.max(STEP_MINUTES, Math.ceil(Math.round(m * 1000) / 1000 / STEP_MINUTES) * STEP_MINUTES)
  const mixes = Math.max(1, Math.ceil(tenths / (BAGS_A_MIX * 10)))
  const mix = Math.ceil(mixes / n) * Math.max(0, timing.mixMinutes)
  const layOn = up(share * LAY_ON_MINUTES_A_BAG)
  const secondAt = mix + Math.max(layOn, up(FIRM_SHARE * timing.goOffMinutes))
  const secondEnd = secondAt + up(share * SECOND_COAT_MINUTES_A_BAG)
  const goneOff = mix + Math.max(0, timing.goOffMinutes)
  const trowelAt = Math.max(goneOff, secondEnd)
  const end = trowelAt + up(share * TROWEL_MINUTES_A_BAG)
  const blocks = [
    { phase: 'mix' as const, from: 0, to: mix },
    { phase: 'lay-on' as const, from: mix, to: mix + layOn },
    { phase: 'second-coat' as const, from: secondAt, to: secondEnd },
    { phase: 'trowel-up' as const, from: trowelAt, to: end },
  ].filter(b => b.to > b.from)
  return { blocks, goneOff, end }
}

/** A person's working hours on a day: the whole day, or its first half. */
export function hoursOf(portion: DayPortion, timing: DayTiming): { from: number, to: number } {
  const from = timing.dayStartMinutes
  return portion === 'half-day' ? { from, to: from + Math.floor((timing.dayEndMinutes - from) / 2) } : { from, to: timing.dayEndMinutes }
}

/** Minutes after midnight as a 24-hour clock: 510 -> '08:30'. */
export function clockTime(minutes: number): string {
  const m = Math.round(minutes)
  const day = ((m % 1440) + 1440) % 1440
  return `${String(Math.floor(day / 60)).padStart(2, '0')}:${String(day % 60).padStart(2, '0')}`
}

/** Checks the firm's figures; a bad one throws a RangeError naming it. */
export function checkTiming(t: DayTiming): DayTiming {
  if (t === null || typeof t !== 'object') throw new TypeError('timing must give mixMinutes, goOffMinutes, dayStartMinutes and dayEndMinutes')
  for (const k of ['mixMinutes', 'goOffMinutes', 'dayStartMinutes', 'dayEndMinutes'] as const) {
    const v = t[k]
    if (typeof v !== 'number' || !Number.isInteger(v) || v < 0 || v > 1440) throw new RangeError(`timing.${k} must be whole minutes from 0 to 1440, got ${String(v)}`)
  }
  if (t.dayEndMinutes <= t.dayStartMinutes) throw new RangeError(`timing.dayEndMinutes must be after dayStartMinutes, got ${clockTime(t.dayStartMinutes)} to ${clockTime(t.dayEndMinutes)}`)
  return t
}

// ---------------------------------------------------------------------------------------------
// Which set waits for which

/** A set as the planner gives it: enough of it to see what waits for what. */
export interface TimelineSet { number: number, bags: number, tasks: { surfaceId: string, action: string }[] }
/** An earlier set this one waits for, and why in words. */
export interface SetWait { set: number, why: string }

/**
 * For each set, the earlier sets it waits for (they must have gone off before it is mixed): a
 * fill, tight coat or undercoat of a surface before a later coat on the same surface (the parts
 * of one patch fill lie side by side and do not wait for each other), a packed-out bead's face
 * before its return, and the two faces of a difficult corner. `labels` names the surfaces.
 */
export function setWaits(sets: readonly TimelineSet[], corners: readonly PlanCorner[], labels: Record<string, string> = {}): Map<number, SetWait[]> {
  const name = (id: string) => labels[id] ?? id
  const skimIn = new Map<string, number>()
  const tasksOf = new Map<string, { set: number, action: string }[]>()
  for (const s of sets) {
    for (const t of s.tasks) {
      if (t.action === 'skim' && !skimIn.has(t.surfaceId)) skimIn.set(t.surfaceId, s.number)
      tasksOf.set(t.surfaceId, [...(tasksOf.get(t.surfaceId) ?? []), { set: s.number, action: t.action }])
    }
  }
  const out = new Map<number, SetWait[]>(sets.map(s => [s.number, []]))
  const add = (later: number, earlier: number, why: string) => {
    if (earlier >= later) return
    const list = out.get(later)
    if (list && !list.some(w => w.set === earlier)) list.push({ set: earlier, why })
  }
  const ACTION: Record<string, string> = { 'fill': 'patch fill', 'tight-coat': 'tight coat', 'undercoat': 'undercoat' }
  for (const s of sets) {
    for (const t of s.tasks) {
      for (const e of tasksOf.get(t.surfaceId) ?? []) {
        if (e.set >= s.number || e.action === 'skim') continue
        if (e.action === 'fill' && t.action === 'fill') continue
        add(s.number, e.set, `the ${ACTION[e.action] ?? e.action} on ${name(t.surfaceId)} is under a later coat`)
      }
    }
  }
  for (const c of corners) {
    const a = skimIn.get(c.a)
    const b = skimIn.get(c.b)
    if (a === undefined || b === undefined || a === b) continue
    if (c.packedBead) {
      const face = c.packedBead.face
      const ret = face === c.a ? c.b : c.a
      const fs = skimIn.get(face)
      const rs = skimIn.get(ret)
      if (fs !== undefined && rs !== undefined) add(rs, fs, `the packed-out bead's face (${name(face)}) holds the bead for its return`)
    }
    if (c.dryCorner) {
      const [first, then, id] = a < b ? [a, b, c.a] : [b, a, c.b]
      add(then, first, `the difficult corner is worked against ${name(id)} once it has set`)
    }
  }
  for (const list of out.values()) list.sort((x, y) => x.set - y.set)
  return out
}

// ---------------------------------------------------------------------------------------------
// One day's board: who is busy when

export interface DayMember { userId: string, name: string, portion: DayPortion }
export interface PlacedSet { number: number, times: SetTimings, people: DayMember[], done: boolean, overrun: boolean }

/** One booked day being filled: each person's hours and what they are doing when. Used by day-plan.ts. */
export class DayBoard {
  readonly hours: Map<string, { from: number, to: number }>
  readonly busy = new Map<string, TimelineBlock[]>()
  readonly placed: PlacedSet[] = []
  /** The latest mixing start so far: sets start in plan order. */
  private lastStart: number

  constructor(readonly members: readonly DayMember[], readonly timing: DayTiming) {
    this.hours = new Map(members.map(m => [m.userId, hoursOf(m.portion, timing)]))
    for (const m of members) this.busy.set(m.userId, [])
    this.lastStart = timing.dayStartMinutes
  }

  /** The crews to try for a set, in order: everyone, then the whole-day people alone. */
  private crews(): DayMember[][] {
    const all = [...this.members]
    const whole = all.filter(m => m.portion === 'day')
    return whole.length && whole.length < all.length ? [all, whole] : all.length ? [all] : []
  }

  /** The earliest start of `pattern` for `crew` at or after `earliest`, ending by `limit` (null: no limit). */
  private earliestStart(crew: DayMember[], pattern: SetPattern, earliest: number, limit: number | null): number | null {
    const theirs = crew.flatMap(m => this.busy.get(m.userId) ?? [])
    const candidates = new Set<number>([earliest])
    for (const b of theirs) for (const p of pattern.blocks) if (b.to - p.from > earliest) candidates.add(b.to - p.from)
    for (const start of [...candidates].sort((x, y) => x - y)) {
      if (limit !== null && start + pattern.end > limit) return null
      const clash = pattern.blocks.some(p => theirs.some(b => b.from < start + p.to && start + p.from < b.to))
      if (!clash) return start
    }
    return null
  }

  /**
   * Places a set as early as it fits: after the sets before it have started, and after the sets
   * it waits for (`after`: minutes, from their going off) have gone off. With `limit`, only when
   * it is trowelled up within its crew's hours (else null, nothing placed); without, the whole-day
   * people (or everyone, when nobody has a whole day) do it, however late it runs.
   */
  place(number: number, bags: number, after: number, options: { done: boolean, limit: boolean }): PlacedSet | null {
    const earliest = Math.max(this.lastStart, after, this.timing.dayStartMinutes)
    const crews = this.crews()
    const endOf = (crew: DayMember[]) => Math.min(...crew.map(m => this.hours.get(m.userId)!.to))
    for (const crew of crews) {
      const pattern = setPattern(bags, crew.length, this.timing)
      const start = this.earliestStart(crew, pattern, earliest, endOf(crew))
      if (start !== null) return this.commit(number, crew, pattern, start, options.done, false)
    }
    if (options.limit || !crews.length) return null
    const crew = crews.at(-1)!
    const pattern = setPattern(bags, crew.length, this.timing)
    // with no limit there is always a start: after everyone's last stretch of work
    const start = this.earliestStart(crew, pattern, earliest, null)!
    return this.commit(number, crew, pattern, start, options.done, start + pattern.end > endOf(crew))
  }

  private commit(number: number, crew: DayMember[], pattern: SetPattern, start: number, done: boolean, overrun: boolean): PlacedSet {
    const at = (p: WorkPhase) => start + (pattern.blocks.find(b => b.phase === p)?.from ?? (p === 'mix' ? 0 : pattern.end))
    const times: SetTimings = {
      mixAt: start,
      layOnAt: at('lay-on'),
      secondCoatAt: at('second-coat'),
      goneOffAt: start + pattern.goneOff,
      trowelUpAt: at('trowel-up'),
      doneAt: start + pattern.end,
    }
    for (const m of crew) {
      const list = this.busy.get(m.userId)!
      for (const p of pattern.blocks) list.push({ set: number, phase: p.phase, from: start + p.from, to: start + p.to, done })
      list.sort((x, y) => x.from - y.from)
    }
    this.lastStart = Math.max(this.lastStart, start)
    const placed = { number, times, people: crew, done, overrun }
    this.placed.push(placed)
    return placed
  }
}

// ---------------------------------------------------------------------------------------------
// In words

/** A person's day in words, one line a stretch: '08:00 mix set 1', ..., '11:00 set 1 trowelled up'. */
export function personSteps(blocks: readonly TimelineBlock[]): string[] {
  const lines: { at: number, order: number, text: string }[] = []
  const ends = new Map<number, number>()
  for (const b of blocks) {
    lines.push({ at: b.from, order: 1, text: `${clockTime(b.from)} ${PHASE_WORDS[b.phase]} set ${b.set}` })
    ends.set(b.set, Math.max(ends.get(b.set) ?? 0, b.to))
  }
  for (const [set, at] of ends) lines.push({ at, order: 0, text: `${clockTime(at)} set ${set} trowelled up` })
  return lines.sort((x, y) => x.at - y.at || x.order - y.order).map(l => l.text)
}

/** One set's times in words, in order: '08:00 mix', '08:45 lay on', ..., '11:00 trowelled up'. */
export function setSteps(t: SetTimings): string[] {
  const steps: [number, string][] = [
    ...(t.mixAt < t.layOnAt ? [[t.mixAt, 'mix'] as [number, string]] : []),
    [t.layOnAt, 'lay on'],
    [t.secondCoatAt, 'second coat'],
    [t.trowelUpAt, 'trowel up'],
    [t.doneAt, 'trowelled up'],
  ]
  return steps.map(([at, words]) => `${clockTime(at)} ${words}`)
}

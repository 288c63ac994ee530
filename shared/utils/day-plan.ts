// The plan for each booked day: who is on it and which sets fall on it, for the day sheet. Pure.
//
// The sets go onto the booked days in plan order (a set is never split and never jumps ahead of
// an earlier one), from today on; sets already logged stay on the day they were logged. A day
// takes at most SETS_A_DAY sets when someone works the whole day, SETS_A_HALF_DAY when everyone
// is on a half day; a half-day person works the first SETS_A_HALF_DAY sets of the day (the
// morning). Everyone on a set lays on together, so each takes an even share of its bags; a set
// bigger than its people can lay on and trowel (people x bagsPerPersonPerSet) is still placed,
// in order, with a warning. Sets left over when the booked days run out are listed as not placed.
//
// Figures (a planning rule of thumb of our own, from memory): a set of finish plaster goes off in
// about 1.5 to 2 hours (common practice, DOMAIN.md), so with mixing and cleaning down about three
// sets fit in a working day and one in a half day. The plasterer decides on the day.
import { dayAndMonth } from './dates'
import type { DayPortion } from './jobs'

/** Sets in a full working day (from memory: three sets of 1.5 to 2 hours with mixing and cleaning down). */
export const SETS_A_DAY = 3
/** Sets in a half day (from memory). */
export const SETS_A_HALF_DAY = 1

export interface BookedDay { day: string, userId: string, name: string, portion: DayPortion }
export interface DaySet { number: number, bags: number }
export interface LoggedSet { setNumber: number, day: string }

export interface DayPerson { userId: string, name: string, portion: DayPortion, sets: number[], bags: number }
export interface DaySetPlan { number: number, bags: number, done: boolean, people: string[], bagsEach: number }
export interface PlanDay { day: string, people: DayPerson[], sets: DaySetPlan[] }
export interface DayPlan { days: PlanDay[], unplaced: number[], warnings: string[] }

const ISO = /^\d{4}-\d{2}-\d{2}$/
const showDay = (d: string) => dayAndMonth(d)
const tenths = (bags: number) => Math.round(bags * 10)
const people = (n: number) => (n === 1 ? '1 person' : `${n} people`)

function list(items: string[]): string {
  return items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`
}

/**
 * Spreads the sets over the booked days. `today` (YYYY-MM-DD) is the first day new sets may go
 * on; `logged` pins sets already done to the day they were done. Throws a RangeError for a day
 * that is not a date or a bagsPerPersonPerSet that is not over 0.
 */
export function planDays(booked: readonly BookedDay[], sets: readonly DaySet[], options: { bagsPerPersonPerSet: number }, logged: readonly LoggedSet[], today: string): DayPlan {
  if (!ISO.test(today)) throw new RangeError(`today must be a date like 2026-12-07, got ${String(today)}`)
  const each = options?.bagsPerPersonPerSet
  if (typeof each !== 'number' || !Number.isFinite(each) || each <= 0) throw new RangeError(`bagsPerPersonPerSet must be a number over 0, got ${String(each)}`)
  const byDay = new Map<string, Map<string, BookedDay>>()
  for (const b of booked) {
    if (!ISO.test(b.day)) throw new RangeError(`a booked day must be a date like 2026-12-07, got ${String(b.day)}`)
    const who = byDay.get(b.day) ?? new Map<string, BookedDay>()
    const seen = who.get(b.userId)
    // the same person twice on a day: a whole day wins over a half
    if (!seen || (seen.portion === 'half-day' && b.portion === 'day')) who.set(b.userId, b)
    byDay.set(b.day, who)
  }
  const ordered = [...sets].sort((x, y) => x.number - y.number)
  const doneOn = new Map<number, string>()
  for (const l of logged) if (!doneOn.has(l.setNumber) || l.day < doneOn.get(l.setNumber)!) doneOn.set(l.setNumber, l.day)
  const waiting = ordered.filter(s => !doneOn.has(s.number))
  const warnings: string[] = []
  const days: PlanDay[] = []

  for (const day of [...byDay.keys()].sort()) {
    const crew = [...byDay.get(day)!.values()].sort((x, y) => x.name.localeCompare(y.name, 'en-GB') || x.userId.localeCompare(y.userId))
    const fullDay = crew.some(p => p.portion === 'day')
    const room = fullDay ? SETS_A_DAY : SETS_A_HALF_DAY
    const done = ordered.filter(s => doneOn.get(s.number) === day)
    const onDay: { set: DaySet, done: boolean }[] = done.map(set => ({ set, done: true }))
    if (day >= today) {
      while (waiting.length && onDay.length < room) onDay.push({ set: waiting.shift()!, done: false })
    }
    const plan: PlanDay = { day, people: crew.map(p => ({ userId: p.userId, name: p.name, portion: p.portion, sets: [], bags: 0 })), sets: [] }
    const share = new Map<string, number>()
    onDay.forEach(({ set, done }, i) => {
      const on = crew.filter(p => p.portion === 'day' || i < SETS_A_HALF_DAY || !fullDay)
      const n = Math.max(1, on.length)
      const bagsEach = Math.round(tenths(set.bags) / n) / 10
      plan.sets.push({ number: set.number, bags: set.bags, done, people: on.map(p => p.name), bagsEach })
      for (const p of on) {
        plan.people.find(x => x.userId === p.userId)!.sets.push(set.number)
        share.set(p.userId, (share.get(p.userId) ?? 0) + tenths(bagsEach))
      }
      const limit = tenths(n * each)
      if (!done && tenths(set.bags) > limit) {
        warnings.push(`Set ${set.number} (${set.bags} bags) is more than the ${people(on.length)} on it on ${showDay(day)} can lay on and trowel in one set (${limit / 10} bags): bring more hands or split it.`)
      }
    })
    for (const p of plan.people) p.bags = (share.get(p.userId) ?? 0) / 10
    days.push(plan)
  }
  const unplaced = waiting.map(s => s.number)
  if (unplaced.length) {
    const names = unplaced.map(n => `set ${n}`)
    warnings.push(`${list(names).replace(/^s/, 'S')} ${unplaced.length === 1 ? 'is' : 'are'} not on a booked day from ${showDay(today)} on: book more days.`)
  }
  return { days, unplaced, warnings }
}

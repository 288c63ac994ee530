// The plan for each booked day: who is on it, which sets fall on it and when each is worked, for
// the day sheet and the job page. Pure.
//
// The sets go onto the booked days in plan order (a set is never split and never jumps ahead of
// an earlier one), from today on, as many as fit the day's hours by the timeline's model
// (./set-timeline.ts: mixing, laying on, the second coat, going off and trowelling up, from the
// firm's figures, with a set that waits for an earlier one not mixed until that one has gone off).
// A set that will not be trowelled up within the day's hours moves to the next booked day, with a
// note on the day it left in plain words; sets left over when the booked days run out are listed
// as not placed, with a warning. A set too big to fit any of the booked days on its own (too many
// bags for the people booked) is put on the first day with no other new set and flagged as running
// past the end of the day, with a warning, rather than holding up every set after it.
//
// Sets already logged stay on the day they were logged (they take their time in that day's
// timeline, first). Everyone on a set lays on together, so each takes an even share of its bags;
// a half-day person works the first half of the day and is on a set only when it is trowelled up
// by then. A set bigger than its people can lay on and trowel (people x bagsPerPersonPerSet) is
// still placed, in order, with a warning.
import { dayAndMonth } from './dates'
import type { DayPortion } from './jobs'
import { checkTiming, clockTime, DayBoard, hoursOf, type TimelineBlock, type DayMember, type DayTiming, type PlacedSet, type SetTimings, type SetWait } from './set-timeline'

export interface BookedDay { day: string, userId: string, name: string, portion: DayPortion }
/** A set of the plan; `waits`: the earlier sets it waits for (set-timeline.ts `setWaits`). */
export interface DaySet { number: number, bags: number, waits?: readonly SetWait[] }
export interface LoggedSet { setNumber: number, day: string }

export interface DayPerson { userId: string, name: string, portion: DayPortion, sets: number[], bags: number }
export interface DaySetPlan { number: number, bags: number, done: boolean, people: string[], bagsEach: number, times: SetTimings, waits: SetWait[], overrun: boolean }
/** One person's day: their hours and each stretch of work, in time order. */
export interface PersonLine { userId: string, name: string, portion: DayPortion, from: number, to: number, blocks: TimelineBlock[] }
export interface PlanDay { day: string, people: DayPerson[], sets: DaySetPlan[], hours: { from: number, to: number }, timeline: PersonLine[], warnings: string[] }
export interface DayPlan { days: PlanDay[], unplaced: number[], warnings: string[] }
export interface DayPlanOptions { bagsPerPersonPerSet: number, timing: DayTiming }

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
 * that is not a date, a bagsPerPersonPerSet that is not over 0, or a timing figure out of range.
 */
export function planDays(booked: readonly BookedDay[], sets: readonly DaySet[], options: DayPlanOptions, logged: readonly LoggedSet[], today: string): DayPlan {
  if (!ISO.test(today)) throw new RangeError(`today must be a date like 2026-12-07, got ${String(today)}`)
  const each = options?.bagsPerPersonPerSet
  if (typeof each !== 'number' || !Number.isFinite(each) || each <= 0) throw new RangeError(`bagsPerPersonPerSet must be a number over 0, got ${String(each)}`)
  const timing = checkTiming(options.timing)
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
  const warnings: string[] = []

  const dayList = [...byDay.keys()].sort()
  const crewOf = (day: string): DayMember[] => [...byDay.get(day)!.values()]
    .sort((x, y) => x.name.localeCompare(y.name, 'en-GB') || x.userId.localeCompare(y.userId))
    .map(p => ({ userId: p.userId, name: p.name, portion: p.portion }))
  const boards = new Map(dayList.map(day => [day, new DayBoard(crewOf(day), timing)]))
  const endOf = (day: string) => Math.max(...crewOf(day).map(m => hoursOf(m.portion, timing).to))
  const dayNotes = new Map<string, string[]>(dayList.map(d => [d, []]))
  /** Where each set went: its day and when it has gone off. */
  const at = new Map<number, { day: string, goneOffAt: number }>()
  const onDay = new Map<string, { set: DaySet, done: boolean, placed: PlacedSet }[]>(dayList.map(d => [d, []]))
  /** Mixing may start once every set it waits for on the same day has gone off. */
  const after = (s: DaySet, day: string) => Math.max(0, ...(s.waits ?? []).map(w => at.get(w.set)).filter(p => p?.day === day).map(p => p!.goneOffAt))
  const put = (s: DaySet, day: string, done: boolean, limit: boolean) => {
    const placed = boards.get(day)!.place(s.number, s.bags, after(s, day), { done, limit })
    if (!placed) return false
    at.set(s.number, { day, goneOffAt: placed.times.goneOffAt })
    onDay.get(day)!.push({ set: s, done, placed })
    return true
  }

  // sets already logged, on the day they were done, first
  for (const day of dayList) for (const s of ordered) if (doneOn.get(s.number) === day) put(s, day, true, false)

  // then the rest, in order, from today, as many as fit each day's hours
  const open = dayList.filter(d => d >= today)
  const waiting = ordered.filter(s => !doneOn.has(s.number))
  let di = 0
  let next = 0
  while (next < waiting.length && di < open.length) {
    const s = waiting[next]!
    const day = open[di]!
    if (put(s, day, false, true)) {
      next++
      continue
    }
    const anyNew = onDay.get(day)!.some(x => !x.done)
    const fitsAlone = open.slice(di).some(d => new DayBoard(crewOf(d), timing).place(s.number, s.bags, 0, { done: false, limit: true }) !== null)
    if (!fitsAlone && !anyNew && put(s, day, false, false)) {
      const runs = onDay.get(day)!.at(-1)!.placed.times.doneAt
      dayNotes.get(day)!.push(`Set ${s.number} (${s.bags} bags) is more than the people booked can mix, lay on and trowel up within a day's hours on any booked day: on ${showDay(day)} it runs to about ${clockTime(runs)}, past ${clockTime(endOf(day))}. Split it or bring more hands.`)
      next++
      di++
      continue
    }
    const then = open[di + 1]
    dayNotes.get(day)!.push(then
      ? `Set ${s.number} will not be trowelled up by ${clockTime(endOf(day))} on ${showDay(day)}, so it moves to ${showDay(then)}.`
      : `Set ${s.number} will not be trowelled up by ${clockTime(endOf(day))} on ${showDay(day)}, the last booked day, so it is not on a booked day.`)
    di++
  }

  const days: PlanDay[] = dayList.map((day) => {
    const crew = crewOf(day)
    const plan: PlanDay = {
      day,
      people: crew.map(p => ({ userId: p.userId, name: p.name, portion: p.portion, sets: [], bags: 0 })),
      sets: [],
      hours: { from: timing.dayStartMinutes, to: endOf(day) },
      timeline: crew.map(p => ({ ...p, ...hoursOf(p.portion, timing), blocks: [...boards.get(day)!.busy.get(p.userId)!] })),
      warnings: dayNotes.get(day)!,
    }
    const share = new Map<string, number>()
    for (const { set, done, placed } of onDay.get(day)!) {
      const on = placed.people
      const n = Math.max(1, on.length)
      const bagsEach = Math.round(tenths(set.bags) / n) / 10
      plan.sets.push({ number: set.number, bags: set.bags, done, people: on.map(p => p.name), bagsEach, times: placed.times, waits: [...(set.waits ?? [])], overrun: placed.overrun })
      for (const p of on) {
        plan.people.find(x => x.userId === p.userId)!.sets.push(set.number)
        share.set(p.userId, (share.get(p.userId) ?? 0) + tenths(bagsEach))
      }
      const limit = tenths(n * each)
      if (!done && tenths(set.bags) > limit) {
        warnings.push(`Set ${set.number} (${set.bags} bags) is more than the ${people(on.length)} on it on ${showDay(day)} can lay on and trowel in one set (${limit / 10} bags): bring more hands or split it.`)
      }
    }
    for (const p of plan.people) p.bags = (share.get(p.userId) ?? 0) / 10
    return plan
  })
  const unplaced = waiting.slice(next).map(s => s.number)
  if (unplaced.length) {
    const names = unplaced.map(n => `set ${n}`)
    warnings.push(`${list(names).replace(/^s/, 'S')} ${unplaced.length === 1 ? 'is' : 'are'} not on a booked day from ${showDay(today)} on: book more days.`)
  }
  return { days, unplaced, warnings }
}

import { describe, expect, it } from 'vitest'
import { planDays, type BookedDay, type DaySet } from '../../shared/utils/day-plan'

// Sources. How many sets fit in a day now comes from the timeline's model (shared/utils/
// set-timeline.ts, tested in set-timeline.test.ts): the firm's figures here are the price book's
// defaults (15 minutes a mix; 105 minutes to go off, common practice "about 1.5 to 2 hours",
// ../shared/DOMAIN.md; a day of 08:00 to 16:30), and the rule-of-thumb minutes a bag are from
// memory. With them one person does a 3-bag set in 3 hours (45 mixing, 45 laying on, the second
// coat, 105 to go off, 30 trowelling up), so two fit a full day and one a half day (08:00 to
// 12:15); 1-bag sets interleave (one laid on while another goes off). Everything else here is our
// product's rule (sets in plan order, never split, logged sets stay on the day they were done,
// each person on a set takes an even share of its bags). People, days and bags are invented.

const kit = (day: string, portion: BookedDay['portion'] = 'day'): BookedDay => ({ day, userId: 'u-kit', name: 'Kit', portion })
const jo = (day: string, portion: BookedDay['portion'] = 'day'): BookedDay => ({ day, userId: 'u-jo', name: 'Jo', portion })
const sets = (...bags: number[]): DaySet[] => bags.map((b, i) => ({ number: i + 1, bags: b }))
const TIMING = { mixMinutes: 15, goOffMinutes: 105, dayStartMinutes: 480, dayEndMinutes: 990 }
const THREE = { bagsPerPersonPerSet: 3, timing: TIMING }

/** Each day as "day: set numbers (done marked with *)". */
const shape = (p: ReturnType<typeof planDays>) => p.days.map(d => `${d.day}: ${d.sets.map(s => `${s.number}${s.done ? '*' : ''}`).join(' ')}`)

describe('planDays', () => {
  // Changed with the timeline (issue 16): days take what fits their hours, not a fixed 3 sets
  // (or 1 a half day). The rows marked "changed" had other expected days before.
  it.each<[string, BookedDay[], DaySet[], { setNumber: number, day: string }[], string[], number[]]>([
    ['no sets: the days, empty', [kit('2026-12-07')], [], [], ['2026-12-07: '], []],
    ['no days: every set unplaced', [], sets(1, 1), [], [], [1, 2]],
    // changed: 3-bag sets take one person 3 hours each, so two a full day (was three)
    ['two full sets a full day, in order', [kit('2026-12-07'), kit('2026-12-09')], sets(3, 3, 3, 3, 3), [], ['2026-12-07: 1 2', '2026-12-09: 3 4'], [5]],
    // changed: 1-bag sets interleave, so five go in one day (was 3 and 2)
    ['small sets interleave', [kit('2026-12-07'), kit('2026-12-09')], sets(1, 1, 1, 1, 1), [], ['2026-12-07: 1 2 3 4 5', '2026-12-09: '], []],
    ['one full set a half day', [kit('2026-12-07', 'half-day'), kit('2026-12-08')], sets(3, 3, 3), [], ['2026-12-07: 1', '2026-12-08: 2 3'], []],
    ['a half day beside a full day is a full day', [kit('2026-12-07'), jo('2026-12-07', 'half-day')], sets(1, 1, 1), [], ['2026-12-07: 1 2 3'], []],
    ['days run out: the rest unplaced', [kit('2026-12-07', 'half-day')], sets(3, 3, 3), [], ['2026-12-07: 1'], [2, 3]],
    // changed: 3-bag sets (two a day); the order of booking does not matter
    ['days come sorted, not as booked', [kit('2026-12-09'), kit('2026-12-07')], sets(3, 3, 3), [], ['2026-12-07: 1 2', '2026-12-09: 3'], []],
    // before today nothing new goes on; a logged set stays on the day it was done
    ['past days keep only what was logged', [kit('2026-12-05'), kit('2026-12-07')], sets(1, 1, 1), [{ setNumber: 1, day: '2026-12-05' }], ['2026-12-05: 1*', '2026-12-07: 2 3'], []],
    // changed: 3-bag sets, so a set logged today leaves room for one more (was 1-bag sets, two more)
    ['a set logged today takes its time today', [kit('2026-12-07'), kit('2026-12-08')], sets(3, 3, 3, 3), [{ setNumber: 1, day: '2026-12-07' }], ['2026-12-07: 1* 2', '2026-12-08: 3 4'], []],
    ['a set logged on a day not booked is done, not shown', [kit('2026-12-07')], sets(1, 1), [{ setNumber: 1, day: '2026-12-01' }], ['2026-12-07: 2'], []],
    ['a past day with nothing logged stays empty', [kit('2026-12-01'), kit('2026-12-07')], sets(1), [], ['2026-12-01: ', '2026-12-07: 1'], []],
  ])('%s', (_what, booked, planned, logged, days, unplaced) => {
    const plan = planDays(booked, planned, THREE, logged, '2026-12-07')
    expect(shape(plan)).toEqual(days)
    expect(plan.unplaced).toEqual(unplaced)
    if (unplaced.length) expect(plan.warnings.join(' ')).toMatch(/book more days/)
  })

  it('a set that moves to the next day says so on the day it left, in words', () => {
    const plan = planDays([kit('2026-12-07'), kit('2026-12-08')], sets(3, 3, 3, 3, 3), THREE, [], '2026-12-07')
    expect(plan.days.map(d => d.warnings)).toEqual([
      ['Set 3 will not be trowelled up by 16:30 on Monday 7 December, so it moves to Tuesday 8 December.'],
      ['Set 5 will not be trowelled up by 16:30 on Tuesday 8 December, the last booked day, so it is not on a booked day.'],
    ])
    expect(plan.unplaced).toEqual([5])
    expect(plan.warnings).toEqual(['Set 5 is not on a booked day from Monday 7 December on: book more days.'])
  })

  it('a half day stops at half the day: 12:15', () => {
    const plan = planDays([kit('2026-12-07', 'half-day'), kit('2026-12-08')], sets(3, 3), THREE, [], '2026-12-07')
    expect(plan.days[0]!.hours).toEqual({ from: 480, to: 735 })
    expect(plan.days[0]!.warnings).toEqual(['Set 2 will not be trowelled up by 12:15 on Monday 7 December, so it moves to Tuesday 8 December.'])
  })

  it('a set that waits is not mixed until the set it waits for has gone off', () => {
    // 1-bag sets: without waiting, set 2 is mixed at 08:55 while set 1 goes off; waiting for set 1
    // (gone off at 10:00), it is mixed once Kit has trowelled set 1 up, at 10:10
    const free = planDays([kit('2026-12-07')], sets(1, 1), THREE, [], '2026-12-07').days[0]!.sets
    const waits = planDays([kit('2026-12-07')], [{ number: 1, bags: 1 }, { number: 2, bags: 1, waits: [{ set: 1, why: 'fill' }] }], THREE, [], '2026-12-07').days[0]!.sets
    expect(free.map(s => s.times.mixAt)).toEqual([480, 535])
    expect(waits[0]!.times.goneOffAt).toBe(600)
    expect(waits.map(s => s.times.mixAt)).toEqual([480, 610])
  })

  it('a set too big for any booked day on its own is placed alone, flagged, not holding up the rest', () => {
    // 12 bags for one person: 3 hours mixing, 3 laying on... well past 16:30 whatever else is on the day
    const plan = planDays([kit('2026-12-07'), kit('2026-12-08')], sets(1, 12, 1), THREE, [], '2026-12-07')
    expect(shape(plan)).toEqual(['2026-12-07: 1', '2026-12-08: 2'])
    expect(plan.unplaced).toEqual([3])
    expect(plan.days[1]!.sets[0]!.overrun).toBe(true)
    expect(plan.days[1]!.warnings.join(' ')).toMatch(/^Set 2 \(12 bags\) is more than the people booked can mix, lay on and trowel up within a day's hours on any booked day: on Tuesday 8 December it runs to about \d\d:\d\d, past 16:30\. Split it or bring more hands\.$/)
    expect(plan.days[0]!.warnings).toEqual(['Set 2 will not be trowelled up by 16:30 on Monday 7 December, so it moves to Tuesday 8 December.'])
  })

  it('each person: the sets they are on and their share of the bags', () => {
    // Kit all day, Jo half a day (the morning: the first set); set 1 of 4 bags shared by two, sets 2 and 3 Kit's alone
    const plan = planDays([kit('2026-12-07'), jo('2026-12-07', 'half-day')], sets(4, 2.5, 1.3), THREE, [], '2026-12-07')
    const day = plan.days[0]!
    expect(day.sets.map(s => [s.number, s.people, s.bagsEach])).toEqual([[1, ['Jo', 'Kit'], 2], [2, ['Kit'], 2.5], [3, ['Kit'], 1.3]])
    expect(day.people.map(p => [p.name, p.portion, p.sets, p.bags])).toEqual([['Jo', 'half-day', [1], 2], ['Kit', 'day', [1, 2, 3], 5.8]])
    expect(plan.warnings).toEqual([])
  })

  it('a set bigger than the people on it can lay on is placed in order, with a warning', () => {
    // two planned people (6 bags a set) but only Kit booked: set 1 of 5 bags is more than 3
    const plan = planDays([kit('2026-12-07')], sets(5, 1), THREE, [], '2026-12-07')
    expect(shape(plan)).toEqual(['2026-12-07: 1 2'])
    expect(plan.warnings).toEqual(['Set 1 (5 bags) is more than the 1 person on it on Monday 7 December can lay on and trowel in one set (3 bags): bring more hands or split it.'])
  })

  it('a person booked twice on a day counts once, the whole day winning', () => {
    const plan = planDays([kit('2026-12-07', 'half-day'), kit('2026-12-07')], sets(1, 1, 1), THREE, [], '2026-12-07')
    expect(plan.days[0]!.people).toHaveLength(1)
    expect(shape(plan)).toEqual(['2026-12-07: 1 2 3'])
  })

  it.each<[string, () => unknown, RegExp]>([
    ['today not a date', () => planDays([], [], THREE, [], '7/12/2026'), /today/],
    ['a booked day not a date', () => planDays([kit('tomorrow')], [], THREE, [], '2026-12-07'), /booked day/],
    ['bags each of 0', () => planDays([], [], { bagsPerPersonPerSet: 0, timing: TIMING }, [], '2026-12-07'), /bagsPerPersonPerSet/],
    ['bags each NaN', () => planDays([], [], { bagsPerPersonPerSet: Number.NaN, timing: TIMING }, [], '2026-12-07'), /bagsPerPersonPerSet/],
    ['a day that ends before it starts', () => planDays([], [], { bagsPerPersonPerSet: 3, timing: { ...TIMING, dayEndMinutes: 400 } }, [], '2026-12-07'), /dayEndMinutes/],
    ['minutes to mix not whole', () => planDays([], [], { bagsPerPersonPerSet: 3, timing: { ...TIMING, mixMinutes: 1.5 } }, [], '2026-12-07'), /mixMinutes/],
  ])('%s throws, naming it', (_what, run, field) => expect(run).toThrow(field))
})

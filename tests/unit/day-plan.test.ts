import { describe, expect, it } from 'vitest'
import { planDays, SETS_A_DAY, SETS_A_HALF_DAY, type BookedDay, type DaySet } from '../../shared/utils/day-plan'

// Sources. How many sets fit in a day is a planning figure of our own, from memory: a set of
// finish plaster goes off in about 1.5 to 2 hours (common practice, ../shared/DOMAIN.md, "Planning
// the sets"), so with mixing and cleaning down about 3 sets fit in a working day and 1 in a half
// day. Everything else here is our product's rule (sets in plan order, never split, logged sets
// stay on the day they were done, each person on a set takes an even share of its bags). People,
// days and bags are invented inputs.

const kit = (day: string, portion: BookedDay['portion'] = 'day'): BookedDay => ({ day, userId: 'u-kit', name: 'Kit', portion })
const jo = (day: string, portion: BookedDay['portion'] = 'day'): BookedDay => ({ day, userId: 'u-jo', name: 'Jo', portion })
const sets = (...bags: number[]): DaySet[] => bags.map((b, i) => ({ number: i + 1, bags: b }))
const THREE = { bagsPerPersonPerSet: 3 }

/** Each day as "day: set numbers (done marked with *)". */
const shape = (p: ReturnType<typeof planDays>) => p.days.map(d => `${d.day}: ${d.sets.map(s => `${s.number}${s.done ? '*' : ''}`).join(' ')}`)

describe('planDays', () => {
  it('the figures: 3 sets a full day, 1 a half day (from memory)', () => {
    expect(SETS_A_DAY).toBe(3)
    expect(SETS_A_HALF_DAY).toBe(1)
  })

  it.each<[string, BookedDay[], DaySet[], { setNumber: number, day: string }[], string[], number[]]>([
    ['no sets: the days, empty', [kit('2026-12-07')], [], [], ['2026-12-07: '], []],
    ['no days: every set unplaced', [], sets(1, 1), [], [], [1, 2]],
    // from memory: 3 sets in a full day, so sets 1-3 on the 7th, 4-5 on the 9th
    ['three a full day, in order', [kit('2026-12-07'), kit('2026-12-09')], sets(1, 1, 1, 1, 1), [], ['2026-12-07: 1 2 3', '2026-12-09: 4 5'], []],
    // from memory: 1 set in a half day
    ['one a half day', [kit('2026-12-07', 'half-day'), kit('2026-12-08')], sets(1, 1, 1), [], ['2026-12-07: 1', '2026-12-08: 2 3'], []],
    ['a half day beside a full day is a full day', [kit('2026-12-07'), jo('2026-12-07', 'half-day')], sets(1, 1, 1), [], ['2026-12-07: 1 2 3'], []],
    ['days run out: the rest unplaced', [kit('2026-12-07', 'half-day')], sets(1, 1, 1), [], ['2026-12-07: 1'], [2, 3]],
    ['days come sorted, not as booked', [kit('2026-12-09'), kit('2026-12-07')], sets(1, 1, 1, 1), [], ['2026-12-07: 1 2 3', '2026-12-09: 4'], []],
    // before today nothing new goes on; a logged set stays on the day it was done
    ['past days keep only what was logged', [kit('2026-12-05'), kit('2026-12-07')], sets(1, 1, 1), [{ setNumber: 1, day: '2026-12-05' }], ['2026-12-05: 1*', '2026-12-07: 2 3'], []],
    ['a set logged today takes a place today', [kit('2026-12-07'), kit('2026-12-08')], sets(1, 1, 1, 1), [{ setNumber: 1, day: '2026-12-07' }], ['2026-12-07: 1* 2 3', '2026-12-08: 4'], []],
    ['a set logged on a day not booked is done, not shown', [kit('2026-12-07')], sets(1, 1), [{ setNumber: 1, day: '2026-12-01' }], ['2026-12-07: 2'], []],
    ['a past day with nothing logged stays empty', [kit('2026-12-01'), kit('2026-12-07')], sets(1), [], ['2026-12-01: ', '2026-12-07: 1'], []],
  ])('%s', (_what, booked, planned, logged, days, unplaced) => {
    const plan = planDays(booked, planned, THREE, logged, '2026-12-07')
    expect(shape(plan)).toEqual(days)
    expect(plan.unplaced).toEqual(unplaced)
    if (unplaced.length) expect(plan.warnings.join(' ')).toMatch(/book more days/)
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
    ['bags each of 0', () => planDays([], [], { bagsPerPersonPerSet: 0 }, [], '2026-12-07'), /bagsPerPersonPerSet/],
    ['bags each NaN', () => planDays([], [], { bagsPerPersonPerSet: Number.NaN }, [], '2026-12-07'), /bagsPerPersonPerSet/],
  ])('%s throws, naming it', (_what, run, field) => expect(run).toThrow(field))
})

import { describe, expect, it } from 'vitest'
import type { DayPortion, DryingRules, EstimatedMaterial, JobStatus, LogCoat, MaterialComparison, MaterialUse, PlanTasks, RoomLog } from '../../shared/utils/jobs'
import { addDays, londonDay } from '../../shared/utils/dates'
import { canMoveJob, DEFAULT_DRYING, daysWorked, halfDaysWords, JOB_STATUSES, materialsAgainstEstimate, packCostPence, READY_CAUTION, readyToDecorateFrom, roomReadyToDecorate, safePlanOptions, skimCoverageM2 } from '../../shared/utils/jobs'

// Sources. The statuses, their moves, half days, pack costs and the materials comparison are our
// product's own rules (shared/utils/jobs.ts), not trade figures. Drying before decorating
// (../shared/DOMAIN.md, 5 "The job"), common practice: a skim needs about a week, more for
// undercoats and for cold or damp rooms, and it is advice, never a promise. The drying days used
// in the date arithmetic below are invented inputs, chosen so each sum is easy to check; dates
// follow the Gregorian calendar. Prices and packs are invented inputs too.

// ---------------------------------------------------------------------------------------------
// Statuses

/** Every move a person may make on the job screen, written out by hand (our product's rule). */
const BY_HAND: readonly string[] = [
  'booked>in-progress', // starts on site
  'booked>cancelled',
  'in-progress>finished',
  'in-progress>booked', // back to booked: started by mistake, or the job stopped
  'in-progress>cancelled',
  'finished>in-progress', // a finished job can be reopened
  'cancelled>booked', // a cancelled job can be booked again
]
/** The moves only the invoicing makes (our product's rule): invoiced and paid follow from invoices and payments. */
const BY_INVOICING: readonly string[] = ['finished>invoiced', 'invoiced>paid']

const pairs = JOB_STATUSES.flatMap(from => JOB_STATUSES.map(to => [from, to] as [JobStatus, JobStatus]))

describe('canMoveJob: every pair of statuses (our product\'s rule)', () => {
  it('covers 6 statuses, 36 pairs', () => {
    expect(JOB_STATUSES).toEqual(['booked', 'in-progress', 'finished', 'invoiced', 'paid', 'cancelled'])
    expect(pairs).toHaveLength(36)
  })

  it.each(pairs.map(([from, to]) => [from, to, BY_HAND.includes(`${from}>${to}`)] as const))('by hand: %s -> %s is %s', (from, to, allowed) => {
    expect(canMoveJob(from, to)).toBe(allowed)
    expect(canMoveJob(from, to, true)).toBe(allowed)
  })

  it.each(pairs.map(([from, to]) => [from, to, BY_HAND.includes(`${from}>${to}`) || BY_INVOICING.includes(`${from}>${to}`)] as const))('by the invoicing: %s -> %s is %s', (from, to, allowed) => {
    expect(canMoveJob(from, to, false)).toBe(allowed)
  })

  it.each(JOB_STATUSES.map(s => [s]))('by hand nothing becomes invoiced or paid, not even from %s', (from) => {
    expect(canMoveJob(from, 'invoiced')).toBe(false)
    expect(canMoveJob(from, 'paid')).toBe(false)
  })

  it('nothing leaves paid, and nothing stays where it is as a move', () => {
    for (const to of JOB_STATUSES) expect(canMoveJob('paid', to, false)).toBe(false)
    for (const s of JOB_STATUSES) expect([canMoveJob(s, s), canMoveJob(s, s, false)]).toEqual([false, false])
  })
})

// ---------------------------------------------------------------------------------------------
// Days worked (our product's rule: a day is 2 half days, half a day is 1)

const day = (userId: string, portion: DayPortion, worked = true) => ({ userId, portion, worked })

describe('daysWorked', () => {
  it.each<[string, ReturnType<typeof day>[], [string, number][]]>([
    ['no days booked', [], []],
    ['one day worked', [day('ann', 'day')], [['ann', 2]]],
    ['half a day worked', [day('ann', 'half-day')], [['ann', 1]]],
    ['a booked day not worked counts nothing', [day('ann', 'day', false)], []],
    ['a person whose days were all not worked is left out', [day('ann', 'day'), day('bob', 'day', false), day('bob', 'half-day', false)], [['ann', 2]]],
    // arithmetic: ann 2 + 1 + 2 = 5 half days; bob 1 + 1 = 2 (his full day was not worked)
    ['two people over several days', [day('ann', 'day'), day('bob', 'half-day'), day('ann', 'half-day'), day('bob', 'day', false), day('ann', 'day'), day('bob', 'half-day')], [['ann', 5], ['bob', 2]]],
  ])('%s', (_what, days, halves) => expect([...daysWorked(days)]).toEqual(halves))
})

describe('halfDaysWords', () => {
  it.each([
    [0, '0 days'],
    [1, 'half a day'],
    [2, '1 day'],
    [3, '1.5 days'],
    [4, '2 days'],
    [5, '2.5 days'],
    [20, '10 days'],
    [21, '10.5 days'],
  ])('%i half days is %s', (halves, words) => expect(halfDaysWords(halves)).toBe(words))

  it('reads what daysWorked gives', () => {
    // arithmetic: 1 day + half a day + 1 day = 5 half days = 2.5 days
    const halves = daysWorked([day('ann', 'day'), day('ann', 'half-day'), day('ann', 'day')]).get('ann')!
    expect(halfDaysWords(halves)).toBe('2.5 days')
  })
})

// ---------------------------------------------------------------------------------------------
// Materials used against the estimate (our product's rule: packs in thousandths, money half up to the penny)

describe('packCostPence: thousandths of a pack x pence a pack, half up to the penny', () => {
  it.each([
    [1000, 1250, 1250], // 1 pack at £12.50
    [1500, 1000, 1500], // 1.5 packs at £10.00
    [0, 1000, 0],
    [2000, 0, 0],
    [1, 499, 0], // 0.499p -> 0
    [1, 500, 1], // 0.5p -> 1: half up at the half-penny
    [1, 501, 1], // 0.501p -> 1
    [500, 1, 1], // 0.5p -> 1
    [499, 1, 0], // 0.499p -> 0
    [1500, 333, 500], // 499.5p -> 500
    [2500, 999, 2498], // 2497.5p -> 2498 (half up, not to even)
    [3500, 999, 3497], // 3496.5p -> 3497 (half up, not to even)
    [333, 3, 1], // 0.999p -> 1
    [250, 1234, 309], // 308.5p -> 309
    [1_000_000, 1_000_000, 1_000_000_000], // 1,000 packs at £10,000: exact in integers
  ])('%i thousandths at %ip a pack is %ip', (packsX1000, pence, cost) => expect(packCostPence(packsX1000, pence)).toBe(cost))
})

const est = (materialId: string | null, name: string, packs: number, costPence: number): EstimatedMaterial => ({ materialId, name, packs, costPence })
const use = (materialId: string, name: string, packsX1000: number, costPencePerPack: number): MaterialUse => ({ materialId, name, packsX1000, costPencePerPack })
const row = (materialId: string | null, name: string, estimatedPacksX1000: number, usedPacksX1000: number, estimatedCostPence: number, usedCostPence: number): MaterialComparison => ({
  materialId,
  name,
  estimatedPacksX1000,
  usedPacksX1000,
  differencePacksX1000: usedPacksX1000 - estimatedPacksX1000,
  estimatedCostPence,
  usedCostPence,
  differenceCostPence: usedCostPence - estimatedCostPence,
})

describe('materialsAgainstEstimate (our product\'s rule; names and prices are invented)', () => {
  it.each<[string, EstimatedMaterial[], MaterialUse[], MaterialComparison[]]>([
    ['nothing estimated or used', [], [], []],
    // 3 packs estimated at £30.00, none used: 3,000 thousandths and £30.00 under
    ['estimated only', [est('m1', 'Finish plaster', 3, 3000)], [], [row('m1', 'Finish plaster', 3000, 0, 3000, 0)]],
    // 1.5 packs at £10.00 used, nothing estimated: 1,500 over, £15.00 over
    ['used only', [], [use('m2', 'Bonding undercoat', 1500, 1000)], [row('m2', 'Bonding undercoat', 0, 1500, 0, 1500)]],
    // arithmetic: estimated 3 packs, £30.00; used 1.5 + 1.25 = 2.75 packs, £15.00 + £12.50 = £27.50; 0.25 pack and £2.50 under
    ['both, matched by material id', [est('m1', 'Finish plaster', 3, 3000)], [use('m1', 'Finish plaster', 1500, 1000), use('m1', 'Finish plaster', 1250, 1000)], [row('m1', 'Finish plaster', 3000, 2750, 3000, 2750)]],
    // arithmetic: estimated 2 packs, £20.00; used 2.5 packs: 0.5 pack and £5.00 over
    ['more used than estimated', [est('m1', 'Finish plaster', 2, 2000)], [use('m1', 'Finish plaster', 2500, 1000)], [row('m1', 'Finish plaster', 2000, 2500, 2000, 2500)]],
    // each use is costed at its own price per pack: 1 pack at £10.00 + 1 pack at £11.00 = £21.00
    ['uses at different prices', [est('m1', 'Finish plaster', 2, 2000)], [use('m1', 'Finish plaster', 1000, 1000), use('m1', 'Finish plaster', 1000, 1100)], [row('m1', 'Finish plaster', 2000, 2000, 2000, 2100)]],
    // each use is rounded half up to the penny on its own: 0.5p -> 1p twice = 2p
    ['each use rounded to the penny', [], [use('m1', 'Scrim', 1, 500), use('m1', 'Scrim', 1, 500)], [row('m1', 'Scrim', 0, 2, 0, 2)]],
    // an estimated material with no id (the catalogue had none when it was estimated) is matched by name
    ['no id in the estimate: matched by name', [est(null, 'Finish plaster', 3, 3000)], [use('m1', 'Finish plaster', 2000, 1000)], [row(null, 'Finish plaster', 3000, 2000, 3000, 2000)]],
    ['no id in the estimate and another name: two rows', [est(null, 'Finish plaster', 3, 3000)], [use('m1', 'Multi-finish', 2000, 1000)], [row(null, 'Finish plaster', 3000, 0, 3000, 0), row('m1', 'Multi-finish', 0, 2000, 0, 2000)]],
    ['an id in the estimate is never matched by name', [est('m1', 'Finish plaster', 3, 3000)], [use('m2', 'Finish plaster', 2000, 1000)], [row('m1', 'Finish plaster', 3000, 0, 3000, 0), row('m2', 'Finish plaster', 0, 2000, 0, 2000)]],
    // the first material used under that name takes the row; a second material of the same name is its own row
    ['a name is matched by one material only', [est(null, 'Finish plaster', 3, 3000)], [use('m1', 'Finish plaster', 1000, 1000), use('m2', 'Finish plaster', 500, 1200), use('m1', 'Finish plaster', 1000, 1000)], [row(null, 'Finish plaster', 3000, 2000, 3000, 2000), row('m2', 'Finish plaster', 0, 500, 0, 600)]],
    // the same material estimated twice adds up: 2 + 1 packs, £20.00 + £10.00
    ['the same material estimated twice', [est('m1', 'Finish plaster', 2, 2000), est('m1', 'Finish plaster', 1, 1000)], [], [row('m1', 'Finish plaster', 3000, 0, 3000, 0)]],
    ['the same name with no id estimated twice', [est(null, 'Bead, 3 m', 4, 0), est(null, 'Bead, 3 m', 2, 0)], [], [row(null, 'Bead, 3 m', 6000, 0, 0, 0)]],
    // estimated ones first, in the estimate's order; then the used-only ones, in the order first used
    ['estimated first, then used-only', [est('m1', 'Finish plaster', 3, 3000), est('m2', 'Bonding undercoat', 2, 2400)], [use('m3', 'Scrim', 1000, 400), use('m2', 'Bonding undercoat', 1000, 1200), use('m4', 'PVA', 200, 800)], [
      row('m1', 'Finish plaster', 3000, 0, 3000, 0),
      row('m2', 'Bonding undercoat', 2000, 1000, 2400, 1200),
      row('m3', 'Scrim', 0, 1000, 0, 400),
      row('m4', 'PVA', 0, 200, 0, 160), // 0.2 x 800p = 160p
    ]],
  ])('%s', (_what, estimate, uses, rows) => expect(materialsAgainstEstimate(estimate, uses)).toEqual(rows))

  it('does not change its inputs', () => {
    const estimate = [est(null, 'Finish plaster', 3, 3000)]
    const uses = [use('m1', 'Finish plaster', 2000, 1000)]
    const before = structuredClone({ estimate, uses })
    materialsAgainstEstimate(estimate, uses)
    expect({ estimate, uses }).toEqual(before)
  })
})

// ---------------------------------------------------------------------------------------------
// Dates (Gregorian calendar arithmetic)

describe('addDays', () => {
  it.each([
    ['2028-01-10', 0, '2028-01-10'],
    ['2028-01-10', 7, '2028-01-17'],
    ['2028-01-31', 1, '2028-02-01'], // month end
    ['2028-04-30', 1, '2028-05-01'], // a 30-day month
    ['2027-12-31', 1, '2028-01-01'], // year end
    ['2027-12-25', 14, '2028-01-08'], // across the year end
    ['2028-02-28', 1, '2028-02-29'], // 2028 is a leap year (divisible by 4)
    ['2028-02-29', 1, '2028-03-01'],
    ['2028-02-22', 7, '2028-02-29'], // a week onto the leap day
    ['2027-02-28', 1, '2027-03-01'], // 2027 is not
    ['2028-02-29', 365, '2029-02-28'], // 2029 has no 29 February
    ['2028-02-29', 366, '2029-03-01'],
    ['2028-03-01', -1, '2028-02-29'], // back over the leap day
    ['2028-01-01', -1, '2027-12-31'], // back over the year end
    ['2100-02-28', 1, '2100-03-01'], // a century year that is not a leap year
    ['2000-02-28', 1, '2000-02-29'], // divisible by 400: a leap year
    ['0050-06-01', 1, '0050-06-02'], // a year below 100 is that year, not 1950
  ])('%s + %i days is %s', (from, days, to) => expect(addDays(from, days)).toBe(to))

  it.each<[string, unknown, unknown]>([
    ['a date with one-digit month and day', '2028-2-3', 1],
    ['a two-digit year', '28-02-03', 1],
    ['slashes', '2028/02/03', 1],
    ['an empty string', '', 1],
    ['a date and time', '2028-02-03T00:00:00Z', 1],
    ['a space before', ' 2028-02-03', 1],
    ['not a string', 20280203, 1],
    ['29 February in a year that is not a leap year', '2027-02-29', 1],
    ['month 13', '2028-13-01', 1],
    ['month 0', '2028-00-10', 1],
    ['31 April', '2028-04-31', 1],
    ['day 0', '2028-01-00', 1],
    ['half a day', '2028-01-10', 1.5],
    ['days that are not a number', '2028-01-10', Number.NaN],
    ['infinite days', '2028-01-10', Number.POSITIVE_INFINITY],
    ['days as a string', '2028-01-10', '1'],
    ['past the year 9999', '9999-12-31', 1],
    ['before the year 0000', '0000-01-01', -1],
  ])('%s throws a RangeError', (_what, from, days) => expect(() => addDays(from as string, days as number)).toThrow(RangeError))
})

// ---------------------------------------------------------------------------------------------
// Ready to decorate

const coat = (dayOn: string, c: LogCoat, coldOrDamp = false) => ({ day: dayOn, coat: c, coldOrDamp })
/** Invented drying days, not trade figures: different from each other so each sum shows which rule applied. */
const R: DryingRules = { skimDays: 5, undercoatDays: 12, coldOrDampExtraDays: 3 }

describe('readyToDecorateFrom', () => {
  it.each<[string, ReturnType<typeof coat>[], string | null]>([
    ['nothing logged', [], null],
    // our product's rule: a first or second (skim) coat takes skimDays: 10 Jan + 5
    ['a first coat', [coat('2028-01-10', 'first')], '2028-01-15'],
    ['a second coat', [coat('2028-01-10', 'second')], '2028-01-15'],
    // our product's rule: a fill takes undercoatDays: 10 Jan + 12
    ['a fill', [coat('2028-01-10', 'fill')], '2028-01-22'],
    // our product's rule: cold or damp adds coldOrDampExtraDays: 10 Jan + 5 + 3; 10 Jan + 12 + 3
    ['a skim in a cold or damp room', [coat('2028-01-10', 'second', true)], '2028-01-18'],
    ['a fill in a cold or damp room', [coat('2028-01-10', 'fill', true)], '2028-01-25'],
    // the latest of several coats: fill 2 Jan + 12 = 14 Jan; second coat 12 Jan + 5 = 17 Jan
    ['latest of a fill and a later skim', [coat('2028-01-02', 'fill'), coat('2028-01-12', 'second')], '2028-01-17'],
    // the latest, not the last logged: fill 10 Jan + 12 = 22 Jan beats second coat 12 Jan + 5 = 17 Jan
    ['a fill can outlast a later skim', [coat('2028-01-10', 'fill'), coat('2028-01-12', 'second')], '2028-01-22'],
    ['in any order', [coat('2028-01-12', 'second'), coat('2028-01-10', 'fill'), coat('2028-01-11', 'first')], '2028-01-22'],
    // one coat in a cold room: 11 Jan + 5 + 3 = 19 Jan beats 12 Jan + 5 = 17 Jan
    ['a cold or damp coat among others', [coat('2028-01-11', 'first', true), coat('2028-01-12', 'second')], '2028-01-19'],
    // across the year end: 28 Dec + 5 + 3 = 5 Jan
    ['across the year end', [coat('2027-12-28', 'second', true)], '2028-01-05'],
    // onto the leap day: 17 Feb + 12 = 29 Feb
    ['onto the leap day', [coat('2028-02-17', 'fill')], '2028-02-29'],
  ])('%s', (_what, coats, from) => expect(readyToDecorateFrom(coats, R)).toBe(from))

  it('takes 0 drying days when told to', () => {
    expect(readyToDecorateFrom([coat('2028-01-10', 'fill', true)], { skimDays: 0, undercoatDays: 0, coldOrDampExtraDays: 0 })).toBe('2028-01-10')
  })

  it('the default days follow DOMAIN.md', () => {
    // common practice (DOMAIN.md, 5 "The job"): a skim coat needs about a week to dry before decorating
    expect(DEFAULT_DRYING.skimDays).toBe(7)
    expect(readyToDecorateFrom([coat('2028-01-10', 'second')])).toBe('2028-01-17')
    // common practice (DOMAIN.md, 5): more for undercoats, and more for cold or damp rooms
    expect(DEFAULT_DRYING.undercoatDays).toBeGreaterThan(DEFAULT_DRYING.skimDays)
    expect(DEFAULT_DRYING.coldOrDampExtraDays).toBeGreaterThan(0)
    expect(readyToDecorateFrom([coat('2028-01-10', 'fill')])! > readyToDecorateFrom([coat('2028-01-10', 'second')])!).toBe(true)
    expect(readyToDecorateFrom([coat('2028-01-10', 'second', true)])! > readyToDecorateFrom([coat('2028-01-10', 'second')])!).toBe(true)
  })

  it.each<[string, unknown, RegExp]>([
    ['negative skim days', { ...R, skimDays: -1 }, /skimDays/],
    ['half a day of undercoat drying', { ...R, undercoatDays: 1.5 }, /undercoatDays/],
    ['extra days that are not a number', { ...R, coldOrDampExtraDays: Number.NaN }, /coldOrDampExtraDays/],
    ['infinite skim days', { ...R, skimDays: Number.POSITIVE_INFINITY }, /skimDays/],
    ['days as a string', { ...R, undercoatDays: '14' }, /undercoatDays/],
    ['a missing field', { skimDays: 7, undercoatDays: 14 }, /coldOrDampExtraDays/],
    ['a field that is null', { ...R, skimDays: null }, /skimDays/],
  ])('%s throws a RangeError naming the field', (_what, rules, field) => {
    // our product's rule: drying days are whole days, 0 or more; checked even when nothing is logged
    expect(() => readyToDecorateFrom([coat('2028-01-10', 'second')], rules as DryingRules)).toThrow(RangeError)
    expect(() => readyToDecorateFrom([coat('2028-01-10', 'second')], rules as DryingRules)).toThrow(field)
    expect(() => readyToDecorateFrom([], rules as DryingRules)).toThrow(field)
  })

  it('no rules at all throws, naming what is wanted', () => {
    expect(() => readyToDecorateFrom([], null as unknown as DryingRules)).toThrow(/skimDays, undercoatDays and coldOrDampExtraDays/)
  })

  it('a coat logged on a day that is not a date throws', () => {
    expect(() => readyToDecorateFrom([coat('2028-02-30', 'second')], R)).toThrow(RangeError)
  })
})

// ---------------------------------------------------------------------------------------------
// The day of a coat, in Britain

describe('londonDay', () => {
  it.each<[string, string, string]>([
    // Europe/London is UTC in winter (GMT) and UTC+1 in summer (BST), from 01:00 UTC on the last
    // Sunday of March to 01:00 UTC on the last Sunday of October (the Summer Time Act 1972 and
    // its orders; the tz database)
    ['winter: the UTC day', '2026-12-07T23:30:00Z', '2026-12-07'],
    ['summer: half past midnight BST is the next day', '2027-06-10T23:30:00Z', '2027-06-11'],
    ['summer: 22:59 UTC is still the same day', '2027-06-10T22:59:00Z', '2027-06-10'],
    ['the last minute of GMT before the clocks go forward (28 March 2027)', '2027-03-28T00:59:00Z', '2027-03-28'],
    ['the evening the clocks went forward', '2027-03-28T23:10:00Z', '2027-03-29'],
    ['after the clocks go back (31 October 2027): GMT again', '2027-10-31T23:10:00Z', '2027-10-31'],
    ['new year in summer time? no: GMT', '2027-12-31T23:59:59Z', '2027-12-31'],
  ])('%s', (_what, at, day) => expect(londonDay(new Date(at))).toBe(day))

  it('an invalid date throws', () => {
    expect(() => londonDay(new Date('not a date'))).toThrow(RangeError)
  })
})

// ---------------------------------------------------------------------------------------------
// Ready to decorate, per room

const log = (dayOn: string, c: LogCoat, surfaceIds: string[], setNumber: number | null = null, coldOrDamp = false): RoomLog => ({ day: dayOn, coat: c, coldOrDamp, surfaceIds, setNumber })
/** A room of three surfaces planned in two sets: set 1 fills A and skims B; set 2 skims A and C. (Our own inputs.) */
const PLAN: PlanTasks = {
  sets: [
    { number: 1, tasks: [{ surfaceId: 'A', action: 'fill' }, { surfaceId: 'B', action: 'skim' }] },
    { number: 2, tasks: [{ surfaceId: 'A', action: 'skim' }, { surfaceId: 'C', action: 'skim' }] },
  ],
}
const ROOM = ['A', 'B', 'C']

describe('roomReadyToDecorate', () => {
  // drying days R (invented, see above): skim 5, undercoat 12, cold or damp +3
  it.each<[string, RoomLog[], { from: string | null, skimmed: number }]>([
    ['nothing logged: not finished', [], { from: null, skimmed: 0 }],
    // our product's rule: not finished until every surface has its second (final) skim coat
    ['set 1 logged: B skimmed, A only filled, C untouched', [log('2028-01-10', 'second', ['A', 'B'], 1)], { from: null, skimmed: 1 }],
    ['a first coat is not the final coat', [log('2028-01-10', 'second', ['A', 'B'], 1), log('2028-01-11', 'first', ['A', 'C'], 2)], { from: null, skimmed: 1 }],
    // all three skimmed: the latest of fill 10 Jan + 12 = 22 Jan and second coats 11 Jan + 5 = 16 Jan
    ['every surface skimmed: the latest coat decides', [log('2028-01-10', 'second', ['A', 'B'], 1), log('2028-01-11', 'second', ['A', 'C'], 2)], { from: '2028-01-22', skimmed: 3 }],
    // a fill logged on its own, then every skim: fill 2 Jan + 12 = 14 Jan; skims 12 Jan + 5 = 17 Jan
    ['fill long before: the skims decide', [log('2028-01-02', 'fill', ['A'], 1), log('2028-01-12', 'second', ['B'], 1), log('2028-01-12', 'second', ['A', 'C'], 2)], { from: '2028-01-17', skimmed: 3 }],
    // a log with no set number counts its coat for every surface it names: 12 Jan + 5 = 17 Jan
    ['no set number: the coat as logged', [log('2028-01-12', 'second', ['A', 'B', 'C'])], { from: '2028-01-17', skimmed: 3 }],
    // cold or damp on the last set: 12 Jan + 5 + 3 = 20 Jan
    ['a cold or damp last set', [log('2028-01-12', 'second', ['B'], 1), log('2028-01-12', 'second', ['A', 'C'], 2, true)], { from: '2028-01-20', skimmed: 3 }],
    ['surfaces of other rooms are left out', [log('2028-01-12', 'second', ['A', 'B', 'C', 'Z'], null), log('2028-03-01', 'fill', ['Z'])], { from: '2028-01-17', skimmed: 3 }],
  ])('%s', (_what, logs, want) => {
    expect(roomReadyToDecorate(ROOM, logs, PLAN, R)).toEqual({ ...want, surfaces: 3 })
  })

  it('a room with no surfaces is never ready', () => {
    expect(roomReadyToDecorate([], [log('2028-01-12', 'second', ['A'])], PLAN, R)).toEqual({ from: null, skimmed: 0, surfaces: 0 })
  })

  it('still checks the drying rules while the room is not finished', () => {
    expect(() => roomReadyToDecorate(ROOM, [], PLAN, { ...R, skimDays: -1 })).toThrow(/skimDays/)
  })

  it('the default days: skim 7 (common practice), undercoat 14 and cold or damp +7 (from memory)', () => {
    // common practice (DOMAIN.md, 5 "The job"): about a week for a skim
    expect(DEFAULT_DRYING.skimDays).toBe(7)
    // from memory: DOMAIN.md only says longer for undercoats and for cold or damp rooms
    expect(DEFAULT_DRYING.undercoatDays).toBe(14)
    expect(DEFAULT_DRYING.coldOrDampExtraDays).toBe(7)
    expect(roomReadyToDecorate(['B'], [log('2028-01-10', 'second', ['B'], 1)], PLAN).from).toBe('2028-01-17')
  })

  it('the caution defers to the Building Regulations and good trade practice, and is no promise', () => {
    expect(READY_CAUTION).toMatch(/not a promise/)
    expect(READY_CAUTION).toMatch(/the Building Regulations where they apply/)
    expect(READY_CAUTION).toMatch(/good trade practice/)
  })
})

// ---------------------------------------------------------------------------------------------
// The plan's coverage figure

describe('skimCoverageM2', () => {
  it.each<[string, number, number, number | null]>([
    // common practice (DOMAIN.md, "Coverage"): a 25 kg bag of finish covers about 10 to 12 m² at 2 mm
    ['10 m² at 2 mm', 10, 2, 10],
    // coverage scales inversely with thickness (about 1.0 kg per m² per mm, common practice): 10 m² at 3 mm is 15 at 2 mm
    ['10 m² at 3 mm is 15 at 2 mm', 10, 3, 15],
    ['11.5 m² at 1 mm is 5.8 at 2 mm (5.75, half up)', 11.5, 1, 5.8],
    // our product's rule: never under 0.1 m² a bag, or the planner would divide by 0 (this used to be a 500)
    ['a tiny figure is raised to 0.1', 0.01, 1, 0.1],
    ['a tiny figure is raised to 0.1 (0.04 at 2 mm)', 0.04, 2, 0.1],
    ['0 is not a figure', 0, 2, null],
    ['no thickness is not a figure', 10, 0, null],
    ['NaN is not a figure', Number.NaN, 2, null],
  ])('%s', (_what, m2, mm, want) => expect(skimCoverageM2(m2, mm)).toBe(want))
})

describe('safePlanOptions', () => {
  const base = { people: 2, bagsPerPersonPerSet: 3 }
  it.each<[string, number, number, RegExp | null]>([
    // common practice: 10 m² a bag at 2 mm; no warning
    ['a usual figure', 10, 10, null],
    ['2 m² a bag: low but no warning', 2, 2, null],
    // our product's rule: under 2 m² a bag is warned about, under 0.1 is raised to 0.1
    ['1.5 m² a bag: warned', 1.5, 1.5, /far under the 10 to 12 m²/],
    ['0.1 m² a bag: warned, kept', 0.1, 0.1, /far under/],
    ['0 (stored before the floor): raised to 0.1', 0, 0.1, /planned at 0\.1 m² a bag/],
    ['negative: raised to 0.1', -3, 0.1, /planned at 0\.1 m² a bag/],
    ['NaN: raised to 0.1', Number.NaN, 0.1, /no figure/],
  ])('%s', (_what, coverage, used, warning) => {
    const got = safePlanOptions({ ...base, coverageM2PerBag: coverage })
    expect(got.options).toEqual({ ...base, coverageM2PerBag: used })
    if (warning) expect(got.warnings).toEqual([expect.stringMatching(warning)])
    else expect(got.warnings).toEqual([])
  })
})

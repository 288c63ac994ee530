import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { planDays, type BookedDay, type DaySet, type LoggedSet } from '../../shared/utils/day-plan'
import { clockTime, hoursOf, personSteps, setPattern, setWaits, type DayTiming, type TimelineSet } from '../../shared/utils/set-timeline'
import type { PlanCorner } from '../../shared/utils/set-plan'

// Sources. The firm's figures in these tables are the price book's defaults: 15 minutes a mix, 105
// minutes for finish plaster to go off (common practice: "about 1.5 to 2 hours", ../shared/DOMAIN.md
// "Planning the sets"), a working day of 08:00 to 16:30. The minutes a bag to lay on (15), for the
// second coat (10) and to trowel up (10), a bag to a mix, and the first coat firm enough for the
// second a quarter of the way through going off, are rules of thumb from memory (constants in
// shared/utils/set-timeline.ts). Which set waits for which follows the trade's order (common
// practice, DOMAIN.md): a fill or tight coat before the skim over it, a packed-out bead's face
// before its return, the two faces of a difficult corner one after the other. People, days, bags
// and surfaces are invented.

const DEFAULTS: DayTiming = { mixMinutes: 15, goOffMinutes: 105, dayStartMinutes: 480, dayEndMinutes: 990 }
type Row = { phase: string, from: number, to: number }

describe('setPattern: one set\'s work, minutes from the start of mixing', () => {
  it.each<[string, number, number, DayTiming, Row[], number, number]>([
    // 3 mixes of 15; 3 bags x 15 to lay on; second coat when laying on is done (45 > 30, a quarter of 105 rounded up), 3 x 10;
    // gone off 105 after laying on began (45 + 105 = 150); 3 x 10 to trowel up
    ['one person, 3 bags', 3, 1, DEFAULTS, [{ phase: 'mix', from: 0, to: 45 }, { phase: 'lay-on', from: 45, to: 90 }, { phase: 'second-coat', from: 90, to: 120 }, { phase: 'trowel-up', from: 150, to: 180 }], 150, 180],
    // two mix in two rounds (30); 1.5 bags each: 22.5 -> 25 to lay on; the first coat firms at 30 after laying on began; 15; 15
    ['two people, 3 bags', 3, 2, DEFAULTS, [{ phase: 'mix', from: 0, to: 30 }, { phase: 'lay-on', from: 30, to: 55 }, { phase: 'second-coat', from: 60, to: 75 }, { phase: 'trowel-up', from: 135, to: 150 }], 135, 150],
    // a tight coat is still a whole mix, and each stretch is at least 5 minutes
    ['one person, 0.1 bag', 0.1, 1, DEFAULTS, [{ phase: 'mix', from: 0, to: 15 }, { phase: 'lay-on', from: 15, to: 20 }, { phase: 'second-coat', from: 45, to: 50 }, { phase: 'trowel-up', from: 120, to: 125 }], 120, 125],
    // a slower plaster (150 minutes, the firm's figure): firm after 37.5 -> 40
    ['slow plaster, 1 bag', 1, 1, { ...DEFAULTS, goOffMinutes: 150 }, [{ phase: 'mix', from: 0, to: 15 }, { phase: 'lay-on', from: 15, to: 30 }, { phase: 'second-coat', from: 55, to: 65 }, { phase: 'trowel-up', from: 165, to: 175 }], 165, 175],
    // too big for one: the second coat is still going on when it has gone off, so trowelling up waits for it
    ['one person, 6 bags', 6, 1, DEFAULTS, [{ phase: 'mix', from: 0, to: 90 }, { phase: 'lay-on', from: 90, to: 180 }, { phase: 'second-coat', from: 180, to: 240 }, { phase: 'trowel-up', from: 240, to: 300 }], 195, 300],
    // no time given to mixing: no mixing stretch
    ['no mixing time', 1, 1, { ...DEFAULTS, mixMinutes: 0 }, [{ phase: 'lay-on', from: 0, to: 15 }, { phase: 'second-coat', from: 30, to: 40 }, { phase: 'trowel-up', from: 105, to: 115 }], 105, 115],
  ])('%s', (_what, bags, people, timing, blocks, goneOff, end) => {
    const p = setPattern(bags, people, timing)
    expect(p.blocks).toEqual(blocks)
    expect(p.goneOff).toBe(goneOff)
    expect(p.end).toBe(end)
  })

  it('the day\'s hours: a half day is the first half', () => {
    expect(hoursOf('day', DEFAULTS)).toEqual({ from: 480, to: 990 })
    expect(hoursOf('half-day', DEFAULTS)).toEqual({ from: 480, to: 735 })
    expect([0, 510, 735, 990, 1439].map(clockTime)).toEqual(['00:00', '08:30', '12:15', '16:30', '23:59'])
  })
})

const set = (number: number, ...tasks: [string, string][]): TimelineSet => ({ number, bags: 1, tasks: tasks.map(([surfaceId, action]) => ({ surfaceId, action })) })
const waitsOf = (sets: TimelineSet[], corners: PlanCorner[] = []) => Object.fromEntries([...setWaits(sets, corners)].map(([n, w]) => [n, w.map(x => x.set)]))

describe('setWaits: which earlier sets a set waits for (common practice)', () => {
  it.each<[string, TimelineSet[], PlanCorner[], Record<number, number[]>]>([
    ['a patch fill before the skim over it', [set(1, ['A', 'fill']), set(2, ['A', 'skim'])], [], { 1: [], 2: [1] }],
    ['tight coats: each after the one before, the skim after both', [set(1, ['G', 'tight-coat']), set(2, ['G', 'tight-coat']), set(3, ['G', 'skim'])], [], { 1: [], 2: [1], 3: [1, 2] }],
    ['the parts of one fill lie side by side: they do not wait for each other', [set(1, ['A', 'fill']), set(2, ['A', 'fill']), set(3, ['A', 'skim'])], [], { 1: [], 2: [], 3: [1, 2] }],
    ['an undercoat before the skim', [set(1, ['A', 'undercoat']), set(2, ['A', 'skim'])], [], { 1: [], 2: [1] }],
    ['a packed-out bead: the return waits for the face', [set(1, ['F', 'skim']), set(2, ['R', 'skim'])], [{ a: 'R', b: 'F', kind: 'external', packedBead: { face: 'F' } }], { 1: [], 2: [1] }],
    ['a difficult corner: the later face waits for the first', [set(1, ['B', 'skim']), set(2, ['A', 'skim'])], [{ a: 'A', b: 'B', kind: 'internal', dryCorner: true }], { 1: [], 2: [1] }],
    ['an easy corner: no wait', [set(1, ['B', 'skim']), set(2, ['A', 'skim'])], [{ a: 'A', b: 'B', kind: 'internal' }], { 1: [], 2: [] }],
    ['different surfaces: no wait', [set(1, ['A', 'skim']), set(2, ['B', 'skim'])], [], { 1: [], 2: [] }],
    // moved by hand so the skim comes first: the plan warns; nothing waits for a later set
    ['a skim moved before its fill waits for nothing', [set(1, ['A', 'skim']), set(2, ['A', 'fill'])], [], { 1: [], 2: [] }],
    ['each earlier set once, in order', [set(1, ['A', 'fill'], ['B', 'skim']), set(2, ['C', 'tight-coat']), set(3, ['A', 'skim'], ['C', 'skim'])], [{ a: 'A', b: 'B', kind: 'internal', dryCorner: true }], { 1: [], 2: [], 3: [1, 2] }],
  ])('%s', (_what, sets, corners, expected) => {
    expect(waitsOf(sets, corners)).toEqual(expected)
  })

  it('says why in words, naming the surface', () => {
    const w = setWaits([set(1, ['A', 'fill']), set(2, ['A', 'skim'])], [], { A: 'Box room · Wall 1' }).get(2)!
    expect(w).toEqual([{ set: 1, why: 'the patch fill on Box room · Wall 1 is under a later coat' }])
  })
})

describe('personSteps: the day in words', () => {
  it('each stretch with its time, and when each set is trowelled up', () => {
    const plan = planDays([{ day: '2026-12-07', userId: 'k', name: 'Kit', portion: 'day' }], [{ number: 1, bags: 3 }, { number: 2, bags: 3 }], { bagsPerPersonPerSet: 3, timing: DEFAULTS }, [], '2026-12-07')
    expect(personSteps(plan.days[0]!.timeline[0]!.blocks)).toEqual([
      '08:00 mix set 1', '08:45 lay on set 1', '09:30 second coat set 1', '10:30 trowel up set 1', '11:00 set 1 trowelled up',
      '11:00 mix set 2', '11:45 lay on set 2', '12:30 second coat set 2', '13:30 trowel up set 2', '14:00 set 2 trowelled up',
    ])
  })
})

// ---------------------------------------------------------------------------------------------
// Properties, on random jobs: random crews and half days, random sets and waits, random firm figures

const DAYS = ['2026-12-04', '2026-12-07', '2026-12-08', '2026-12-09', '2026-12-10']
const TODAY = '2026-12-07'
const PEOPLE = [{ userId: 'k', name: 'Kit' }, { userId: 'j', name: 'Jo' }, { userId: 'r', name: 'Rafe' }]

const jobArb = fc.record({
  timing: fc.record({ mixMinutes: fc.integer({ min: 0, max: 30 }), goOffMinutes: fc.integer({ min: 30, max: 200 }), dayStartMinutes: fc.integer({ min: 360, max: 600 }), length: fc.integer({ min: 120, max: 660 }) }),
  booked: fc.array(fc.record({ day: fc.constantFrom(...DAYS), who: fc.integer({ min: 0, max: 2 }), half: fc.boolean() }), { maxLength: 9 }),
  sets: fc.array(fc.record({ tenths: fc.integer({ min: 1, max: 90 }), waits: fc.array(fc.integer({ min: 1, max: 12 }), { maxLength: 3 }) }), { maxLength: 12 }),
  logged: fc.array(fc.record({ set: fc.integer({ min: 1, max: 12 }), day: fc.constantFrom('2026-12-01', ...DAYS.slice(0, 2)) }), { maxLength: 3 }),
}).map(({ timing: t, booked, sets, logged }) => ({
  timing: { mixMinutes: t.mixMinutes, goOffMinutes: t.goOffMinutes, dayStartMinutes: t.dayStartMinutes, dayEndMinutes: Math.min(1440, t.dayStartMinutes + t.length) },
  booked: booked.map((b): BookedDay => ({ day: b.day, ...PEOPLE[b.who]!, portion: b.half ? 'half-day' : 'day' })),
  // each set waits only for earlier ones (the plan's order)
  sets: sets.map((s, i): DaySet => ({ number: i + 1, bags: s.tenths / 10, waits: [...new Set(s.waits.filter(w => w < i + 1))].map(w => ({ set: w, why: 'test' })) })),
  logged: logged.filter(l => l.set <= sets.length).map((l): LoggedSet => ({ setNumber: l.set, day: l.day })),
}))

type Job = ReturnType<typeof jobArb['generate']>['value']

const planOf = (job: Job) => planDays(job.booked, job.sets, { bagsPerPersonPerSet: 3, timing: job.timing }, job.logged, TODAY)

/** Every rule the day plan and its timeline keep; each broken rule in words. */
function broken(job: Job, plan = planOf(job)): string[] {
  const bad: string[] = []
  const loggedOn = new Map<number, string>()
  for (const l of job.logged) if (!loggedOn.has(l.setNumber) || l.day < loggedOn.get(l.setNumber)!) loggedOn.set(l.setNumber, l.day)
  const where = new Map<number, { day: string, mixAt: number, goneOffAt: number, done: boolean }>()
  for (const d of plan.days) {
    for (const s of d.sets) {
      if (where.has(s.number)) bad.push(`set ${s.number} placed twice`)
      where.set(s.number, { day: d.day, mixAt: s.times.mixAt, goneOffAt: s.times.goneOffAt, done: s.done })
    }
  }
  // every set is placed, listed as not fitting, or done on a day not booked; never silently left off
  for (const s of job.sets) {
    const placed = where.has(s.number)
    const unplaced = plan.unplaced.includes(s.number)
    const doneElsewhere = loggedOn.has(s.number) && !job.booked.some(b => b.day === loggedOn.get(s.number))
    if ([placed, unplaced, doneElsewhere].filter(Boolean).length !== 1) bad.push(`set ${s.number}: placed ${placed}, unplaced ${unplaced}, done elsewhere ${doneElsewhere}`)
    if (unplaced && !plan.warnings.some(w => new RegExp(`\\bset ${s.number}\\b`, 'i').test(w))) bad.push(`set ${s.number} unplaced with no warning`)
  }
  // a set never starts before the set it waits for has gone off
  for (const s of job.sets) {
    const me = where.get(s.number)
    if (!me || me.done) continue
    for (const w of s.waits ?? []) {
      const it = where.get(w.set)
      if (!it) {
        if (!(loggedOn.has(w.set) && loggedOn.get(w.set)! <= me.day)) bad.push(`set ${s.number} placed but set ${w.set} it waits for is not before it`)
        continue
      }
      if (it.day > me.day) bad.push(`set ${s.number} on ${me.day} before set ${w.set} on ${it.day}`)
      if (it.day === me.day && me.mixAt < it.goneOffAt) bad.push(`set ${s.number} mixed at ${clockTime(me.mixAt)} before set ${w.set} has gone off at ${clockTime(it.goneOffAt)}`)
    }
  }
  const newOrder: number[] = []
  for (const d of plan.days) {
    const fresh = d.sets.filter(s => !s.done)
    if (d.day < TODAY && fresh.length) bad.push(`new sets on the past day ${d.day}`)
    newOrder.push(...fresh.map(s => s.number))
    for (let i = 1; i < fresh.length; i++) if (fresh[i]!.times.mixAt < fresh[i - 1]!.times.mixAt) bad.push(`set ${fresh[i]!.number} mixed before set ${fresh[i - 1]!.number} on ${d.day}`)
    const overrun = new Set(fresh.filter(s => s.overrun).map(s => s.number))
    if (overrun.size && fresh.length > 1) bad.push(`an overrunning set shares ${d.day} with other new sets`)
    for (const n of overrun) if (!d.warnings.some(w => w.startsWith(`Set ${n} `))) bad.push(`set ${n} runs over with no warning`)
    for (const s of d.sets) if (!s.people.length) bad.push(`set ${s.number} has nobody on it`)
    for (const p of d.timeline) {
      // a day never holds more than its hours; half days hold only the first half
      const hours = hoursOf(p.portion, job.timing)
      if (p.from !== hours.from || p.to !== hours.to) bad.push(`${p.name}'s hours on ${d.day} are ${p.from}-${p.to}`)
      for (const b of p.blocks) {
        const done = d.sets.find(s => s.number === b.set)?.done
        if (!done && !overrun.has(b.set) && (b.from < p.from || b.to > p.to)) bad.push(`${p.name} works set ${b.set} ${clockTime(b.from)}-${clockTime(b.to)} outside ${clockTime(p.from)}-${clockTime(p.to)} on ${d.day}`)
        if (p.portion === 'half-day' && !done && !overrun.has(b.set) && b.to > job.timing.dayStartMinutes + Math.floor((job.timing.dayEndMinutes - job.timing.dayStartMinutes) / 2)) bad.push(`${p.name} on a half day works set ${b.set} after midday`)
      }
      // nobody does two things at once
      const sorted = [...p.blocks].sort((x, y) => x.from - y.from)
      for (let i = 1; i < sorted.length; i++) if (sorted[i]!.from < sorted[i - 1]!.to) bad.push(`${p.name} does sets ${sorted[i - 1]!.set} and ${sorted[i]!.set} at once on ${d.day}`)
      // the person's stretches are the sets they are on
      const on = new Set(p.blocks.map(b => b.set))
      const listed = new Set(d.people.find(x => x.userId === p.userId)!.sets)
      if ([...on].sort().join() !== [...listed].sort().join()) bad.push(`${p.name}'s timeline (${[...on]}) is not their sets (${[...listed]}) on ${d.day}`)
    }
  }
  // sets in plan order over the days, and the ones not placed are the last
  if (newOrder.join() !== [...newOrder].sort((x, y) => x - y).join()) bad.push(`sets out of order: ${newOrder.join(' ')}`)
  if (plan.unplaced.length && newOrder.some(n => n > plan.unplaced[0]!)) bad.push('a set placed after one not placed')
  return bad
}

describe('the day plan and its timeline: properties of every plan (seeded random jobs)', () => {
  it('waits, hours, half days, order, nothing left off', () => {
    fc.assert(fc.property(jobArb, (job) => {
      expect(broken(job)).toEqual([])
    }), { numRuns: 800, seed: 16_2 })
  })

  it('the checks catch a broken plan (so the property can fail)', () => {
    const job: Job = { timing: DEFAULTS, booked: [{ day: TODAY, userId: 'k', name: 'Kit', portion: 'day' }, { day: TODAY, userId: 'j', name: 'Jo', portion: 'half-day' }], sets: [{ number: 1, bags: 1 }, { number: 2, bags: 1, waits: [{ set: 1, why: 'test' }] }, { number: 3, bags: 3 }], logged: [] }
    const plan = planOf(job)
    expect(broken(job, plan)).toEqual([])
    const edited = structuredClone(plan)
    const day = edited.days[0]!
    // set 2 mixed while set 1 is still going off
    day.sets[1]!.times.mixAt = day.sets[0]!.times.goneOffAt - 5
    // Jo (half day) kept on into the afternoon; Kit past the end of the day
    day.timeline.find(p => p.name === 'Jo')!.blocks.push({ set: 1, phase: 'trowel-up', from: 800, to: 810, done: false })
    day.timeline.find(p => p.name === 'Kit')!.blocks.push({ set: 3, phase: 'trowel-up', from: 990, to: 1000, done: false })
    // set 3 left off without a word
    day.sets.pop()
    expect(broken(job, edited).join('\n')).toMatch(/set 2 mixed at .* before set 1 has gone off[\s\S]*Jo on a half day works set 1 after midday[\s\S]*Kit works set 3 16:30-16:40 outside/)
    expect(broken(job, edited).join('\n')).toMatch(/set 3: placed false, unplaced false/)
  })
})

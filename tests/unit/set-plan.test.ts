import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import type { PlanCorner, PlanOptions, PlanSurface, SetPlan } from '../../shared/utils/set-plan'
import { PLAN_ACTION_WORDS, PLAN_ACTIONS } from '../../shared/utils/plan-actions'
import { checkPlan, planSets, setLowerBound } from '../../shared/utils/set-plan'
import { randomJob, seeded } from '../support/plan-rooms'

// Sources. The order rules are common practice (../shared/DOMAIN.md, "Planning the sets"): split
// the faces of a difficult internal corner across sets; fill low-suction patches in an earlier set
// than the skim; spread thin tight coats over scrim across earlier sets; skim the face of a
// packed-out bead before its return; keep a set to what the people can lay on and trowel, and keep
// sets even. Areas, coverage per bag and bags per person are invented inputs, not trade figures:
// the arithmetic is written beside each case.

const wall = (id: string, areaM2: number, more: Partial<PlanSurface> = {}): PlanSurface => ({ id, areaM2, ...more })
const dry = (a: string, b: string): PlanCorner => ({ a, b, kind: 'internal', dryCorner: true })
const packed = (face: string, other: string): PlanCorner => ({ a: face, b: other, kind: 'external', packedBead: { face } })

/** Each set as its tasks, "action:surface", in the plan's order. */
const layout = (plan: SetPlan): string[][] => plan.sets.map(s => s.tasks.map(t => `${t.action}:${t.surfaceId}`))
const setOf = (plan: SetPlan, surfaceId: string, action = 'skim'): number[] =>
  plan.sets.filter(s => s.tasks.some(t => t.surfaceId === surfaceId && t.action === action)).map(s => s.number)
const task = (plan: SetPlan, surfaceId: string, action = 'skim') => plan.sets.flatMap(s => s.tasks).find(t => t.surfaceId === surfaceId && t.action === action)!

/**
 * planSets, and the plan has as few sets as the rules allow: exactly the lower bound (our own
 * rule: the longest chain of "must be earlier" steps, or the bags over what one set takes).
 */
function planned(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, labels?: Record<string, string>): SetPlan {
  const plan = planSets(surfaces, corners, options, labels)
  expect(plan.sets.length, 'the plan meets the lower bound').toBe(setLowerBound(surfaces, corners, options))
  return plan
}

describe('planSets: hand-built rooms', () => {
  it('four walls and a ceiling with one difficult internal corner', () => {
    // common practice (DOMAIN.md, Planning the sets): the two faces of a difficult corner go in different sets.
    // At 4 m² a bag: W1 9.6 -> 2.4, W2 7.2 -> 1.8, W3 9.6 -> 2.4, W4 7.2 -> 1.8, ceiling 12 -> 3.0; 11.4 bags in all.
    // 2 people x 4 bags = 8 a set, so at least 2 sets. With W1 and W2 apart, the most even split of 11.4 is
    // {W1, C} = 5.4 against {W2, W3, W4} = 6.0 (W1 + W3 + W4 = 6.6 against 4.8 is worse).
    const plan = planned(
      [wall('W1', 9.6), wall('W2', 7.2), wall('W3', 9.6), wall('W4', 7.2), wall('C', 12)],
      [dry('W1', 'W2'), { a: 'W2', b: 'W3', kind: 'internal' }],
      { people: 2, bagsPerPersonPerSet: 4, coverageM2PerBag: 4 },
    )
    expect(layout(plan)).toEqual([['skim:W2', 'skim:W3', 'skim:W4'], ['skim:W1', 'skim:C']])
    expect(plan.sets.map(s => s.bags)).toEqual([6, 5.4])
    expect(plan.warnings).toEqual([])
    expect(task(plan, 'W1').reason).toBe('Skimmed in set 2 so the corner with W2 (set 1) is against a face that has already set')
    expect(task(plan, 'W2').reason).toBe('Skimmed in set 1, before W1 (set 2), so that difficult corner is not worked with both faces wet')
    expect(task(plan, 'W3').reason).toBe('Fits in set 1 with room to spare (6 of 8 bags)')
    expect(task(plan, 'C').reason).toBe('In set 2 to keep the sets even (5.4 of 8 bags)')
  })

  it('a wall with a patch back to masonry', () => {
    // common practice: the patch is filled a set before the skim so the wall has even suction.
    // 9.6 m² at 4 m² a bag = 2.4 bags; the 0.6 m² patch = 0.15 -> 0.2 bags (half up to one decimal).
    const plan = planned([wall('W', 9.6, { patches: [{ areaM2: 0.6 }] })], [], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['fill:W'], ['skim:W']])
    expect(plan.sets.map(s => s.bags)).toEqual([0.2, 2.4])
    expect(task(plan, 'W', 'fill').reason).toBe('Patch filled in set 1 so the skim over it in set 2 has even suction')
    expect(task(plan, 'W').reason).toBe('Skimmed in set 2, after the patch fill in set 1, so the whole surface has even suction')
  })

  it('a window reveal with a scrimmed gap, beside its window wall', () => {
    // common practice: thin tight coats over the scrim in two earlier sets, then the skim: 3 sets, and no fewer.
    // The window wall (8.4 m² -> 2.1 bags) has no rule on it and goes where the load is lightest.
    const plan = planned([wall('WW', 8.4), wall('R', 0.36, { scrimmedGap: true })], [{ a: 'WW', b: 'R', kind: 'external' }], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 })
    expect(plan.sets).toHaveLength(3)
    expect(setOf(plan, 'R', 'tight-coat')).toEqual([1, 2])
    expect(setOf(plan, 'R')).toEqual([3])
    // 0.36 / 4 = 0.09 -> 0.1 bag
    expect(task(plan, 'R').bags).toBe(0.1)
    expect(plan.sets[0]!.tasks[0]!.reason).toBe('Thin tight coat over the scrimmed gap, 1 of 2, in set 1, to firm up before the skim in set 3')
    expect(task(plan, 'R').reason).toBe('Skimmed in set 3, after the thin tight coats over the scrimmed gap in set 1 and set 2')
  })

  it('a packed-out external bead on a chimney breast', () => {
    // common practice: the face first, so the set plaster holds the bead, then the return in a later set.
    // Face 1.2 x 2.4 = 2.88 m² -> 0.72 -> 0.7 bags; return 0.3 x 2.4 = 0.72 m² -> 0.18 -> 0.2 bags.
    const labels = { CB: 'Chimney breast', CR: 'Chimney return' }
    const plan = planned([wall('CB', 2.88), wall('CR', 0.72)], [packed('CB', 'CR')], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }, labels)
    expect(layout(plan)).toEqual([['skim:CB'], ['skim:CR']])
    expect(task(plan, 'CB').reason).toBe('Face of the packed-out bead, skimmed in set 1 before its return (Chimney return in set 2) so the set plaster holds the bead')
    expect(task(plan, 'CR').reason).toBe('Return of the packed-out bead, skimmed in set 2 after its face (Chimney breast in set 1) so the bead is already held')
  })

  it('a corner that is both difficult and packed out takes both rules', () => {
    // the brief: both apply; the face-before-return order already puts them in different sets
    const plan = planned([wall('F', 4), wall('R', 1)], [{ a: 'R', b: 'F', kind: 'internal', dryCorner: true, packedBead: { face: 'F' } }], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['skim:F'], ['skim:R']])
    expect(checkPlan([wall('F', 4), wall('R', 1)], [{ a: 'R', b: 'F', kind: 'internal', dryCorner: true, packedBead: { face: 'F' } }], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }, plan)).toEqual([])
  })

  it('a ring of four walls with a difficult corner at each needs two sets, not four', () => {
    // common practice: opposite walls can share a set (they share no corner); each wall 8 m² -> 2 bags
    const plan = planned([wall('W1', 8), wall('W2', 8), wall('W3', 8), wall('W4', 8)], [dry('W1', 'W2'), dry('W2', 'W3'), dry('W3', 'W4'), dry('W4', 'W1')], { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['skim:W1', 'skim:W3'], ['skim:W2', 'skim:W4']])
  })

  it('everything in one set when it fits', () => {
    // 8 + 8.8 = 16.8 m² at 4 m² a bag = 2 + 2.2 = 4.2 bags, under 2 x 6 = 12
    const plan = planned([wall('A', 8), wall('B', 8.8)], [], { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['skim:A', 'skim:B']])
    expect(plan.sets[0]!.bags).toBe(4.2)
    expect(task(plan, 'A').reason).toBe('Fits in set 1 with room to spare (4.2 of 12 bags)')
  })

  it('keeps sets even rather than one full and one light', () => {
    // 5 + 1 + 1 + 1 + 1 = 9 bags, 6 a set: 2 sets. First fit would give {5, 1} = 6 and {1, 1, 1} = 3;
    // the even split is {5} = 5 and {1, 1, 1, 1} = 4.
    const plan = planned([wall('A', 20), wall('B', 4), wall('C', 4), wall('D', 4), wall('E', 4)], [], { people: 1, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 })
    expect(plan.sets.map(s => s.bags)).toEqual([5, 4])
  })

  it('splits walls across sets by what the people can lay on', () => {
    // 4 walls x 3 bags = 12, 6 a set: 2 sets of exactly 6
    const plan = planned([wall('A', 12), wall('B', 12), wall('C', 12), wall('D', 12)], [], { people: 1, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 })
    expect(plan.sets.map(s => s.bags)).toEqual([6, 6])
    expect(task(plan, 'A').reason).toBe('Fits in set 1, which it fills (6 of 6 bags)')
  })

  it('gives a skim bigger than a set a set to itself, with a warning', () => {
    // 60 m² at 4 m² a bag = 15 bags, more than 2 x 6 = 12; the other wall (2 bags) goes in a set of its own
    const plan = planned([wall('Big', 60), wall('Small', 8)], [], { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['skim:Big'], ['skim:Small']])
    expect(plan.warnings).toEqual(['Big needs 15 bags, more than 2 people can lay on and trowel in one set (12), so it has a set to itself. Split it at a natural break or bring more hands.'])
    expect(task(plan, 'Big').reason).toBe('On its own in set 1: at 15 bags it is more than 2 people can lay on and trowel in one set (12)')
  })

  it('splits a patch fill bigger than a set into parts, all before the skim', () => {
    // patches 18 + 12 = 30 m² at 4 m² a bag = 7.5 bags, 3 a set: 3 parts of 2.5; the skim (20 m² = 5 bags) is oversized
    const plan = planned([wall('W', 20, { patches: [{ areaM2: 18 }, { areaM2: 12 }] })], [], { people: 1, bagsPerPersonPerSet: 3, coverageM2PerBag: 4 })
    expect(layout(plan)).toEqual([['fill:W'], ['fill:W'], ['fill:W'], ['skim:W']])
    expect(plan.sets.map(s => s.bags)).toEqual([2.5, 2.5, 2.5, 5])
    expect(plan.sets[1]!.tasks[0]!.reason).toBe('Patch fill, part 2 of 3, in set 2 so the skim over it in set 4 has even suction')
  })

  it('adds tenths without floating-point dust', () => {
    // 0.4 m² and 0.8 m² at 4 m² a bag: 0.1 + 0.2 bags, and the set holds 0.3, not 0.30000000000000004
    const plan = planned([wall('A', 0.4), wall('B', 0.8)], [], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 })
    expect(plan.sets[0]!.bags).toBe(0.3)
  })

  it.each([
    // arithmetic: half up at one decimal; 1.05 m² / 1 = 1.05 -> 1.1 (a float 1.05 * 10 is 10.5 exactly, 1.15 * 10 is 11.499999...)
    [1.05, 1, 1.1],
    [1.15, 1, 1.2],
    [1.04, 1, 1],
    [0.04, 1, 0],
    [10, 3, 3.3],
    [5, 3, 1.7],
  ])('a %f m² skim at %f m² a bag is %f bags', (areaM2, coverageM2PerBag, bags) => {
    expect(task(planned([wall('A', areaM2)], [], { people: 1, bagsPerPersonPerSet: 100, coverageM2PerBag }), 'A').bags).toBe(bags)
  })

  it('an empty room plans no sets', () => expect(planned([], [], { people: 1, bagsPerPersonPerSet: 1, coverageM2PerBag: 1 })).toEqual({ sets: [], warnings: [] }))
})

describe('planSets: muddled rooms warn instead of throwing', () => {
  const o: PlanOptions = { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }
  it.each<[string, PlanSurface[], PlanCorner[], string[]]>([
    ['a corner naming an unknown surface is left out', [wall('A', 4)], [dry('A', 'Z')],
      ['A corner between A and Z names Z, which is not one of the surfaces; that corner is left out of the plan.']],
    ['a corner from a surface to itself is left out', [wall('A', 4)], [dry('A', 'A')],
      ['A corner joins A to itself; it is left out of the plan.']],
    ['a repeated surface id keeps the first', [wall('A', 4), wall('A', 8)], [],
      ['Two surfaces share the id A; only the first (4 m²) is planned, the other (8 m²) is left out.']],
    ['a packed bead whose face is neither surface is planned as not packed', [wall('A', 4), wall('B', 4)], [{ a: 'A', b: 'B', kind: 'external', packedBead: { face: 'C' } }],
      ['The packed-out bead between A and B gives its face as C, which is neither of them; it is planned as if the bead were not packed out.']],
    // from memory: a circle of packed beads cannot all be done face first, so the one that closes the circle is dropped
    ['a circle of packed beads is broken at the corner that closes it', [wall('A', 4), wall('B', 4), wall('C', 4)], [packed('A', 'B'), packed('B', 'C'), packed('C', 'A')],
      ['The packed-out bead between C and A would have C skimmed before A, but other packed-out beads already put A first: the beads go round in a circle, so this one is planned as if it were not packed out. Check the order on site.']],
  ])('%s', (_what, surfaces, corners, warnings) => {
    const plan = planned(surfaces, corners, o)
    expect(plan.warnings).toEqual(warnings)
    expect(checkPlan(surfaces, corners, o, plan)).toEqual([])
  })

  it('the circle: A before B before C', () => {
    const plan = planned([wall('A', 4), wall('B', 4), wall('C', 4)], [packed('A', 'B'), packed('B', 'C'), packed('C', 'A')], o)
    expect(layout(plan)).toEqual([['skim:A'], ['skim:B'], ['skim:C']])
  })
})

describe('planSets: bad numbers throw, naming the field', () => {
  const o: PlanOptions = { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 }
  it.each<[string, PlanSurface[], PlanOptions, RegExp]>([
    ['a negative area', [wall('A', -1)], o, /surfaces\[0\]\.areaM2/],
    ['an area that is not a number', [wall('A', Number.NaN)], o, /surfaces\[0\]\.areaM2/],
    ['an infinite area', [wall('A', 1), wall('B', Number.POSITIVE_INFINITY)], o, /surfaces\[1\]\.areaM2/],
    ['a negative patch', [wall('A', 1, { patches: [{ areaM2: 0.1 }, { areaM2: -0.1 }] })], o, /surfaces\[0\]\.patches\[1\]\.areaM2/],
    ['no people', [wall('A', 1)], { ...o, people: 0 }, /people/],
    ['half a person', [wall('A', 1)], { ...o, people: 1.5 }, /people/],
    ['people not a number', [wall('A', 1)], { ...o, people: Number.NaN }, /people/],
    ['no bags a person', [wall('A', 1)], { ...o, bagsPerPersonPerSet: 0 }, /bagsPerPersonPerSet/],
    ['negative bags a person', [wall('A', 1)], { ...o, bagsPerPersonPerSet: -2 }, /bagsPerPersonPerSet/],
    ['infinite bags a person', [wall('A', 1)], { ...o, bagsPerPersonPerSet: Number.POSITIVE_INFINITY }, /bagsPerPersonPerSet/],
    ['less than a tenth of a bag a set', [wall('A', 1)], { ...o, people: 1, bagsPerPersonPerSet: 0.05 }, /bagsPerPersonPerSet/],
    ['no coverage', [wall('A', 1)], { ...o, coverageM2PerBag: 0 }, /coverageM2PerBag/],
    ['negative coverage', [wall('A', 1)], { ...o, coverageM2PerBag: -4 }, /coverageM2PerBag/],
    ['coverage not a number', [wall('A', 1)], { ...o, coverageM2PerBag: Number.NaN }, /coverageM2PerBag/],
  ])('%s', (_what, surfaces, options, field) => {
    expect(() => planSets(surfaces, [], options)).toThrow(field)
    expect(() => planSets(surfaces, [], options)).toThrow(Error)
  })
})

describe('planSets: ceilings before walls (the firm\'s rule, on unless false)', () => {
  // Sources. Common practice (issue 16, DOMAIN.md "Planning the sets"): a ceiling skimmed after the
  // walls drops plaster on finished walls, so most plasterers do each room's ceiling first. Our own
  // rule for how it fits the others: no later than every other surface of its room (the same set is
  // fine, the ceiling listed first), unless a rule that must hold (a packed-out bead) orders it the
  // other way; then that rule wins and a warning says so. Areas and bags are invented inputs.
  const room = 'Front bedroom'
  const w = (id: string, areaM2: number, more: Partial<PlanSurface> = {}): PlanSurface => ({ id, areaM2, kind: 'wall', room, ...more })
  const c = (id: string, areaM2: number, more: Partial<PlanSurface> = {}): PlanSurface => ({ id, areaM2, kind: 'ceiling', room, ...more })
  const one: PlanOptions = { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }
  const fourWalls = [w('W1', 9.6), w('W2', 7.2), w('W3', 9.6), w('W4', 7.2), c('C', 12)]
  const twoByFour: PlanOptions = { people: 2, bagsPerPersonPerSet: 4, coverageM2PerBag: 4 }

  it.each<[string, PlanSurface[], PlanCorner[], PlanOptions, string[][], Record<string, string>, string[]]>([
    // common practice: with the rule the ceiling goes in set 1 with the walls it fits beside (W1 and W2 kept apart
    // by their difficult corner); 12 m² at 4 m² a bag = 3 bags, + W2 1.8 + W4 1.8 = 6.6 against W1 + W3 = 4.8
    ['the four walls and ceiling of the first hand-built room', fourWalls, [dry('W1', 'W2')], twoByFour,
      [['skim:C', 'skim:W2', 'skim:W4'], ['skim:W1', 'skim:W3']],
      { C: 'Ceiling first in set 1, before the walls of Front bedroom, so plaster dropped from it lands on walls not yet skimmed' }, []],
    // our own rule: off, the planner only keeps the sets even, and the ceiling may end up last
    ['the same room with the rule off', fourWalls, [dry('W1', 'W2')], { ...twoByFour, ceilingsFirst: false },
      [['skim:W2', 'skim:W3', 'skim:W4'], ['skim:W1', 'skim:C']],
      { C: 'In set 2 to keep the sets even (5.4 of 8 bags)' }, []],
    // common practice: in one set the ceiling is listed (and done) first, whatever order the surfaces came in
    ['one set: the ceiling first', [w('W1', 8), c('C', 8)], [], one, [['skim:C', 'skim:W1']],
      { C: 'Ceiling first in set 1, before the walls of Front bedroom, so plaster dropped from it lands on walls not yet skimmed' }, []],
    // common practice: a patch in the ceiling is filled first; the walls wait for the ceiling's skim, not for its fill
    ['a ceiling with a patch: its fill, then the ceiling with the walls', [w('W1', 8), c('C', 8, { patches: [{ areaM2: 1 }] })], [], one,
      [['fill:C'], ['skim:C', 'skim:W1']],
      { C: 'Skimmed in set 2, after the patch fill in set 1, so the whole surface has even suction; Ceiling first in set 2, before the walls of Front bedroom, so plaster dropped from it lands on walls not yet skimmed' }, []],
    // common practice for the corner (DOMAIN.md): its two faces in different sets, so the ceiling goes earlier
    ['a difficult corner between the ceiling and a wall', [w('W1', 8), c('C', 8)], [{ a: 'W1', b: 'C', kind: 'internal', dryCorner: true }], one,
      [['skim:C'], ['skim:W1']],
      { C: 'Skimmed in set 1, before W1 (set 2), so that difficult corner is not worked with both faces wet; Ceiling in set 1, before the walls of Front bedroom, so plaster dropped from it lands on walls not yet skimmed' }, []],
    // common practice (DOMAIN.md): the face of a packed-out bead before its return; it must hold, so it wins
    ['a packed-out bead with the wall as its face: the hard rule wins', [w('W1', 8), c('C', 8), w('W2', 8)], [{ a: 'W1', b: 'C', kind: 'external', packedBead: { face: 'W1' } }], one,
      [['skim:W1'], ['skim:C', 'skim:W2']],
      { C: 'Return of the packed-out bead, skimmed in set 2 after its face (W1 in set 1) so the bead is already held; Ceiling first in set 2, before the other walls of Front bedroom, so plaster dropped from it lands on walls not yet skimmed; Not before W1: packed-out beads need that surface skimmed first, and that rule wins over ceilings first' },
      ['C cannot go before W1 (Front bedroom) as the firm\'s ceilings-first rule says: packed-out beads need that surface skimmed first, and that rule wins. Cover the finished surface below while the ceiling is skimmed.']],
    // our own rule: room by room; a 40 m² ceiling (10 bags, a full set) does not hold back the hall's wall, only its own room's
    ['room by room', [w('H1', 8, { room: 'Hall' }), c('C', 40), w('W1', 8)], [], one, [['skim:C'], ['skim:H1', 'skim:W1']], {}, []],
    // our own rule: surfaces with no room are one room
    ['surfaces with no room count as one room', [{ id: 'W1', areaM2: 8, kind: 'wall' }, { id: 'C', areaM2: 8, kind: 'ceiling' }], [], { people: 1, bagsPerPersonPerSet: 2, coverageM2PerBag: 4 },
      [['skim:C'], ['skim:W1']],
      { C: 'Ceiling in set 1, before the walls, so plaster dropped from it lands on walls not yet skimmed' }, []],
  ])('%s', (_what, surfaces, corners, options, sets, reasons, warnings) => {
    const plan = planned(surfaces, corners, options)
    expect(layout(plan)).toEqual(sets)
    for (const [id, reason] of Object.entries(reasons)) expect(task(plan, id).reason).toBe(reason)
    expect(plan.warnings).toEqual(warnings)
    expect(checkPlan(surfaces, corners, options, plan)).toEqual([])
  })

  it('checkPlan says when a ceiling is moved after a wall of its room, and only when the rule is on', () => {
    // common practice (as above); our own words. 8 m² at 4 m² a bag = 2 bags each, one set of 10 holds both
    const surfaces = [w('W1', 8), c('C', 8)]
    const labels = { W1: 'Front bedroom · Wall 1', C: 'Front bedroom · Ceiling' }
    const plan = planned(surfaces, [], one, labels)
    const after: SetPlan = { ...plan, sets: [{ number: 1, tasks: [task(plan, 'W1')], bags: 2 }, { number: 2, tasks: [task(plan, 'C')], bags: 2 }] }
    expect(checkPlan(surfaces, [], one, after, labels)).toEqual(['Front bedroom · Ceiling is skimmed in set 2, after Front bedroom · Wall 1 (set 1): the firm does ceilings before the walls of Front bedroom, so plaster dropped from the ceiling does not mark a finished wall.'])
    expect(checkPlan(surfaces, [], { ...one, ceilingsFirst: false }, after, labels)).toEqual([])
    // the same set is no later: nothing to say
    expect(checkPlan(surfaces, [], one, { ...plan, sets: [{ number: 1, tasks: [task(plan, 'W1'), task(plan, 'C')], bags: 4 }] }, labels)).toEqual([])
  })

  it('on random jobs of rooms, every ceiling is no later than the walls of its room unless a packed-out bead overrules it', () => {
    const rand = seeded(1605)
    for (let i = 0; i < 200; i++) {
      const job = randomJob(rand)
      const plan = planSets(job.surfaces, job.corners, job.options, job.labels)
      const at = new Map(plan.sets.flatMap(s => s.tasks.filter(t => t.action === 'skim').map(t => [t.surfaceId, s.number] as const)))
      for (const ceiling of job.surfaces.filter(s => s.kind === 'ceiling')) {
        for (const other of job.surfaces.filter(s => s.room === ceiling.room && s.kind !== 'ceiling')) {
          if (job.options.ceilingsFirst === false || at.get(ceiling.id)! <= at.get(other.id)!) continue
          // only a packed-out bead may put a wall first, and then the warning names both
          expect(plan.warnings.some(x => x.includes(job.labels[ceiling.id]!) && x.includes(job.labels[other.id]!) && x.includes('packed-out beads'))).toBe(true)
        }
        const set = plan.sets.find(s => s.tasks.some(t => t.surfaceId === ceiling.id && t.action === 'skim'))!
        if (job.options.ceilingsFirst !== false) expect(set.tasks.findIndex(t => t.surfaceId === ceiling.id) <= set.tasks.findIndex(t => t.surfaceId !== ceiling.id && job.surfaces.find(s => s.id === t.surfaceId)?.kind !== 'ceiling') || set.tasks.every(t => t.surfaceId === ceiling.id || job.surfaces.find(s => s.id === t.surfaceId)?.kind === 'ceiling')).toBe(true)
      }
    }
  })
})

describe('setLowerBound: the fewest sets the rules allow (our own rule)', () => {
  it.each<[string, PlanSurface[], PlanCorner[], PlanOptions, number]>([
    // nothing to plan
    ['no surfaces', [], [], { people: 1, bagsPerPersonPerSet: 1, coverageM2PerBag: 1 }, 0],
    // bags: 4 walls x 3 bags = 12 over 6 a set = 2
    ['bags over one set', [wall('A', 12), wall('B', 12), wall('C', 12), wall('D', 12)], [], { people: 1, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 }, 2],
    // bags, counted as bin packing does: three walls of 1.2 bags (4.8 m² at 4 m² a bag) cannot share sets of 2 bags: 3, not ceil(3.6 / 2) = 2
    ['walls of more than half a set each need one', [wall('A', 4.8), wall('B', 4.8), wall('C', 4.8)], [], { people: 1, bagsPerPersonPerSet: 2, coverageM2PerBag: 4 }, 3],
    // an oversized skim counts a set of its own: 15 bags alone + 2 bags = 2
    ['an oversized skim has a set to itself', [wall('Big', 60), wall('Small', 8)], [], { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 }, 2],
    // the chain: two tight coats and the skim = 3 sets, however few bags
    ['a chain of must-be-earlier steps', [wall('R', 0.4, { scrimmedGap: true })], [], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }, 3],
    // a difficult corner is a step one way or the other: 2 sets, though 4 bags fit in one
    ['a difficult corner', [wall('A', 8), wall('B', 8)], [dry('A', 'B')], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }, 2],
    // a fill, then the ceiling, then a wall's packed-out return: ceiling first adds no set of its own, but
    // carries the chain: fill (1) -> ceiling (2) <= wall face (2) -> its return (3)
    ['ceilings first carries a chain', [wall('C', 8, { kind: 'ceiling', room: 'R', patches: [{ areaM2: 1 }] }), wall('F', 8, { room: 'R' }), wall('S', 2, { room: 'R' })], [packed('F', 'S')], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }, 3],
    ['the same with the rule off', [wall('C', 8, { kind: 'ceiling', room: 'R', patches: [{ areaM2: 1 }] }), wall('F', 8, { room: 'R' }), wall('S', 2, { room: 'R' })], [packed('F', 'S')], { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4, ceilingsFirst: false }, 2],
  ])('%s: %i', (_what, surfaces, corners, options, bound) => {
    expect(setLowerBound(surfaces, corners, options)).toBe(bound)
    expect(planned(surfaces, corners, options).sets).toHaveLength(bound)
  })

  it('throws like planSets for a bad number', () => {
    expect(() => setLowerBound([wall('A', -1)], [], { people: 1, bagsPerPersonPerSet: 1, coverageM2PerBag: 1 })).toThrow(/surfaces\[0\]\.areaM2/)
  })

  it('on 1,000 random jobs of rooms the planner is never below the bound (it is one) and never more than one set above it', () => {
    // seeded (tests/support/plan-rooms.ts), so a failure can be repeated
    const rand = seeded(16)
    let met = 0
    for (let i = 0; i < 1000; i++) {
      const job = randomJob(rand)
      const plan = planSets(job.surfaces, job.corners, job.options)
      const bound = setLowerBound(job.surfaces, job.corners, job.options)
      // the plan keeps every rule (only an oversized skim or a packed-out bead over ceilings first may warn)
      for (const w of checkPlan(job.surfaces, job.corners, job.options, plan)) expect(w).toContain('a set to itself')
      expect(plan.sets.length).toBeGreaterThanOrEqual(bound)
      expect(plan.sets.length - bound, `job ${i}`).toBeLessThanOrEqual(1)
      if (plan.sets.length === bound) met += 1
    }
    // the figure the benchmark prints; here only that the bound is met most of the time
    expect(met).toBeGreaterThan(800)
  }, 60_000)
})

describe('plan actions for the screens', () => {
  it('has words for every action', () => {
    expect(PLAN_ACTION_WORDS).toEqual({ 'fill': 'Fill', 'undercoat': 'Undercoat', 'tight-coat': 'Tight coat', 'skim': 'Skim' })
    expect(Object.keys(PLAN_ACTION_WORDS).sort()).toEqual([...PLAN_ACTIONS].sort())
  })
})

describe('planSets: fill and undercoat bags from the take-off', () => {
  const o: PlanOptions = { people: 1, bagsPerPersonPerSet: 10, coverageM2PerBag: 4 }
  it('takes the fill bags given, rounded up to tenths, instead of the patches at the skim\'s coverage', () => {
    // the quote's undercoat for the patch: 0.61 bag -> 0.7 in the plan (the patch at skim coverage would be 0.5 / 4 = 0.125 -> 0.1)
    const surfaces = [wall('W', 9.6, { patches: [{ areaM2: 0.5 }], fillBags: 0.61 })]
    const plan = planned(surfaces, [], o)
    expect(layout(plan)).toEqual([['fill:W'], ['skim:W']])
    expect(task(plan, 'W', 'fill').bags).toBe(0.7)
    expect(checkPlan(surfaces, [], o, plan)).toEqual([])
  })

  it('plans an undercoat over the whole surface in an earlier set than its skim', () => {
    // back to masonry all over: 3.5 bags of undercoat (take-off), split in two as one person lays on 2 bags a set
    const surfaces = [wall('W', 8, { undercoatBags: 3.5 })]
    const options = { people: 1, bagsPerPersonPerSet: 2, coverageM2PerBag: 4 }
    const plan = planned(surfaces, [], options)
    expect(layout(plan)).toEqual([['undercoat:W'], ['undercoat:W'], ['skim:W']])
    expect(plan.sets.map(s => s.bags)).toEqual([1.8, 1.7, 2])
    expect(plan.sets[0]!.tasks[0]!.reason).toBe('Undercoat over the whole surface, part 1 of 2, in set 1, to firm up before the skim over it in set 3')
    expect(task(plan, 'W').reason).toBe('Skimmed in set 3, after the undercoat over the whole surface in set 1 and set 2')
    expect(checkPlan(surfaces, [], options, plan)).toEqual([])
    // moved after its skim, checkPlan says so
    const moved: SetPlan = { ...plan, sets: [plan.sets[0]!, { ...plan.sets[2]!, number: 2 }, { ...plan.sets[1]!, number: 3 }] }
    expect(checkPlan(surfaces, [], options, moved)).toEqual(['The undercoat for W in set 3 is not before its skim in set 2.'])
  })

  it('bad fill or undercoat bags throw, naming the field', () => {
    expect(() => planSets([wall('W', 1, { fillBags: -1 })], [], o)).toThrow(/surfaces\[0\]\.fillBags/)
    expect(() => planSets([wall('W', 1, { undercoatBags: Number.NaN })], [], o)).toThrow(/surfaces\[0\]\.undercoatBags/)
  })
})

describe('checkPlan: after a surface is moved by hand', () => {
  const o: PlanOptions = { people: 2, bagsPerPersonPerSet: 6, coverageM2PerBag: 4 }
  const labels = { A: 'Wall A', B: 'Wall B', R: 'Reveal' }

  /** Moves every task of `action` on a surface into set `to` (1-based), keeping the bags right. */
  function move(plan: SetPlan, surfaceId: string, to: number, action = 'skim'): SetPlan {
    const moved = plan.sets.flatMap(s => s.tasks).filter(t => t.surfaceId === surfaceId && t.action === action)
    const sets = plan.sets.map(s => ({ ...s, tasks: s.tasks.filter(t => !moved.includes(t)) }))
    sets[to - 1]!.tasks.push(...moved)
    for (const s of sets) s.bags = s.tasks.reduce((n, t) => n + Math.round(t.bags * 10), 0) / 10
    return { ...plan, sets }
  }

  it('says when a difficult corner ends up in one set', () => {
    const surfaces = [wall('A', 8), wall('B', 8)]
    const plan = planSets(surfaces, [dry('A', 'B')], o, labels)
    expect(checkPlan(surfaces, [dry('A', 'B')], o, plan, labels)).toEqual([])
    const same = move(plan, 'B', setOf(plan, 'A')[0]!)
    expect(checkPlan(surfaces, [dry('A', 'B')], o, same, labels)).toContain('Wall A and Wall B share a difficult corner but are skimmed in the same set (1).')
  })

  it('says when a set is more than the people can lay on', () => {
    // 3 walls of 4.8 bags (19.2 m² at 4 m² a bag): two fit in a set of 2 x 6 = 12, all three (14.4) do not
    const surfaces = [wall('A', 19.2), wall('B', 19.2), wall('C', 19.2)]
    let plan = planSets(surfaces, [], o)
    expect(plan.sets.map(s => s.bags)).toEqual([9.6, 4.8])
    expect(checkPlan(surfaces, [], o, plan)).toEqual([])
    plan = move(move(move(plan, 'A', 1), 'B', 1), 'C', 1)
    expect(checkPlan(surfaces, [], o, plan)).toEqual([
      'Set 1 holds 14.4 bags, more than 2 people can lay on and trowel (12).',
      'Set 2 is empty.',
    ])
  })

  it('says when a fill, a tight coat or a face is moved after the skim', () => {
    const surfaces = [wall('A', 8, { patches: [{ areaM2: 1 }] }), wall('R', 0.4, { scrimmedGap: true }), wall('B', 2)]
    const corners = [packed('A', 'B')]
    const plan = planSets(surfaces, corners, o, labels)
    expect(checkPlan(surfaces, corners, o, plan, labels)).toEqual([])
    const last = plan.sets.length
    expect(checkPlan(surfaces, corners, o, move(plan, 'A', last, 'fill'), labels)).toContain(`The patch fill for Wall A in set ${last} is not before its skim in set ${setOf(plan, 'A')[0]}.`)
    const coats = move(plan, 'R', setOf(plan, 'R')[0]!, 'tight-coat')
    expect(checkPlan(surfaces, corners, o, coats, labels)).toContain(`Reveal has a scrimmed gap but thin tight coats in no set before its skim in set ${setOf(plan, 'R')[0]}; it needs them in at least 2 earlier sets.`)
    const face = move(plan, 'A', setOf(plan, 'B')[0]!)
    expect(checkPlan(surfaces, corners, o, face, labels).join(' ')).toContain('Wall A is the face of a packed-out bead and should be skimmed before its return, Wall B')
  })

  it('says when a surface is missing, doubled, or its bags are wrong', () => {
    const surfaces = [wall('A', 8), wall('B', 8)]
    const plan = planSets(surfaces, [], o, labels)
    const s = plan.sets[0]!
    const doubled: SetPlan = { ...plan, sets: [{ ...s, tasks: [s.tasks[0]!, { ...s.tasks[0]!, bags: 3 }], bags: 5 }] }
    expect(checkPlan(surfaces, [], o, doubled, labels)).toEqual([
      'Wall A is skimmed 2 times (set 1); it should be skimmed once.',
      'Wall B is not skimmed in any set.',
    ])
    const wrong: SetPlan = { ...plan, sets: [{ ...s, bags: 9 }] }
    expect(checkPlan(surfaces, [], o, wrong, labels)).toEqual(['Set 1 says 9 bags but its tasks add up to 4.'])
  })
})

// ---------------------------------------------------------------------------------------------
// Properties: random rooms, including muddled ones, and every invariant on every plan.

const IDS = Array.from({ length: 12 }, (_, i) => `W${i + 1}`)
const tenthsOf = (bags: number): number => Math.round(bags * 10)
const oneDecimal = (bags: number): boolean => bags === tenthsOf(bags) / 10 && /^\d+(\.\d)?$/.test(String(bags))
/** Half up to tenths of a bag, in integers: cm² over (coverage in tenths); tenths = A / (100 C). */
const tenthsFor = (cm2: number, coverageTenths: number): number => Math.floor((2 * cm2 + 100 * coverageTenths) / (200 * coverageTenths))
const mentions = (text: string, id: string): boolean => new RegExp(`\\b${id}\\b`).test(text)

const surfaceArb = fc.record({
  id: fc.constantFrom(...IDS),
  cm2: fc.oneof({ weight: 9, arbitrary: fc.integer({ min: 0, max: 400_000 }) }, { weight: 1, arbitrary: fc.integer({ min: 400_000, max: 3_000_000 }) }),
  patches: fc.option(fc.array(fc.integer({ min: 0, max: 80_000 }), { maxLength: 3 }), { nil: undefined }),
  scrimmedGap: fc.option(fc.boolean(), { nil: undefined }),
}).map(({ id, cm2, patches, scrimmedGap }): PlanSurface => ({ id, areaM2: cm2 / 10_000, patches: patches?.map(p => ({ areaM2: p / 10_000 })), scrimmedGap }))

/** Corners between the given ids: a known id mostly, now and then one that is not a surface. */
const cornersOf = (known: string[]) => {
  const unknown = fc.constantFrom('X1', 'X2')
  const id = known.length ? fc.oneof({ weight: 8, arbitrary: fc.constantFrom(...known) }, { weight: 1, arbitrary: unknown }) : unknown
  return fc.record({
    a: id,
    b: id,
    kind: fc.constantFrom('internal' as const, 'external' as const),
    dryCorner: fc.boolean(),
    face: fc.constantFrom('none', 'none', 'a', 'b', 'a', 'b', 'other'),
  }).map(({ a, b, kind, dryCorner, face }): PlanCorner => ({
    a, b, kind, dryCorner,
    packedBead: face === 'none' ? undefined : { face: face === 'a' ? a : face === 'b' ? b : 'X3' },
  }))
}

const optionsArb = fc.record({
  people: fc.integer({ min: 1, max: 4 }),
  bagsPerPersonPerSet: fc.oneof(
    { weight: 3, arbitrary: fc.integer({ min: 10, max: 100 }).map(t => t / 10) },
    { weight: 1, arbitrary: fc.integer({ min: 1, max: 10 }).map(t => t / 10) },
    { weight: 1, arbitrary: fc.double({ min: 0.1, max: 20, noNaN: true }) },
  ),
  coverageM2PerBag: fc.oneof(
    { weight: 4, arbitrary: fc.integer({ min: 20, max: 100 }).map(t => t / 10) },
    { weight: 1, arbitrary: fc.integer({ min: 5, max: 20 }).map(t => t / 10) },
  ),
})

const roomArb = fc.array(surfaceArb, { maxLength: 10 }).chain(surfaces => fc.record({
  surfaces: fc.constant(surfaces),
  corners: fc.array(cornersOf(surfaces.map(s => s.id)), { maxLength: 14 }),
  options: optionsArb,
}))

interface Room { surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions }

/** Every invariant of the brief, worked out here independently of the planner; the broken ones in words. */
function broken({ surfaces, corners, options: o }: Room, plan: SetPlan): string[] {
  const bad: string[] = []
  const first = new Map<string, PlanSurface>()
  for (const s of surfaces) if (!first.has(s.id)) first.set(s.id, s)
  const cap = o.people * o.bagsPerPersonPerSet
  const coverageTenths = Math.round(o.coverageM2PerBag * 10)
  const skims = new Map<string, { set: number, bags: number, reason: string }[]>()
  const fills = new Map<string, { set: number, bags: number }[]>()
  const coats = new Map<string, number[]>()
  const push = <T>(m: Map<string, T[]>, k: string, v: T) => m.set(k, [...(m.get(k) ?? []), v])

  plan.sets.forEach((set, i) => {
    if (set.number !== i + 1) bad.push(`set ${i + 1} is numbered ${set.number}`)
    if (set.tasks.length === 0) bad.push(`set ${set.number} is empty`)
    if (!oneDecimal(set.bags)) bad.push(`set ${set.number} bags ${set.bags} not one decimal`)
    const sum = set.tasks.reduce((n, t) => n + tenthsOf(t.bags), 0)
    if (tenthsOf(set.bags) !== sum) bad.push(`set ${set.number} bags ${set.bags} is not the sum ${sum / 10}`)
    if (set.bags > cap + 1e-9) {
      const only = set.tasks.length === 1 && set.tasks[0]!.action === 'skim' ? set.tasks[0]! : null
      if (!only || only.bags <= cap + 1e-9) bad.push(`set ${set.number} holds ${set.bags} over ${cap}`)
      else if (!plan.warnings.some(w => mentions(w, only.surfaceId) && w.includes('a set to itself'))) bad.push(`no warning for oversized ${only.surfaceId}`)
    }
    for (const t of set.tasks) {
      if (!first.has(t.surfaceId)) bad.push(`task for unknown ${t.surfaceId}`)
      if (!oneDecimal(t.bags)) bad.push(`task bags ${t.bags} not one decimal`)
      if (!new RegExp(`\\bset ${set.number}\\b`).test(t.reason)) bad.push(`reason "${t.reason}" does not name set ${set.number}`)
      // and says why (common practice, DOMAIN.md): a fill evens the suction of a patch; a tight coat is over scrim
      if (t.action === 'fill' && !(/patch/i.test(t.reason) && /suction/i.test(t.reason))) bad.push(`fill reason "${t.reason}" does not say patch and suction`)
      if (t.action === 'tight-coat' && !/scrim/i.test(t.reason)) bad.push(`tight-coat reason "${t.reason}" does not say scrim`)
      if (t.action === 'skim') push(skims, t.surfaceId, { set: set.number, bags: t.bags, reason: t.reason })
      else if (t.action === 'fill') push(fills, t.surfaceId, { set: set.number, bags: t.bags })
      else if (t.action === 'tight-coat') push(coats, t.surfaceId, set.number)
      else bad.push(`unknown action ${String(t.action)}`)
    }
  })

  const skimSet = new Map<string, number>()
  for (const [id, s] of first) {
    const found = skims.get(id) ?? []
    if (found.length !== 1) {
      bad.push(`${id} skimmed ${found.length} times`)
      continue
    }
    const skim = found[0]!
    skimSet.set(id, skim.set)
    const cm2 = Math.round(s.areaM2 * 10_000)
    if (tenthsOf(skim.bags) !== tenthsFor(cm2, coverageTenths)) bad.push(`${id} skim ${skim.bags} bags, expected ${tenthsFor(cm2, coverageTenths) / 10}`)
    // a skim after a fill says so; after tight coats, says so (common practice, DOMAIN.md: why it waits)
    if (s.patches?.length && !/patch fill/i.test(skim.reason)) bad.push(`${id} skim reason "${skim.reason}" does not mention its fill`)
    if (s.scrimmedGap && !/tight coats? over the scrimmed gap/i.test(skim.reason)) bad.push(`${id} skim reason "${skim.reason}" does not mention its tight coats`)
    if (s.patches?.length) {
      const f = fills.get(id) ?? []
      if (!f.length) bad.push(`${id} has patches but no fill`)
      if (f.some(x => x.set >= skim.set)) bad.push(`${id} fill not before its skim`)
      const patchCm2 = s.patches.reduce((n, p) => n + Math.round(p.areaM2 * 10_000), 0)
      const want = Math.max(1, tenthsFor(patchCm2, coverageTenths))
      if (f.reduce((n, x) => n + tenthsOf(x.bags), 0) !== want) bad.push(`${id} fill bags not ${want / 10}`)
    }
    else if (fills.has(id)) {
      bad.push(`${id} has a fill but no patches`)
    }
    if (s.scrimmedGap) {
      const c = coats.get(id) ?? []
      if (new Set(c).size < 2) bad.push(`${id} tight coats in ${new Set(c).size} sets`)
      if (c.some(x => x >= skim.set)) bad.push(`${id} tight coat not before its skim`)
    }
    else if (coats.has(id)) {
      bad.push(`${id} has tight coats but no gap`)
    }
    if (tenthsOf(skim.bags) > Math.floor(cap * 10 + 1e-6) && !plan.warnings.some(w => mentions(w, id) && w.includes('a set to itself'))) bad.push(`no warning for oversized ${id}`)
  }

  // corners: the muddled ones warn; the sound ones hold
  const edges: [string, string][] = []
  for (const c of corners) {
    if (!first.has(c.a) || !first.has(c.b)) {
      const unknown = [c.a, c.b].find(id => !first.has(id))!
      if (!plan.warnings.some(w => /not (one of|among) the surfaces/.test(w) && mentions(w, unknown))) bad.push(`no warning for unknown ${unknown}`)
      continue
    }
    if (c.a === c.b) {
      if (!plan.warnings.some(w => w.includes(`joins ${c.a} to itself`))) bad.push(`no warning for ${c.a} to itself`)
      continue
    }
    const sa = skimSet.get(c.a)
    const sb = skimSet.get(c.b)
    if (sa === undefined || sb === undefined) continue
    if (c.dryCorner) {
      if (sa === sb) bad.push(`difficult corner ${c.a}/${c.b} both in set ${sa}`)
      const ra = skims.get(c.a)![0]!.reason
      const rb = skims.get(c.b)![0]!.reason
      if (!mentions(ra, c.b) || !mentions(rb, c.a)) bad.push(`reasons for ${c.a}/${c.b} do not name each other`)
      // why: a difficult corner is worked against a set face (or, where the pair is also a packed bead, the bead says it)
      if (!/corner|packed-out bead/.test(ra) || !/corner|packed-out bead/.test(rb)) bad.push(`reasons for ${c.a}/${c.b} do not say corner`)
    }
    if (c.packedBead) {
      if (c.packedBead.face !== c.a && c.packedBead.face !== c.b) {
        if (!plan.warnings.some(w => w.includes('neither of them'))) bad.push(`no warning for a face that is neither`)
        continue
      }
      edges.push(c.packedBead.face === c.a ? [c.a, c.b] : [c.b, c.a])
    }
  }
  // the packed beads: with no circle every face is before its return; with one, a warning, and each
  // bead either holds or is named in that warning
  const after = new Map<string, string[]>()
  for (const [f, r] of edges) push(after, f, r)
  const state = new Map<string, number>()
  const cyclic = (x: string): boolean => {
    state.set(x, 1)
    for (const y of after.get(x) ?? []) {
      if (state.get(y) === 1 || (!state.has(y) && cyclic(y))) return true
    }
    state.set(x, 2)
    return false
  }
  const hasCircle = [...after.keys()].some(x => !state.has(x) && cyclic(x))
  const circleWarnings = plan.warnings.filter(w => w.includes('round in a circle'))
  if (hasCircle !== (circleWarnings.length > 0)) bad.push(`circle ${hasCircle} but ${circleWarnings.length} circle warnings`)
  // the face and the return of a bead that is planned (not one dropped from a circle, which names
  // both in its warning) say why: the face before the return so the set plaster holds the bead
  for (const [f, r] of edges) {
    if (circleWarnings.some(w => mentions(w, f) && mentions(w, r))) continue
    const rf = skims.get(f)?.[0]?.reason ?? ''
    const rr = skims.get(r)?.[0]?.reason ?? ''
    if (!/Face of the packed-out bead/.test(rf) || !mentions(rf, r)) bad.push(`face ${f} reason "${rf}" does not give the bead and its return ${r}`)
    if (!/Return of the packed-out bead/.test(rr) || !mentions(rr, f)) bad.push(`return ${r} reason "${rr}" does not give the bead and its face ${f}`)
  }
  for (const [f, r] of edges) {
    if (skimSet.get(f)! < skimSet.get(r)!) continue
    if (!hasCircle || !circleWarnings.some(w => mentions(w, f) && mentions(w, r))) bad.push(`face ${f} not before return ${r}`)
  }
  if (surfaces.length !== first.size && !plan.warnings.some(w => w.includes('share the id'))) bad.push('no warning for a repeated id')
  return bad
}

/** The plan's sets could not be fewer by merging two neighbours: each pair is too big together, or a rule keeps them apart. */
function mergeable({ surfaces, corners, options: o }: Room, plan: SetPlan): string[] {
  const ids = new Set(surfaces.map(s => s.id))
  const capTenths = Math.floor(o.people * o.bagsPerPersonPerSet * 10 + 1e-6)
  const out: string[] = []
  for (let i = 0; i + 1 < plan.sets.length; i++) {
    const x = plan.sets[i]!
    const y = plan.sets[i + 1]!
    if (tenthsOf(x.bags) + tenthsOf(y.bags) > capTenths) continue
    const inX = new Set(x.tasks.map(t => t.surfaceId))
    const inY = new Set(y.tasks.map(t => t.surfaceId))
    if ([...inX].some(id => inY.has(id))) continue
    const skX = new Set(x.tasks.filter(t => t.action === 'skim').map(t => t.surfaceId))
    const skY = new Set(y.tasks.filter(t => t.action === 'skim').map(t => t.surfaceId))
    const apart = corners.some(c => ids.has(c.a) && ids.has(c.b) && (c.dryCorner || c.packedBead) && ((skX.has(c.a) && skY.has(c.b)) || (skX.has(c.b) && skY.has(c.a))))
    if (!apart) out.push(`sets ${x.number} and ${y.number} could be one`)
  }
  return out
}

describe('planSets: properties of every plan', () => {
  it('every invariant holds on random rooms, muddled ones included', () => {
    fc.assert(fc.property(roomArb, (room) => {
      const plan = planSets(room.surfaces, room.corners, room.options)
      expect(broken(room, plan)).toEqual([])
    }), { numRuns: 600 })
  }, 60_000)

  it('checkPlan finds nothing wrong with a fresh plan but the oversized-skim warnings', () => {
    fc.assert(fc.property(roomArb, (room) => {
      const plan = planSets(room.surfaces, room.corners, room.options)
      for (const w of checkPlan(room.surfaces, room.corners, room.options, plan)) {
        expect(w).toContain('a set to itself')
        expect(plan.warnings).toContain(w)
      }
    }), { numRuns: 400 })
  }, 60_000)

  it('the same input gives the same plan, and the input is not changed', () => {
    fc.assert(fc.property(roomArb, (room) => {
      const before = structuredClone(room)
      const plan = planSets(room.surfaces, room.corners, room.options)
      expect(room).toEqual(before)
      expect(planSets(before.surfaces, before.corners, before.options)).toEqual(plan)
    }), { numRuns: 300 })
  }, 60_000)

  it('no two neighbouring sets could be one (as few sets as the rules allow, pair by pair)', () => {
    fc.assert(fc.property(roomArb, (room) => {
      expect(mergeable(room, planSets(room.surfaces, room.corners, room.options))).toEqual([])
    }), { numRuns: 400 })
  }, 60_000)

  it('plain rooms are balanced: the heaviest and lightest sets differ by no more than the smallest job in the heaviest', () => {
    const plainArb = fc.record({
      surfaces: fc.uniqueArray(fc.record({ id: fc.constantFrom(...IDS), areaM2: fc.integer({ min: 0, max: 400_000 }).map(c => c / 10_000) }), { selector: s => s.id, maxLength: 12 }),
      options: optionsArb,
    })
    fc.assert(fc.property(plainArb, ({ surfaces, options }) => {
      const plan = planSets(surfaces, [], options)
      if (plan.sets.length < 2) return
      const loads = plan.sets.map(s => tenthsOf(s.bags))
      const heaviest = plan.sets[loads.indexOf(Math.max(...loads))]!
      const smallest = Math.min(...heaviest.tasks.map(t => tenthsOf(t.bags)).filter(b => b > 0))
      expect(Math.max(...loads) - Math.min(...loads)).toBeLessThanOrEqual(smallest)
    }), { numRuns: 400 })
  }, 60_000)

  it('moving a surface onto its difficult corner\'s set is caught by checkPlan', () => {
    fc.assert(fc.property(roomArb, (room) => {
      const plan = planSets(room.surfaces, room.corners, room.options)
      const ids = new Set(room.surfaces.map(s => s.id))
      for (const c of room.corners) {
        if (!c.dryCorner || c.a === c.b || !ids.has(c.a) || !ids.has(c.b)) continue
        const to = setOf(plan, c.a)[0]!
        const sets = plan.sets.map(s => ({ ...s, tasks: s.tasks.filter(t => !(t.surfaceId === c.b && t.action === 'skim')) }))
        sets[to - 1]!.tasks.push(task(plan, c.b))
        for (const s of sets) s.bags = s.tasks.reduce((n, t) => n + tenthsOf(t.bags), 0) / 10
        const said = checkPlan(room.surfaces, room.corners, room.options, { ...plan, sets })
        expect(said.some(w => w.includes('share a difficult corner') && mentions(w, c.a) && mentions(w, c.b))).toBe(true)
      }
    }), { numRuns: 300 })
  }, 60_000)

  it('a ring of packed beads warns and still plans, whatever else is in the room', () => {
    const ringArb = fc.record({ n: fc.integer({ min: 2, max: 8 }), extra: fc.array(cornersOf(IDS.slice(0, 8)), { maxLength: 6 }), options: optionsArb })
    fc.assert(fc.property(ringArb, ({ n, extra, options }) => {
      const surfaces = IDS.slice(0, n).map(id => wall(id, 4))
      const corners = [...surfaces.map((s, i) => packed(s.id, surfaces[(i + 1) % n]!.id)), ...extra]
      const plan = planSets(surfaces, corners, options)
      expect(plan.warnings.some(w => w.includes('round in a circle'))).toBe(true)
      expect(broken({ surfaces, corners, options }, plan)).toEqual([])
    }), { numRuns: 300 })
  }, 60_000)

  it('bad numbers throw an Error naming the field, wherever they are', () => {
    const badArb = fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, -1, -0.01)
    const where = fc.constantFrom('areaM2', 'patch', 'people', 'bagsPerPersonPerSet', 'coverageM2PerBag')
    fc.assert(fc.property(roomArb, badArb, where, fc.nat(), (room, bad, field, at) => {
      const surfaces = [...room.surfaces, wall('Z', 1, { patches: [{ areaM2: 0.5 }] })]
      const options = { ...room.options }
      const i = at % surfaces.length
      if (field === 'areaM2') surfaces[i] = { ...surfaces[i]!, areaM2: bad }
      else if (field === 'patch') surfaces[surfaces.length - 1] = wall('Z', 1, { patches: [{ areaM2: bad }] })
      else if (field === 'people') options.people = [0, -1, 1.5, Number.NaN, Number.POSITIVE_INFINITY][at % 5]!
      else options[field] = [0, bad][at % 2]!
      const name = field === 'patch' ? /patches\[0\]\.areaM2/ : new RegExp(field)
      expect(() => planSets(surfaces, room.corners, options)).toThrow(name)
    }), { numRuns: 300 })
  }, 60_000)
})

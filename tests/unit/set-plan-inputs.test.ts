import { describe, expect, it } from 'vitest'
import { roomSchema } from '../../shared/schemas/room'
import type { PlanInputCorner, PlanInputRoom, PlanInputRules, PlanInputSurface } from '../../shared/utils/set-plan-inputs'
import { planInputsFromRooms } from '../../shared/utils/set-plan-inputs'
import { checkPlan, planSets } from '../../shared/utils/set-plan'
import { areaBags, DEFAULT_MATERIALS, estimateMaterials, tenthsUp, undercoatTakeoff, type Material } from '../../shared/utils/materials'
import { takeoffRoom } from '../../shared/utils/takeoff'

// Sources. What makes a corner difficult, a patch low-suction and a bead packed out is common
// practice (../shared/DOMAIN.md, "Planning the sets"); the trowel width and the out-of-true
// tolerance are the firm's own settings, so the 150 mm and 10 mm here are inputs, not claims.
// Areas follow the take-off (DOMAIN.md, "Areas": common practice), worked beside each case.

const rules: PlanInputRules = { cornerTrowelMm: 150, outOfTrueToleranceMm: 10 }
const surface = (id: string, over: Partial<PlanInputSurface> = {}): PlanInputSurface => ({ id, kind: 'wall', lengthMm: 4000, secondMm: 2400, ...over })
const outOfTrue = (mm: number): NonNullable<PlanInputSurface['conditions']>[number] => ({ kind: 'out-of-true', outOfTrueMm: mm })
const room = (surfaces: PlanInputSurface[], corners: PlanInputCorner[] = []): PlanInputRoom => ({ name: 'Front bedroom', surfaces, corners })
const corner = (over: Partial<PlanInputCorner> = {}): PlanInputCorner => ({ kind: 'internal', surfaceAId: 'a', surfaceBId: 'b', ...over })

describe('planInputsFromRooms: difficult corners', () => {
  it.each<[string, PlanInputCorner, PlanInputSurface['conditions'], PlanInputSurface['conditions'], boolean]>([
    // common practice: a return too narrow for the corner trowel is difficult; "narrower than" the 150 mm trowel
    ['a 149 mm return, just narrower than the trowel', corner({ returnWidthMm: 149 }), [], [], true],
    ['a 150 mm return, as wide as the trowel', corner({ returnWidthMm: 150 }), [], [], false],
    ['a 151 mm return, just wider', corner({ returnWidthMm: 151 }), [], [], false],
    ['a return that was not measured', corner({ returnWidthMm: null }), [], [], false],
    // common practice: badly out of true is difficult; "beyond" the 10 mm tolerance
    ['wall A 11 mm out, just beyond the tolerance', corner(), [outOfTrue(11)], [], true],
    ['wall B 11 mm out', corner(), [], [outOfTrue(11)], true],
    ['10 mm out, at the tolerance', corner(), [outOfTrue(10)], [outOfTrue(10)], false],
    ['9 mm out, within it', corner(), [outOfTrue(9)], [], false],
    ['the worst of several findings counts', corner(), [outOfTrue(4), outOfTrue(12)], [], true],
    // common practice (DOMAIN.md): the dry-corner rule is for internal corners
    ['an external corner with a narrow return', corner({ kind: 'external', returnWidthMm: 100 }), [], [], false],
    ['an external corner between walls out of true', corner({ kind: 'external' }), [outOfTrue(30)], [], false],
  ])('%s', (_what, c, conditionsA, conditionsB, difficult) => {
    const out = planInputsFromRooms([room([surface('a', { conditions: conditionsA }), surface('b', { conditions: conditionsB })], [c])], rules)
    expect(out.corners).toEqual([{ a: 'a', b: 'b', kind: c.kind, ...(difficult ? { dryCorner: true } : {}) }])
  })

  it('uses the firm\'s own figures', () => {
    // the same 149 mm return is fine for a firm with a 120 mm trowel; the same 11 mm fine at a 15 mm tolerance
    const r = [room([surface('a', { conditions: [outOfTrue(11)] }), surface('b')], [corner({ returnWidthMm: 149 })])]
    expect(planInputsFromRooms(r, { cornerTrowelMm: 120, outOfTrueToleranceMm: 15 }).corners[0]!.dryCorner).toBeUndefined()
    expect(planInputsFromRooms(r, { cornerTrowelMm: 120, outOfTrueToleranceMm: 10 }).corners[0]!.dryCorner).toBe(true)
  })
})

describe('planInputsFromRooms: surfaces', () => {
  it.each<[string, PlanInputSurface, Partial<PlanInputRules>, object]>([
    // common practice (DOMAIN.md "Areas"): 4.00 x 2.40 - window 1.20 x 1.00 = 8.40 m²
    ['a wall less its window', surface('s', { openings: [{ kind: 'window', widthMm: 1200, heightMm: 1000 }] }), {}, { id: 's', areaM2: 8.4 }],
    // the quote's rule: every opening deducted by default, 9.60 - 0.40 x 0.50 = 9.40 m²
    ['a small void deducted by default', surface('s', { openings: [{ kind: 'void', widthMm: 400, heightMm: 500 }] }), {}, { id: 's', areaM2: 9.4 }],
    // SMM7 (as DOMAIN.md cites it): the 0.20 m² void is not over 0.50 m², so it stays in: 9.60 m²
    ['a small void left in under SMM7', surface('s', { openings: [{ kind: 'void', widthMm: 400, heightMm: 500 }] }), { minDeductCm2: 5000 }, { id: 's', areaM2: 9.6 }],
    ['a ceiling, 4.00 x 3.00', surface('s', { kind: 'ceiling', secondMm: 3000 }), {}, { id: 's', areaM2: 12 }],
    // from memory (as the take-off has it): a narrow reveal is priced by the metre, but its face is still skimmed: 1.20 x 0.25 = 0.30 m²
    ['a narrow reveal, by its face', surface('s', { kind: 'reveal', lengthMm: 1200, secondMm: 250 }), {}, { id: 's', areaM2: 0.3 }],
    // common practice: patches back to masonry or the undercoat are low suction; a crack is not a patch
    ['patches back to masonry and to the undercoat', surface('s', { conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }, { kind: 'patch-undercoat', areaCm2: 2500 }, { kind: 'crack', lengthMm: 900 }] }), {},
      { id: 's', areaM2: 9.6, patches: [{ areaM2: 0.6 }, { areaM2: 0.25 }] }],
    // common practice: a gap bridged with scrim takes tight coats; an unbridged one does not
    ['a scrimmed gap round a frame', surface('s', { conditions: [{ kind: 'frame-gap', lengthMm: 3400, scrimmed: true }] }), {}, { id: 's', areaM2: 9.6, scrimmedGap: true }],
    ['a scrimmed crack', surface('s', { conditions: [{ kind: 'crack', lengthMm: 900, scrimmed: true }] }), {}, { id: 's', areaM2: 9.6, scrimmedGap: true }],
    ['a gap that is not scrimmed', surface('s', { conditions: [{ kind: 'frame-gap', lengthMm: 3400, scrimmed: false }] }), {}, { id: 's', areaM2: 9.6 }],
    // common practice (as the take-off counts it): back to masonry all over takes undercoat over the whole surface, so its patches are under that
    ['a wall back to masonry all over', surface('s', { background: 'masonry', conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }] }), {}, { id: 's', areaM2: 9.6 }],
  ])('%s', (_what, s, more, expected) => {
    // each surface carries its kind and room, for the ceilings-first rule
    expect(planInputsFromRooms([room([s])], { ...rules, ...more }).surfaces).toEqual([{ kind: s.kind, room: 'Front bedroom', ...expected }])
  })

  it('notes a whole-surface undercoat the plan does not cover', () => {
    const out = planInputsFromRooms([room([surface('s', { background: 'masonry', conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }] })])], rules)
    expect(out.notes).toEqual(['Front bedroom · Wall is back to masonry: undercoat the whole surface before these sets (as the quote counts it); its patches go under that undercoat, so they are not filled on their own.'])
  })

  it('labels each surface by room, kind and the plasterer\'s label', () => {
    const out = planInputsFromRooms([
      room([surface('w1', { label: 'window wall' }), surface('w2'), surface('c', { kind: 'ceiling' }), surface('cb', { kind: 'chimney-breast', label: 'Chimney breast' })]),
      { name: 'Landing', surfaces: [surface('l1')] },
    ], rules)
    expect(out.labels).toEqual({
      w1: 'Front bedroom · Wall 1 (window wall)',
      w2: 'Front bedroom · Wall 2',
      c: 'Front bedroom · Ceiling',
      cb: 'Front bedroom · Chimney breast',
      l1: 'Landing · Wall',
    })
  })
})

describe('planInputsFromRooms: packed-out beads', () => {
  it.each<[string, PlanInputSurface, PlanInputSurface, string]>([
    // the face is the broad side, the return the narrow one: chimney breast 1.20 x 2.40 against its 0.30 x 2.40 side
    ['the breast is the face of its side', surface('a', { kind: 'chimney-breast', lengthMm: 1200 }), surface('b', { kind: 'strip', lengthMm: 2400, secondMm: 300 }), 'a'],
    ['whichever way round the corner names them', surface('a', { kind: 'reveal', lengthMm: 1200, secondMm: 250 }), surface('b', { lengthMm: 3000 }), 'b'],
    // a tie: the corner's first surface
    ['two equal faces: the first', surface('a'), surface('b'), 'a'],
  ])('%s', (_what, a, b, face) => {
    const out = planInputsFromRooms([room([a, b], [corner({ kind: 'external', packedOut: true })])], rules)
    expect(out.corners).toEqual([{ a: 'a', b: 'b', kind: 'external', packedBead: { face } }])
  })
})

describe('planInputsFromRooms: bad rules throw, naming the field', () => {
  it.each<[string, PlanInputRules, RegExp]>([
    ['no trowel', { ...rules, cornerTrowelMm: 0 }, /cornerTrowelMm/],
    ['a trowel that is not a number', { ...rules, cornerTrowelMm: Number.NaN }, /cornerTrowelMm/],
    ['a negative tolerance', { ...rules, outOfTrueToleranceMm: -1 }, /outOfTrueToleranceMm/],
    ['an infinite tolerance', { ...rules, outOfTrueToleranceMm: Number.POSITIVE_INFINITY }, /outOfTrueToleranceMm/],
    ['a negative small-voids rule', { ...rules, minDeductCm2: -1 }, /minDeductCm2/],
  ])('%s', (_what, r, field) => expect(() => planInputsFromRooms([room([surface('a')])], r)).toThrow(field))
})

describe('planInputsFromRooms: a saved room to a plan', () => {
  // a room as the visit saves it (shared/schemas/room.ts), planned end to end
  const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`
  const saved = roomSchema.parse({
    revision: 0,
    name: 'Front bedroom',
    surfaces: [
      { id: id(1), kind: 'wall', label: 'window wall', lengthMm: 3600, secondMm: 2400, openings: [{ id: id(11), kind: 'window', widthMm: 1200, heightMm: 1200 }],
        conditions: [{ id: id(12), kind: 'frame-gap', lengthMm: 4800, scrimmed: true }] },
      { id: id(2), kind: 'wall', lengthMm: 3000, secondMm: 2400, conditions: [{ id: id(13), kind: 'out-of-true', outOfTrueMm: 14 }, { id: id(14), kind: 'patch-masonry', areaCm2: 4000 }] },
      { id: id(3), kind: 'ceiling', lengthMm: 3600, secondMm: 3000 },
      { id: id(4), kind: 'chimney-breast', lengthMm: 1200, secondMm: 2400 },
      { id: id(5), kind: 'strip', label: 'breast side', lengthMm: 2400, secondMm: 300 },
    ],
    corners: [
      { id: id(21), surfaceAId: id(1), surfaceBId: id(2), kind: 'internal', lengthMm: 2400 },
      { id: id(22), surfaceAId: id(4), surfaceBId: id(5), kind: 'external', lengthMm: 2400, needsBead: true, packedOut: true },
    ],
  })

  it('follows every rule, with the labels in the reasons', () => {
    const inputs = planInputsFromRooms([saved], rules)
    // 3.60 x 2.40 - 1.20 x 1.20 = 8.64 - 1.44 = 7.20 m²
    expect(inputs.surfaces[0]).toEqual({ id: id(1), areaM2: 7.2, scrimmedGap: true, kind: 'wall', room: 'Front bedroom' })
    // wall 2 is 14 mm out, beyond 10 mm: the corner is difficult; the breast (2.88 m²) is the face of its side (0.72 m²)
    expect(inputs.corners).toEqual([
      { a: id(1), b: id(2), kind: 'internal', dryCorner: true },
      { a: id(4), b: id(5), kind: 'external', packedBead: { face: id(4) } },
    ])
    const options = { people: 2, bagsPerPersonPerSet: 4, coverageM2PerBag: 4 }
    const plan = planSets(inputs.surfaces, inputs.corners, options, inputs.labels)
    expect(plan.warnings).toEqual([])
    expect(checkPlan(inputs.surfaces, inputs.corners, options, plan, inputs.labels)).toEqual([])
    const reasons = plan.sets.flatMap(s => s.tasks.map(t => t.reason)).join('\n')
    expect(reasons).toContain('Front bedroom · Wall 2')
    expect(reasons).toContain('Front bedroom · Narrow strip (breast side)')
  })
})

describe('planInputsFromRooms: one source for quantities (the quote\'s undercoat)', () => {
  // Sources. The undercoat sum is the quote's own (shared/utils/materials.ts estimateMaterials: the
  // catalogue's first bonding undercoat, at the estimate's 11 mm, plus the firm's waste; coverage
  // figures in DEFAULT_MATERIALS are common practice, DOMAIN.md "Coverage"). Our own rule: the plan
  // rounds each surface UP to tenths of a bag, the quote its total up to whole packs, once.
  const takeoff = undercoatTakeoff(DEFAULT_MATERIALS, { wastePercent: 10 })
  /** The quote's unrounded undercoat ratio for a room, as its materials line writes it ("= 0.61, rounded up to ..."). */
  const quoteRatio = (r: PlanInputRoom, catalogue: readonly Material[] = DEFAULT_MATERIALS): number => {
    const line = estimateMaterials(takeoffRoom({ ...r, corners: [] }, {}), catalogue, { wastePercent: 10 }).find(l => l.name.toLowerCase().includes('undercoat'))!
    return Number(/= (\d+\.\d+), rounded up/.exec(line.derivation)![1])
  }

  it('uses the catalogue\'s undercoat, the estimate\'s thickness and the firm\'s waste', () => {
    expect(takeoff).toEqual({ coverage: { m2PerPack: 3, atThicknessMm: 10 }, thicknessMm: 11, wastePercent: 10 })
  })

  it('the demo-like case: a 0.5 m² patch gives the quote\'s undercoat in the plan, rounded up to tenths', () => {
    // 0.5 m² x 11 mm / 10 mm / 3 m² a bag x 1.1 = 0.2017 bag (the quote writes 0.20 and orders 1 bag); the plan: 0.3
    const r = room([surface('s', { conditions: [{ kind: 'patch-masonry', areaCm2: 5000 }] })])
    const out = planInputsFromRooms([r], rules, takeoff)
    expect(quoteRatio(r)).toBe(0.2)
    expect(out.surfaces[0]!.fillBags).toBe(0.3)
    expect(out.surfaces[0]!.fillBags).toBe(tenthsUp(areaBags(5000, 11, { m2PerPack: 3, atThicknessMm: 10 }, 10)) / 10)
    // the plan's fill task carries those bags, not the patch at the skim's coverage (0.5 / 10 = 0.05 -> 0.1)
    const plan = planSets(out.surfaces, out.corners, { people: 1, bagsPerPersonPerSet: 3, coverageM2PerBag: 10 })
    expect(plan.sets[0]!.tasks).toEqual([expect.objectContaining({ action: 'fill', bags: 0.3 })])
    expect(planInputsFromRooms([r], rules).surfaces[0]!.fillBags).toBeUndefined()
  })

  it('0.61 bag of undercoat in the quote is 0.7 in the plan', () => {
    // a bonding undercoat covering 1 m² at 10 mm (an invented figure, to make the numbers):
    // 0.5 m² x 11 / 10 / 1 x 1.1 = 0.605 -> the quote writes 0.61; the plan rounds up to 0.7
    const catalogue: Material[] = [{ ...DEFAULT_MATERIALS.find(m => m.type === 'bonding-undercoat')!, coverage: { kind: 'area', m2PerPack: 1, atThicknessMm: 10 } }]
    const r = room([surface('s', { conditions: [{ kind: 'patch-undercoat', areaCm2: 5000 }] })])
    expect(quoteRatio(r, catalogue)).toBe(0.61)
    expect(planInputsFromRooms([r], rules, undercoatTakeoff(catalogue, { wastePercent: 10 })).surfaces[0]!.fillBags).toBe(0.7)
  })

  it('two patches on one surface are summed before rounding, as the quote sums them', () => {
    // (0.6 + 0.25) m² x 11 / 10 / 3 x 1.1 = 0.3428 -> 0.4 (not 0.3 + 0.2 = 0.5)
    const r = room([surface('s', { conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }, { kind: 'patch-undercoat', areaCm2: 2500 }] })])
    expect(planInputsFromRooms([r], rules, takeoff).surfaces[0]!.fillBags).toBe(0.4)
  })

  it('a surface back to masonry all over gets an undercoat task before its skim, and no note', () => {
    // 4.00 x 2.40 = 9.60 m² x 11 / 10 / 3 x 1.1 = 3.872 -> 3.9 bags; its patch is under that undercoat
    const r = room([surface('s', { background: 'masonry', conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }] })])
    const out = planInputsFromRooms([r], rules, takeoff)
    expect(out.surfaces).toEqual([{ id: 's', areaM2: 9.6, kind: 'wall', room: 'Front bedroom', undercoatBags: 3.9 }])
    expect(out.notes).toEqual([])
    const plan = planSets(out.surfaces, out.corners, { people: 2, bagsPerPersonPerSet: 3, coverageM2PerBag: 10 })
    expect(plan.sets.map(s => s.tasks.map(t => `${t.action}:${t.bags}`))).toEqual([['undercoat:3.9'], ['skim:1']])
  })

  it('with no undercoat in the catalogue, the plan falls back to today\'s rule and the note', () => {
    const none = undercoatTakeoff(DEFAULT_MATERIALS.filter(m => m.type !== 'bonding-undercoat'))
    expect(none.coverage).toBeNull()
    const out = planInputsFromRooms([room([surface('s', { background: 'masonry' }), surface('t', { conditions: [{ kind: 'patch-masonry', areaCm2: 5000 }] })])], rules, none)
    expect(out.surfaces.map(s => [s.fillBags, s.undercoatBags])).toEqual([[undefined, undefined], [undefined, undefined]])
    expect(out.notes).toHaveLength(1)
  })
})

import { describe, expect, it } from 'vitest'
import type { TakeoffLine, TakeoffOptions, TakeoffRoom, TakeoffSurface } from '../../shared/utils/takeoff'
import { beadLengthsFor, DEFAULT_TAKEOFF_OPTIONS, formatStockLength, netWallAreaM2, parseStockLengths, SMM7_MIN_DEDUCT_CM2, takeoffRoom, takeoffRooms, withWasteRoundedUp } from '../../shared/utils/takeoff'

// Sources (../shared/DOMAIN.md, "Quantities and materials"): wall = length x height less openings,
// ceiling = length x width (common practice); SMM7 left voids of 0.5 m² or less in (SMM7, as
// DOMAIN.md cites it); reveals and strips up to 300 mm wide by the linear metre (from memory);
// beads by the linear metre, in 2.5 m and 3.0 m lengths (supplier listings); waste 10% (common
// practice). Room sizes are invented inputs; the arithmetic is written beside each case.

describe('netWallAreaM2', () => {
  it.each([
    // arithmetic: 2.55 x 5.2 = 13.26 (a float multiply gives 13.259999...)
    ['2.55 x 5.2, no openings', { lengthM: 2.55, heightM: 5.2 }, undefined, 13.26],
    // common practice (DOMAIN.md "Areas"): 4.00 x 2.40 - window 1.20 x 1.00 = 9.60 - 1.20 = 8.40
    ['wall less a window', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 1.2, heightM: 1 }] }, undefined, 8.4],
    // arithmetic: 1.005 m² rounds half up to 1.01 (Math.round(1.005 * 100) / 100 gives 1)
    ['half up at the third decimal', { lengthM: 1.005, heightM: 1 }, undefined, 1.01],
    // arithmetic: 1.004 m² -> 1.00
    ['below half stays down', { lengthM: 1.004, heightM: 1 }, undefined, 1],
    // our rule (the firm's default, DOMAIN.md "Areas": deduct every opening unless the firm chooses SMM7): 9.60 - 1.00 x 0.50 = 9.10
    ['default: a 0.5 m² void is deducted', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 1, heightM: 0.5 }] }, undefined, 9.1],
    // SMM7 (DOMAIN.md): a void of exactly 0.5 m² is not over 0.5, so it stays in: 9.60
    ['SMM7: exactly 0.5 m² stays in', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 1, heightM: 0.5 }] }, { minDeductM2: 0.5 }, 9.6],
    // SMM7: 0.999 x 0.5 = 0.4995 m², just below: stays in, 9.60
    ['SMM7: just below 0.5 m² stays in', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 0.999, heightM: 0.5 }] }, { minDeductM2: 0.5 }, 9.6],
    // SMM7: 1.002 x 0.5 = 0.501 m², just above: deducted, 9.60 - 0.501 = 9.099 -> 9.10
    ['SMM7: just above 0.5 m² is deducted', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 1.002, heightM: 0.5 }] }, { minDeductM2: 0.5 }, 9.1],
    // SMM7 with a door and a small void: 9.60 - door 0.90 x 2.00 (1.80) = 7.80; the 0.30 x 0.30 void (0.09) stays in
    ['SMM7: a door out, a small void in', { lengthM: 4, heightM: 2.4, openings: [{ widthM: 0.9, heightM: 2 }, { widthM: 0.3, heightM: 0.3 }] }, { minDeductM2: 0.5 }, 7.8],
    // arithmetic: openings bigger than the wall never give a negative area
    ['never below 0', { lengthM: 1, heightM: 1, openings: [{ widthM: 2, heightM: 2 }] }, undefined, 0],
  ])('%s', (_what, wall, rule, m2) => expect(netWallAreaM2(wall, rule)).toBe(m2))

  it.each([
    ['a negative length', { lengthM: -1, heightM: 2.4 }, undefined],
    ['a length that is not a number', { lengthM: Number.NaN, heightM: 2.4 }, undefined],
    ['an infinite opening', { lengthM: 4, heightM: 2.4, openings: [{ widthM: Number.POSITIVE_INFINITY, heightM: 1 }] }, undefined],
    ['a negative rule', { lengthM: 4, heightM: 2.4 }, { minDeductM2: -0.5 }],
  ])('%s is a RangeError', (_what, wall, rule) => expect(() => netWallAreaM2(wall, rule)).toThrow(RangeError))
})

describe('bead lengths', () => {
  it.each([
    // supplier listings (DOMAIN.md): 2.5 m and 3.0 m; the least waste per corner wins
    [2400, 1, 2500], // 2.5 wastes 0.10, 3.0 wastes 0.60
    [2500, 1, 2500], // 2.5 wastes nothing
    [2700, 1, 3000], // 2 x 2.5 wastes 2.30, 3.0 wastes 0.30
    [5000, 2, 2500], // 2 x 2.5 wastes nothing, 2 x 3.0 wastes 1.00
    [5500, 2, 3000], // 3 x 2.5 wastes 2.00, 2 x 3.0 wastes 0.50
    [15000, 5, 3000], // both waste nothing: fewer lengths (5 x 3.0, not 6 x 2.5)
  ])('a %i mm corner takes %i x %i mm', (cornerMm, count, stockMm) => expect(beadLengthsFor(cornerMm, [2500, 3000])).toEqual({ count, stockMm }))

  it.each([
    // common practice (DOMAIN.md): 10% waste, rounded up to whole lengths
    [2, 10, 3], // 2.2 -> 3
    [10, 10, 11], // exactly 11
    [20, 10, 22], // exactly 22 (a float 20 * 1.1 is 22.000000000000004 and would round up to 23)
    [100, 10, 110], // exactly 110 (a float 100 * 1.1 is 110.00000000000001)
    [1, 0, 1],
    [0, 10, 0],
    [3, 50, 5], // 4.5 -> 5
  ])('%i lengths + %i%% waste -> %i', (count, waste, total) => expect(withWasteRoundedUp(count, waste)).toBe(total))

  it.each([[2500, '2.5'], [3000, '3.0'], [2440, '2.44'], [600, '0.6']])('%i mm reads %s m', (mm, text) => expect(formatStockLength(mm)).toBe(text))

  // the price book's field: stock lengths as typed (supplier listings: 2.5 m and 3.0 m)
  it.each<[string, number[]]>([
    ['2.5, 3.0', [2500, 3000]],
    ['3 2.5', [2500, 3000]], // sorted shortest first
    [' 2.44 ;3.6 ', [2440, 3600]],
    ['0.5', [500]], // the shortest accepted
    ['6', [6000]], // the longest accepted
  ])('"%s" reads as %o mm', (typed, mm) => expect(parseStockLengths(typed)).toEqual({ ok: true, mm }))

  it.each<[string, RegExp]>([
    ['', /Enter the bead lengths/],
    ['2.5, three', /"three" is not a length/],
    ['2500', /not a length in metres/], // millimetres typed by mistake (four whole digits)
    ['0.4', /from 0.5 m to 6 m/],
    ['6.001', /from 0.5 m to 6 m/],
    ['2.5, 2.50', /2.5 m is there twice/],
    ['1, 2, 3, 4, 5', /Four bead lengths at most/],
    ['2.5.1', /not a length/],
  ])('"%s" is refused with a message', (typed, message) => {
    const r = parseStockLengths(typed)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.message).toMatch(message)
  })
})

const wall = (over: Partial<TakeoffSurface> = {}): TakeoffSurface => ({ id: 's1', kind: 'wall', lengthMm: 4000, secondMm: 2400, ...over })
const room = (surfaces: TakeoffSurface[], corners: TakeoffRoom['corners'] = []): TakeoffRoom => ({ name: 'Front bedroom', surfaces, corners })
const at = { roomName: 'Front bedroom', surfaceId: 's1' }
const smm7: Partial<TakeoffOptions> = { minDeductCm2: SMM7_MIN_DEDUCT_CM2 }

describe('takeoffRoom: one surface at a time', () => {
  it.each<[string, TakeoffSurface, Partial<TakeoffOptions>, TakeoffLine[]]>([
    // common practice (DOMAIN.md "Areas"): 4.00 x 2.40 - window 1.20 x 1.00 = 8.40 m² = 84 000 cm²
    ['a wall less a window', wall({ label: 'Window wall', openings: [{ kind: 'window', widthMm: 1200, heightMm: 1000 }] }), {},
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 84_000, derivation: 'Window wall 4.00 x 2.40 - window 1.20 x 1.00 = 8.40 m²' }]],
    // SMM7 (DOMAIN.md): door 0.40 x 0.50 = 0.20 m², not over 0.50, left in: 9.60 m²
    ['SMM7: a small void left in, and said so', wall({ openings: [{ kind: 'door', widthMm: 400, heightMm: 500 }] }), smm7,
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 96_000, derivation: 'Wall 4.00 x 2.40 - door 0.40 x 0.50 left in (0.20 m², not over 0.50 m²) = 9.60 m²' }]],
    // our rule (deduct all, the default): 9.60 - 0.20 = 9.40
    ['deduct all: the same void comes off', wall({ openings: [{ kind: 'door', widthMm: 400, heightMm: 500 }] }), {},
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 94_000, derivation: 'Wall 4.00 x 2.40 - door 0.40 x 0.50 = 9.40 m²' }]],
    // SMM7: a void of exactly 0.50 m² (1.00 x 0.50) stays in
    ['SMM7: exactly 0.5 m² stays in', wall({ openings: [{ kind: 'void', widthMm: 1000, heightMm: 500 }] }), smm7,
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 96_000, derivation: 'Wall 4.00 x 2.40 - other void 1.00 x 0.50 left in (0.50 m², not over 0.50 m²) = 9.60 m²' }]],
    // SMM7: 1.002 x 0.50 = 0.501 m², just over: 9.60 - 0.501 = 9.099 m² = 90 990 cm²
    ['SMM7: just over 0.5 m² comes off', wall({ openings: [{ kind: 'void', widthMm: 1002, heightMm: 500 }] }), smm7,
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 90_990, derivation: 'Wall 4.00 x 2.40 - other void 1.00 x 0.50 = 9.10 m²' }]],
    // common practice: ceiling = length x width, 4.00 x 3.00 = 12.00 m²
    ['a ceiling', { id: 's1', kind: 'ceiling', lengthMm: 4000, secondMm: 3000 }, {},
      [{ ...at, key: 'skim-ceilings', unit: 'm2', quantity: 120_000, derivation: 'Ceiling 4.00 x 3.00 = 12.00 m²' }]],
    // common practice: a chimney breast is skimmed like a wall, priced with the walls: 1.20 x 2.40 = 2.88 m²
    ['a chimney breast counts as wall', { id: 's1', kind: 'chimney-breast', lengthMm: 1200, secondMm: 2400 }, {},
      [{ ...at, key: 'skim-walls', unit: 'm2', quantity: 28_800, derivation: 'Chimney breast 1.20 x 2.40 = 2.88 m²' }]],
    // from memory (DOMAIN.md): up to 300 mm wide by the linear metre; face area 1.20 x 0.25 = 0.30 m² kept for materials
    ['a narrow reveal by the metre', { id: 's1', kind: 'reveal', lengthMm: 1200, secondMm: 250 }, {},
      [{ ...at, key: 'reveals-lm', unit: 'lm', quantity: 1200, areaCm2: 3000, derivation: 'Reveal 1.20 m long, 0.25 m deep (not over 0.30 m): 1.20 m' }]],
    // from memory: exactly 300 mm is "up to 300 mm", still by the metre
    ['a 300 mm reveal is still by the metre', { id: 's1', kind: 'reveal', lengthMm: 1200, secondMm: 300 }, {},
      [{ ...at, key: 'reveals-lm', unit: 'lm', quantity: 1200, areaCm2: 3600, derivation: 'Reveal 1.20 m long, 0.30 m deep (not over 0.30 m): 1.20 m' }]],
    // from memory: 301 mm is over, so by area: 1.20 x 0.301 = 0.3612 m² = 3612 cm²
    ['a 301 mm reveal goes by area', { id: 's1', kind: 'reveal', lengthMm: 1200, secondMm: 301 }, {},
      [{ ...at, key: 'reveals-area', unit: 'm2', quantity: 3612, derivation: 'Reveal 1.20 x 0.30 = 0.36 m² (over 0.30 m deep, so by area)' }]],
    // from memory (DOMAIN.md "Areas": up to 300 mm by the metre, so wider by area): 2.00 x 0.45 = 0.90 m²
    ['a wide strip by area', { id: 's1', kind: 'strip', label: 'Bulkhead', lengthMm: 2000, secondMm: 450 }, {},
      [{ ...at, key: 'reveals-area', unit: 'm2', quantity: 9000, derivation: 'Bulkhead 2.00 x 0.45 = 0.90 m² (over 0.30 m wide, so by area)' }]],
    // common practice (DOMAIN.md "The work"): back to masonry -> undercoat over the whole surface, then skim; its patches are inside that
    ['a wall back to masonry', wall({ lengthMm: 3000, background: 'masonry', conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }] }), {},
      [
        { ...at, key: 'skim-walls', unit: 'm2', quantity: 72_000, derivation: 'Wall 3.00 x 2.40 = 7.20 m²' },
        { ...at, key: 'undercoat', unit: 'm2', quantity: 72_000, derivation: 'Wall back to masonry: undercoat over the whole surface, 7.20 m² (then skimmed)' },
      ]],
    ['a wall back to the undercoat', wall({ lengthMm: 3000, background: 'undercoat' }), {},
      [
        { ...at, key: 'skim-walls', unit: 'm2', quantity: 72_000, derivation: 'Wall 3.00 x 2.40 = 7.20 m²' },
        { ...at, key: 'undercoat', unit: 'm2', quantity: 72_000, derivation: 'Wall back to the undercoat: undercoat over the whole surface, 7.20 m² (then skimmed)' },
      ]],
    // common practice: patches back to the undercoat or masonry are filled first (their own area); a crack is not a quantity here
    ['patches on sound plaster are filled', wall({ lengthMm: 3000, conditions: [{ kind: 'patch-masonry', areaCm2: 6000 }, { kind: 'patch-undercoat', areaCm2: 2500 }, { kind: 'crack', lengthMm: 900 }] }), {},
      [
        { ...at, key: 'skim-walls', unit: 'm2', quantity: 72_000, derivation: 'Wall 3.00 x 2.40 = 7.20 m²' },
        { ...at, key: 'fill-patches', unit: 'm2', quantity: 6000, derivation: 'Wall: patch back to masonry, filled with undercoat, 0.60 m²' },
        { ...at, key: 'fill-patches', unit: 'm2', quantity: 2500, derivation: 'Wall: patch back to the undercoat, filled with undercoat, 0.25 m²' },
      ]],
    // common practice: frame gaps bridged with scrim, by the metre; an unscrimmed gap adds no scrim
    ['scrim on a scrimmed frame gap only', wall({ lengthMm: 3000, conditions: [{ kind: 'frame-gap', lengthMm: 3400, scrimmed: true }, { kind: 'frame-gap', lengthMm: 2000, scrimmed: false }] }), {},
      [
        { ...at, key: 'skim-walls', unit: 'm2', quantity: 72_000, derivation: 'Wall 3.00 x 2.40 = 7.20 m²' },
        { ...at, key: 'scrim', unit: 'lm', quantity: 3400, derivation: 'Wall: gap round a frame, scrimmed, 3.40 m' },
      ]],
  ])('%s', (_what, surface, options, lines) => expect(takeoffRoom(room([surface]), options)).toEqual(lines))
})

describe('takeoffRoom: corners and the bead order', () => {
  const surfaces: TakeoffSurface[] = [
    { id: 'cb', kind: 'chimney-breast', lengthMm: 1200, secondMm: 2400 },
    { id: 'al', kind: 'wall', label: 'Alcove', lengthMm: 900, secondMm: 2400 },
  ]
  const corners: TakeoffRoom['corners'] = [
    { id: 'c1', kind: 'external', lengthMm: 2400, needsBead: true, surfaceAId: 'cb', surfaceBId: 'al' },
    { id: 'c2', kind: 'external', lengthMm: 2400, needsBead: true, surfaceAId: 'cb', surfaceBId: 'al' },
    { id: 'c3', kind: 'external', lengthMm: 2700, needsBead: true },
    { id: 'c4', kind: 'external', lengthMm: 2400, needsBead: false },
    { id: 'c5', kind: 'internal', lengthMm: 2400, needsBead: true },
  ]
  const lines = takeoffRoom(room(surfaces, corners))
  const beadLines = lines.filter(l => l.key === 'beads' || l.key === 'bead-lengths')

  it('beads only beaded external corners, by the metre, with the lengths each takes (supplier listings: 2.5 m, 3.0 m)', () => {
    expect(beadLines.filter(l => l.key === 'beads')).toEqual([
      { key: 'beads', roomName: 'Front bedroom', cornerId: 'c1', unit: 'lm', quantity: 2400, derivation: '2.40 m corner (Chimney breast / Alcove): 1 x 2.5 m length' },
      { key: 'beads', roomName: 'Front bedroom', cornerId: 'c2', unit: 'lm', quantity: 2400, derivation: '2.40 m corner (Chimney breast / Alcove): 1 x 2.5 m length' },
      { key: 'beads', roomName: 'Front bedroom', cornerId: 'c3', unit: 'lm', quantity: 2700, derivation: '2.70 m corner: 1 x 3.0 m length' },
    ])
  })

  it('orders whole lengths per stock length with 10% waste, rounded up (common practice)', () => {
    expect(beadLines.filter(l => l.key === 'bead-lengths')).toEqual([
      // 2 lengths x 1.10 = 2.2 -> 3
      { key: 'bead-lengths', roomName: 'Front bedroom', unit: 'lengths', quantity: 3, stockLengthMm: 2500, derivation: '2.5 m bead: 2 lengths + 10% waste = 2.2, rounded up to 3 lengths' },
      // 1 length x 1.10 = 1.1 -> 2
      { key: 'bead-lengths', roomName: 'Front bedroom', unit: 'lengths', quantity: 2, stockLengthMm: 3000, derivation: '3.0 m bead: 1 length + 10% waste = 1.1, rounded up to 2 lengths' },
    ])
  })

  it('with no waste and one stock length, each corner is rounded up on its own', () => {
    const only3 = takeoffRoom(room(surfaces, corners), { beadStockLengthsMm: [3000], beadWastePercent: 0 }).filter(l => l.key === 'bead-lengths')
    // 2.40 + 2.40 + 2.70, each 1 x 3.0 m: 3 lengths
    expect(only3).toEqual([{ key: 'bead-lengths', roomName: 'Front bedroom', unit: 'lengths', quantity: 3, stockLengthMm: 3000, derivation: '3.0 m bead: 3 lengths + 0% waste = 3, rounded up to 3 lengths' }])
  })

  it('lists surfaces first, then corners, then the bead order', () => {
    expect(lines.map(l => l.key)).toEqual(['skim-walls', 'skim-walls', 'beads', 'beads', 'beads', 'bead-lengths', 'bead-lengths'])
  })
})

describe('takeoffRoom: the packed-out bead and the narrow return', () => {
  // The trade's rules (DOMAIN.md "Planning the sets", common practice): a bead that has to be packed
  // out is extra work along the whole corner; an internal corner whose return is narrower than the
  // corner trowel cannot be run with it, so it is made good by hand. Both are priced by the metre
  // of corner (our choice, as beads are). Sizes are invented inputs; 100 mm is the price book's
  // default trowel (a common size, from memory).
  const surfaces: TakeoffSurface[] = [
    { id: 'w1', kind: 'wall', label: 'Wall 1', lengthMm: 3600, secondMm: 2400 },
    { id: 'w2', kind: 'wall', label: 'Left wall', lengthMm: 3100, secondMm: 2400 },
    { id: 'rv', kind: 'reveal', label: 'Reveal', lengthMm: 3400, secondMm: 220 },
  ]
  type Corner = NonNullable<TakeoffRoom['corners']>[number]
  const at = { roomName: 'Front bedroom', unit: 'lm' as const }
  it.each<[string, Corner, Partial<TakeoffOptions>, TakeoffLine[]]>([
    // common practice: the bead is fitted (beads line) and packed out along its whole length, 3.40 m
    ['a packed-out bead is fitted and packed along the corner', { id: 'c1', kind: 'external', lengthMm: 3400, needsBead: true, packedOut: true, surfaceAId: 'w1', surfaceBId: 'rv' }, {}, [
      { ...at, key: 'beads', cornerId: 'c1', quantity: 3400, derivation: '3.40 m corner (Wall 1 / Reveal): 2 x 2.5 m lengths' },
      { ...at, key: 'packed-bead', cornerId: 'c1', quantity: 3400, derivation: 'Bead packed out along the 3.40 m corner between Wall 1 and Reveal: 3.40 m' },
    ]],
    // our rule: no surfaces named, the working says the length alone
    ['a packed-out bead on a corner with no surfaces named', { id: 'c1', kind: 'external', lengthMm: 2450, needsBead: true, packedOut: true }, {}, [
      { ...at, key: 'beads', cornerId: 'c1', quantity: 2450, derivation: '2.45 m corner: 1 x 2.5 m length' },
      { ...at, key: 'packed-bead', cornerId: 'c1', quantity: 2450, derivation: 'Bead packed out along the 2.45 m corner: 2.45 m' },
    ]],
    // common practice: a bead not packed out is only fitted
    ['a bead not packed out is only fitted', { id: 'c1', kind: 'external', lengthMm: 2400, needsBead: true, packedOut: false, surfaceAId: 'w1', surfaceBId: 'rv' }, {}, [
      { ...at, key: 'beads', cornerId: 'c1', quantity: 2400, derivation: '2.40 m corner (Wall 1 / Reveal): 1 x 2.5 m length' },
    ]],
    // the visit form's rule (shared/schemas/room.ts): only a beaded corner is packed out; an unbeaded one asks nothing
    ['packed out without a bead gives nothing', { id: 'c1', kind: 'external', lengthMm: 2400, needsBead: false, packedOut: true }, {}, []],
    // common practice (DOMAIN.md): 80 mm is narrower than the 100 mm trowel, so made good by hand along 2.40 m
    ['a return narrower than the trowel is made good by hand', { id: 'c2', kind: 'internal', lengthMm: 2400, returnWidthMm: 80, surfaceAId: 'w1', surfaceBId: 'w2' }, {}, [
      { ...at, key: 'narrow-return', cornerId: 'c2', quantity: 2400, derivation: 'Return 80 mm wide (Wall 1 / Left wall), narrower than the 100 mm corner trowel: made good by hand along 2.40 m' },
    ]],
    // our boundary, as the planner's (shared/utils/set-plan-inputs.ts): exactly the trowel's width fits it
    ['a return as wide as the trowel is not narrow', { id: 'c2', kind: 'internal', lengthMm: 2400, returnWidthMm: 100 }, {}, []],
    // arithmetic: 99 mm is under 100
    ['a return 1 mm under the trowel is narrow', { id: 'c2', kind: 'internal', lengthMm: 2400, returnWidthMm: 99 }, {}, [
      { ...at, key: 'narrow-return', cornerId: 'c2', quantity: 2400, derivation: 'Return 99 mm wide, narrower than the 100 mm corner trowel: made good by hand along 2.40 m' },
    ]],
    // the firm's own trowel (price book cornerTrowelMm): 120 mm makes a 110 mm return narrow
    ['the firm\'s wider trowel makes a 110 mm return narrow', { id: 'c2', kind: 'internal', lengthMm: 2600, returnWidthMm: 110 }, { cornerTrowelMm: 120 }, [
      { ...at, key: 'narrow-return', cornerId: 'c2', quantity: 2600, derivation: 'Return 110 mm wide, narrower than the 120 mm corner trowel: made good by hand along 2.60 m' },
    ]],
    // ...and a narrower one (80 mm) does not
    ['the firm\'s narrower trowel fits a 90 mm return', { id: 'c2', kind: 'internal', lengthMm: 2400, returnWidthMm: 90 }, { cornerTrowelMm: 80 }, []],
    // nothing measured, nothing assumed
    ['a return not measured is not narrow', { id: 'c2', kind: 'internal', lengthMm: 2400, returnWidthMm: null }, {}, []],
    // a narrow external corner takes a bead (its own line), not a trowel: no narrow-return line (our reading of DOMAIN.md: the trowel rule is for internal corners)
    ['an external corner is never a narrow return', { id: 'c3', kind: 'external', lengthMm: 2400, returnWidthMm: 60 }, {}, []],
  ])('%s', (_what, corner, options, expected) => {
    const lines = takeoffRoom({ name: 'Front bedroom', surfaces, corners: [corner] }, options)
    expect(lines.filter(l => l.cornerId)).toEqual(expected)
  })

  it('lists each corner\'s lines together, in the order measured, before the bead order', () => {
    const lines = takeoffRoom({ name: 'Front bedroom', surfaces, corners: [
      { id: 'c1', kind: 'internal', lengthMm: 2400, returnWidthMm: 80 },
      { id: 'c2', kind: 'external', lengthMm: 3400, needsBead: true, packedOut: true },
    ] })
    expect(lines.map(l => [l.key, l.cornerId ?? l.surfaceId ?? ''])).toEqual([
      ['skim-walls', 'w1'], ['skim-walls', 'w2'], ['reveals-lm', 'rv'],
      ['narrow-return', 'c1'], ['beads', 'c2'], ['packed-bead', 'c2'], ['bead-lengths', ''],
    ])
  })

  it('takeoffRooms passes the corner trowel to every room', () => {
    const corner = { id: 'c1', kind: 'internal' as const, lengthMm: 2400, returnWidthMm: 110 }
    const rooms = [{ name: 'Front bedroom', surfaces, corners: [corner] }]
    expect(takeoffRooms(rooms).filter(l => l.key === 'narrow-return')).toEqual([])
    expect(takeoffRooms(rooms, { cornerTrowelMm: 120 }).filter(l => l.key === 'narrow-return').map(l => l.quantity)).toEqual([2400])
  })
})

describe('takeoffRooms', () => {
  const corner = (id: string) => ({ id, kind: 'external' as const, lengthMm: 2400, needsBead: true })
  const rooms: TakeoffRoom[] = [
    { name: 'Front bedroom', surfaces: [wall()], corners: [corner('c1')] },
    { name: 'Back bedroom', surfaces: [wall({ id: 's2', lengthMm: 3000 })], corners: [corner('c2')] },
  ]

  it('keeps each room\'s lines and adds the waste once for the whole job (10%, common practice)', () => {
    const lines = takeoffRooms(rooms)
    expect(lines.map(l => [l.key, l.roomName, l.quantity])).toEqual([
      ['skim-walls', 'Front bedroom', 96_000],
      ['beads', 'Front bedroom', 2400],
      ['skim-walls', 'Back bedroom', 72_000],
      ['beads', 'Back bedroom', 2400],
      // 2 lengths x 1.10 = 2.2 -> 3 for the job (room by room it would be 2 + 2 = 4)
      ['bead-lengths', 'All rooms', 3],
    ])
    const perRoom = rooms.flatMap(r => takeoffRoom(r)).filter(l => l.key === 'bead-lengths').reduce((n, l) => n + l.quantity, 0)
    expect(perRoom).toBe(4)
  })

  it('an empty job has no lines', () => expect(takeoffRooms([])).toEqual([]))
})

describe('takeoff options are checked', () => {
  it('defaults are deduct-all, 300 mm, 2.5 and 3.0 m beads, 10%, a 100 mm corner trowel (DOMAIN.md: from memory; supplier listings; common practice; the price book\'s default)', () => {
    expect(DEFAULT_TAKEOFF_OPTIONS).toEqual({ minDeductCm2: 0, narrowMaxMm: 300, beadStockLengthsMm: [2500, 3000], beadWastePercent: 10, cornerTrowelMm: 100 })
    expect(SMM7_MIN_DEDUCT_CM2).toBe(5000)
  })
  it.each<[string, Partial<TakeoffOptions>]>([
    ['no bead stock lengths', { beadStockLengthsMm: [] }],
    ['a stock length of 0', { beadStockLengthsMm: [0] }],
    ['a fractional waste percentage', { beadWastePercent: 2.5 }],
    ['a negative small-voids limit', { minDeductCm2: -1 }],
    ['a fractional narrow limit', { narrowMaxMm: 300.5 }],
    ['a corner trowel of 0 mm', { cornerTrowelMm: 0 }],
    ['a fractional corner trowel', { cornerTrowelMm: 99.5 }],
  ])('%s is a RangeError', (_what, options) => expect(() => takeoffRoom(room([wall()]), options)).toThrow(RangeError))
})

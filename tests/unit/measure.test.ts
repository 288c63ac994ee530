import { describe, expect, it } from 'vitest'
import { formatMetres, formatSquareMetres, parseMetres, parseSquareMetres, rectCm2 } from '../../shared/utils/measure'
import { roomTotals, surfaceNetCm2 } from '../../shared/utils/room-area'

// Arithmetic only (no trade figures): wall = length x height less openings, ceiling = length x
// width (../shared/DOMAIN.md, "Areas", common practice). Metres with two decimals on screen.
describe('parseMetres', () => {
  it.each([
    ['2.4', 2400], ['2.40', 2400], ['2,4', 2400], ['2', 2000], ['0.9', 900], ['.9', 900], ['12.345', 12345], [' 3.00 ', 3000], ['2.', 2000],
  ])('%s m -> %i mm', (input, mm) => expect(parseMetres(input)).toBe(mm))
  it.each(['', '.', 'abc', '-1', '1.2345', '2.4.1', '1e3', '1000'])('%s is not a length', input => expect(parseMetres(input)).toBeNull())
})

describe('formatting', () => {
  it.each([[2400, '2.40'], [2405, '2.41'], [2404, '2.40'], [0, '0.00'], [12345, '12.35']])('%i mm -> %s m', (mm, text) => expect(formatMetres(mm)).toBe(text))
  it.each([[132600, '13.26'], [50, '0.01'], [49, '0.00'], [1_000_000, '100.00']])('%i cm² -> %s m²', (cm2, text) => expect(formatSquareMetres(cm2)).toBe(text))
  it.each([['0.5', 5000], ['1.25', 12500], ['3', 30000]])('%s m² -> %i cm²', (input, cm2) => expect(parseSquareMetres(input)).toBe(cm2))
})

describe('areas without floating point', () => {
  it.each([
    // 2.55 x 5.2 = 13.26 exactly (a float multiply gives 13.259999...)
    [2550, 5200, 132600],
    [4000, 2400, 96000],
    [1, 1, 0],
    [900, 2000, 18000],
  ])('%i x %i mm = %i cm²', (a, b, cm2) => expect(rectCm2(a, b)).toBe(cm2))
  it('formats 2.55 x 5.2 as 13.26', () => expect(formatSquareMetres(rectCm2(2550, 5200))).toBe('13.26'))
})

describe('the room\'s running total', () => {
  it.each([
    // 4.00 x 2.40 - door 0.90 x 2.00 = 9.60 - 1.80 = 7.80 m²
    ['wall less a door', { kind: 'wall' as const, lengthMm: 4000, secondMm: 2400, openings: [{ widthMm: 900, heightMm: 2000 }] }, 78_000],
    // 4.00 x 2.40 - window 1.20 x 1.00 = 8.40 m²
    ['wall less a window', { kind: 'wall' as const, lengthMm: 4000, secondMm: 2400, openings: [{ widthMm: 1200, heightMm: 1000 }] }, 84_000],
    ['a surface still being typed', { kind: 'wall' as const, lengthMm: 4000, secondMm: null }, 0],
    ['an opening still being typed', { kind: 'wall' as const, lengthMm: 3000, secondMm: 2400, openings: [{ widthMm: 900, heightMm: null }] }, 72_000],
    ['openings bigger than the wall never go below 0', { kind: 'wall' as const, lengthMm: 1000, secondMm: 1000, openings: [{ widthMm: 2000, heightMm: 2000 }] }, 0],
  ])('%s', (_w, s, cm2) => expect(surfaceNetCm2(s)).toBe(cm2))

  it('splits walls, ceilings and reveals, and adds them up', () => {
    const t = roomTotals([
      { kind: 'wall', lengthMm: 4000, secondMm: 2400, openings: [{ widthMm: 1200, heightMm: 1000 }] }, // 8.40
      { kind: 'wall', lengthMm: 3000, secondMm: 2400 }, // 7.20
      { kind: 'chimney-breast', lengthMm: 1200, secondMm: 2400 }, // 2.88
      { kind: 'ceiling', lengthMm: 4000, secondMm: 3000 }, // 12.00
      { kind: 'reveal', lengthMm: 1200, secondMm: 250 }, // 0.30
    ])
    expect(t).toEqual({ wallsCm2: 184_800, ceilingsCm2: 120_000, revealsAndStripsCm2: 3_000, totalCm2: 307_800 })
    expect(formatSquareMetres(t.totalCm2)).toBe('30.78')
  })
})

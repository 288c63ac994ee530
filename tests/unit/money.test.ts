import { describe, expect, it } from 'vitest'
import { formatPence, parsePounds, penceToDecimal } from '../../shared/utils/money'

// Source: Setwell's money format (../shared/LOOK.md: money as £1,234.50) and the rule that money
// is integer pence (STYLE.md). Not trade figures.
describe('parsePounds', () => {
  it.each([
    ['180', 18000],
    ['180.5', 18050],
    ['180.50', 18050],
    ['£1,234.56', 123456],
    [' £ 200 ', 20000],
    ['0.07', 7],
    ['.5', 50],
    ['0', 0],
    ['12,345,678.90', 1234567890],
    // 0.1 + 0.2 style float traps must not leak in
    ['0.29', 29],
    ['1.15', 115],
  ])('%s -> %i pence', (input, pence) => {
    expect(parsePounds(input)).toBe(pence)
  })

  it.each(['', 'abc', '1.234', '12,34', '-5', '£', '1e3', '1,2345', '99999999999999999999'])('%s is not money', (input) => {
    expect(parsePounds(input)).toBeNull()
  })
})

describe('formatPence', () => {
  it.each([
    [123450, '£1,234.50'],
    [0, '£0.00'],
    [7, '£0.07'],
    [-500, '-£5.00'],
    [100000000, '£1,000,000.00'],
  ])('%i -> %s', (pence, text) => {
    expect(formatPence(pence)).toBe(text)
  })

  it('refuses a fraction of a penny', () => {
    expect(() => penceToDecimal(10.5)).toThrow(RangeError)
  })
})

describe('quantities in thousandths', async () => {
  const { formatCount, formatQuantity, parseQuantity } = await import('../../shared/utils/quantity')
  it.each([['8.4', 8400], ['8.40', 8400], ['12,345', 12345], ['3', 3000], ['0.001', 1]])('%s -> %i', (s, n) => expect(parseQuantity(s)).toBe(n))
  it.each(['', '-1', '1.2345', 'abc', '1e3'])('%s is not a quantity', s => expect(parseQuantity(s)).toBeNull())
  it.each([[8400, '8.40'], [12345, '12.345'], [3000, '3'], [1, '0.001'], [12300, '12.30']])('%i -> %s', (n, s) => expect(formatQuantity(n)).toBe(s))
  // bags and packs as counts: no trailing zeros, negatives for a difference
  it.each([[1500, '1.5'], [2000, '2'], [1250, '1.25'], [0, '0'], [-500, '-0.5'], [-2000, '-2'], [1, '0.001']])('count %i -> %s', (n, s) => expect(formatCount(n)).toBe(s))
})

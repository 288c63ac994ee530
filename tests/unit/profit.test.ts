import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import type { JobProfit, JobProfitInput } from '../../shared/utils/profit'
import { isStillOnSite, jobProfit } from '../../shared/utils/profit'
import { JOB_STATUSES, type JobStatus } from '../../shared/utils/jobs'

// Source: DOMAIN.md ("Is the work paying?"): the day rate is (price - materials - other costs) /
// days worked, compared with the day rate the plasterer aims for. Our own rules: labour paid to
// others is a cost too; target price = costs + days x target day rate; difference = price - target
// price; margin = contribution / price x 100 to one decimal; rounding half away from zero
// (+250.5 -> 251, -250.5 -> -251); null day rate for 0 days, null margin for a zero price.
// Every amount below is an invented input, not a trade figure; the arithmetic is beside each case.
// Rules of thumb for the product, not accounting advice: the firm's accountant decides.

const job = (over: Partial<JobProfitInput>): JobProfitInput => ({ priceNetPence: 0, materialsPence: 0, otherCostsPence: 0, labourPaidPence: 0, daysWorked: 0, targetDayRatePence: 0, ...over })
const result = (contributionPence: number, effectiveDayRatePence: number | null, targetPricePence: number, differencePence: number, marginPercent: number | null): JobProfit =>
  ({ contributionPence, effectiveDayRatePence, targetPricePence, differencePence, marginPercent })

describe('jobProfit: worked cases (our own rules on DOMAIN.md\'s day rate)', () => {
  it.each<[string, JobProfitInput, JobProfit]>([
    // 120000 - 15000 - 5000 = 100000; / 4 = 25000; target 20000 + 4 x 20000 = 100000; diff 20000; 100000 / 120000 = 83.33% -> 83.3
    ['whole days, no labour paid', job({ priceNetPence: 120_000, materialsPence: 15_000, otherCostsPence: 5_000, daysWorked: 4, targetDayRatePence: 20_000 }), result(100_000, 25_000, 100_000, 20_000, 83.3)],
    // 300000 - 40000 - 10000 - 60000 = 190000; / 5 = 38000; target 110000 + 5 x 22000 = 220000; diff 80000; 63.33% -> 63.3
    ['labour paid to others is a cost', job({ priceNetPence: 300_000, materialsPence: 40_000, otherCostsPence: 10_000, labourPaidPence: 60_000, daysWorked: 5, targetDayRatePence: 22_000 }), result(190_000, 38_000, 220_000, 80_000, 63.3)],
    // 80000 - 30000 - 10000 - 50000 = -10000 (a loss); / 3 = -3333.33 -> -3333; target 90000 + 3 x 20000 = 150000; diff -70000; -10000 / 80000 = -12.5%
    ['a loss: negative contribution, rate and margin', job({ priceNetPence: 80_000, materialsPence: 30_000, otherCostsPence: 10_000, labourPaidPence: 50_000, daysWorked: 3, targetDayRatePence: 20_000 }), result(-10_000, -3_333, 150_000, -70_000, -12.5)],
    // 150000 - 90000 = 60000 (a profit) but 6 days at 20000 puts the target at 90000 + 120000 = 210000: diff -60000; 60000 / 150000 = 40%
    ['a profit that is still below the target', job({ priceNetPence: 150_000, materialsPence: 30_000, otherCostsPence: 10_000, labourPaidPence: 50_000, daysWorked: 6, targetDayRatePence: 20_000 }), result(60_000, 10_000, 210_000, -60_000, 40)],
    // nothing at all: 0 days -> null rate, 0 price -> null margin
    ['all zero', job({}), result(0, null, 0, 0, null)],
  ])('%s', (_what, input, expected) => expect(jobProfit(input)).toEqual(expected))
})

describe('jobProfit: zero days, zero price (our own rules)', () => {
  it.each<[string, JobProfitInput, JobProfit]>([
    // 50000 - 8000 = 42000; no days -> null rate; target = costs only, 8000; diff 42000; 84%
    ['no days recorded: null day rate, target is the costs', job({ priceNetPence: 50_000, materialsPence: 8_000, targetDayRatePence: 20_000 }), result(42_000, null, 8_000, 42_000, 84)],
    // 0 - 2000 = -2000; / 0.5 = -4000; target 2000 + 0.5 x 20000 = 12000; diff -12000; zero price -> null margin
    ['a free call-back: null margin', job({ materialsPence: 2_000, daysWorked: 0.5, targetDayRatePence: 20_000 }), result(-2_000, -4_000, 12_000, -12_000, null)],
    // 0 price, 0 days, costs 1500: contribution -1500, both nulls; target 1500; diff -1500
    ['zero price and zero days', job({ otherCostsPence: 1_500 }), result(-1_500, null, 1_500, -1_500, null)],
    // target day rate 0: the target price is the costs; 30000 - 5000 = 25000 / 2 = 12500; 83.33% -> 83.3
    ['a target day rate of 0', job({ priceNetPence: 30_000, materialsPence: 5_000, daysWorked: 2 }), result(25_000, 12_500, 5_000, 25_000, 83.3)],
  ])('%s', (_what, input, expected) => expect(jobProfit(input)).toEqual(expected))
})

describe('jobProfit: fractional days, worked exactly (our own rule: up to 3 decimals, read as thousandths)', () => {
  it.each<[string, JobProfitInput, JobProfit]>([
    // 100000 - 10000 = 90000; / 2.5 = 36000; target 10000 + 2.5 x 20000 = 60000; diff 40000; 90%
    ['two and a half days', job({ priceNetPence: 100_000, materialsPence: 10_000, daysWorked: 2.5, targetDayRatePence: 20_000 }), result(90_000, 36_000, 60_000, 40_000, 90)],
    // 1000 / 1.5 = 666.67 -> 667; target 1.5 x 333 = 499.5 -> 500; diff 500; 100%
    ['a day and a half: both roundings', job({ priceNetPence: 1_000, daysWorked: 1.5, targetDayRatePence: 333 }), result(1_000, 667, 500, 500, 100)],
    // 10000 / 0.125 = 80000; target 0.125 x 20000 = 2500; diff 7500
    ['an eighth of a day (an hour of an 8-hour day)', job({ priceNetPence: 10_000, daysWorked: 0.125, targetDayRatePence: 20_000 }), result(10_000, 80_000, 2_500, 7_500, 100)],
    // 100000 / 2.3 = 43478.26 -> 43478; target 2.3 x 19999 = 45997.7 -> 45998; diff 54002
    ['2.3 days', job({ priceNetPence: 100_000, daysWorked: 2.3, targetDayRatePence: 19_999 }), result(100_000, 43_478, 45_998, 54_002, 100)],
    // target 1.005 x 100 = 100.5 -> 101 (in floating point 1.005 * 100 = 100.4999... would give 100); 100 / 1.005 = 99.50 -> 100
    ['1.005 days, where floating point would round the wrong way', job({ priceNetPence: 100, daysWorked: 1.005, targetDayRatePence: 100 }), result(100, 100, 101, -1, 100)],
  ])('%s', (_what, input, expected) => expect(jobProfit(input)).toEqual(expected))
})

describe('jobProfit: exactly half a penny (or half a tenth of a percent) rounds away from zero (our own rule)', () => {
  it.each<[string, JobProfitInput, Partial<JobProfit>]>([
    // day rate: 501 / 2 = 250.5 -> 251
    ['+250.5p a day -> 251', job({ priceNetPence: 501, daysWorked: 2 }), { contributionPence: 501, effectiveDayRatePence: 251 }],
    // 1000 - 1501 = -501; / 2 = -250.5 -> -251 (away from zero, not -250)
    ['-250.5p a day -> -251', job({ priceNetPence: 1_000, materialsPence: 1_501, daysWorked: 2 }), { contributionPence: -501, effectiveDayRatePence: -251, marginPercent: -50.1 }],
    // 1000 - 2001 = -1001; / 4 = -250.25 -> -250
    ['-250.25p a day -> -250', job({ priceNetPence: 1_000, materialsPence: 2_001, daysWorked: 4 }), { contributionPence: -1_001, effectiveDayRatePence: -250 }],
    // 1000 - 2003 = -1003; / 4 = -250.75 -> -251
    ['-250.75p a day -> -251', job({ priceNetPence: 1_000, materialsPence: 2_003, daysWorked: 4 }), { contributionPence: -1_003, effectiveDayRatePence: -251 }],
    // 1 / 2 = 0.5 -> 1; (1 - 2) / 2 = -0.5 -> -1
    ['+0.5p a day -> 1', job({ priceNetPence: 1, daysWorked: 2 }), { effectiveDayRatePence: 1 }],
    ['-0.5p a day -> -1', job({ materialsPence: 1, daysWorked: 2 }), { effectiveDayRatePence: -1 }],
    // target price: 0.5 x 20001 = 10000.5 -> 10001; 2.5 x 20001 = 50002.5 -> 50003
    ['target half a day at 20001 -> 10001', job({ daysWorked: 0.5, targetDayRatePence: 20_001 }), { targetPricePence: 10_001, differencePence: -10_001 }],
    ['target 2.5 days at 20001 -> 50003', job({ priceNetPence: 60_000, daysWorked: 2.5, targetDayRatePence: 20_001 }), { targetPricePence: 50_003, differencePence: 9_997 }],
    // margin: 1 / 2000 x 100 = 0.05 -> 0.1; -1 / 2000 x 100 = -0.05 -> -0.1; 1 / 400 x 100 = 0.25 -> 0.3; 1 / 800 x 100 = 0.125 -> 0.1
    ['margin 0.05% -> 0.1', job({ priceNetPence: 2_000, materialsPence: 1_999 }), { contributionPence: 1, marginPercent: 0.1 }],
    ['margin -0.05% -> -0.1', job({ priceNetPence: 2_000, materialsPence: 2_001 }), { contributionPence: -1, marginPercent: -0.1 }],
    ['margin 0.25% -> 0.3', job({ priceNetPence: 400, materialsPence: 399 }), { marginPercent: 0.3 }],
    ['margin 0.125% -> 0.1', job({ priceNetPence: 800, materialsPence: 799 }), { marginPercent: 0.1 }],
    // 2 / 3 x 100 = 66.67 -> 66.7; -2 / 3 x 100 -> -66.7
    ['margin 66.67% -> 66.7', job({ priceNetPence: 3, materialsPence: 1 }), { marginPercent: 66.7 }],
    ['a tiny loss rounds to a margin of 0, not -0', job({ priceNetPence: 100_000, materialsPence: 100_001 }), { marginPercent: 0 }],
  ])('%s', (_what, input, expected) => {
    const out = jobProfit(input)
    expect(out).toMatchObject(expected)
    if (expected.marginPercent === 0) expect(Object.is(out.marginPercent, 0)).toBe(true)
  })
})

describe('jobProfit: properties of the arithmetic (our own rules)', () => {
  const input = fc.record({
    priceNetPence: fc.nat(100_000_000),
    materialsPence: fc.nat(50_000_000),
    otherCostsPence: fc.nat(50_000_000),
    labourPaidPence: fc.nat(50_000_000),
    daysWorked: fc.integer({ min: 0, max: 100_000 }).map(t => t / 1000), // up to 100 days in thousandths
    targetDayRatePence: fc.nat(1_000_000),
  })

  it('contribution, target price and difference add up; the day rate is the nearest penny, halves away from zero', () => {
    fc.assert(fc.property(input, (i) => {
      const out = jobProfit(i)
      const costs = i.materialsPence + i.otherCostsPence + i.labourPaidPence
      expect(out.contributionPence).toBe(i.priceNetPence - costs)
      expect(out.differencePence).toBe(i.priceNetPence - out.targetPricePence)
      const dayThousandths = BigInt(Math.round(i.daysWorked * 1000))
      // target price: the nearest penny to costs + days x rate
      const targetExact = BigInt(costs) * 1000n + dayThousandths * BigInt(i.targetDayRatePence) // thousandths of a penny
      const targetError = BigInt(out.targetPricePence) * 1000n - targetExact
      expect(targetError > -500n && targetError <= 500n).toBe(true) // half up: an exact half goes up
      if (dayThousandths === 0n) {
        expect(out.effectiveDayRatePence).toBeNull()
        return
      }
      // |rate x days - contribution| <= half a day's penny; at exactly half, the rate is the larger in size
      const rate = BigInt(out.effectiveDayRatePence!)
      const c = BigInt(out.contributionPence)
      const error = rate * dayThousandths - c * 1000n
      expect(2n * (error < 0n ? -error : error) <= dayThousandths).toBe(true)
      if (2n * (error < 0n ? -error : error) === dayThousandths) expect(rate < 0n ? -rate * dayThousandths > -c * 1000n : rate * dayThousandths > c * 1000n).toBe(true)
    }))
  })
})

describe('jobProfit: bad input is a RangeError naming the field (our own rules)', () => {
  const ok = job({ priceNetPence: 100_000, materialsPence: 10_000, daysWorked: 2, targetDayRatePence: 20_000 })
  it.each<[string, Partial<JobProfitInput>, RegExp]>([
    ['a negative price', { priceNetPence: -1 }, /priceNetPence/],
    ['a price with a fraction of a penny', { priceNetPence: 100.5 }, /priceNetPence/],
    ['a price that is not a number', { priceNetPence: Number.NaN }, /priceNetPence/],
    ['an infinite price', { priceNetPence: Number.POSITIVE_INFINITY }, /priceNetPence/],
    ['a price given as a string', { priceNetPence: '1000' as unknown as number }, /priceNetPence/],
    ['negative materials', { materialsPence: -500 }, /materialsPence/],
    ['materials with a fraction', { materialsPence: 0.1 }, /materialsPence/],
    ['other costs not a number', { otherCostsPence: Number.NaN }, /otherCostsPence/],
    ['negative other costs', { otherCostsPence: -1 }, /otherCostsPence/],
    ['labour paid with a fraction', { labourPaidPence: 12.5 }, /labourPaidPence/],
    ['missing labour paid', { labourPaidPence: undefined as unknown as number }, /labourPaidPence/],
    ['a negative target day rate', { targetDayRatePence: -20_000 }, /targetDayRatePence/],
    ['a target day rate with a fraction', { targetDayRatePence: 19_999.5 }, /targetDayRatePence/],
    ['pence beyond a safe integer', { priceNetPence: Number.MAX_SAFE_INTEGER + 1 }, /priceNetPence/],
    ['negative days', { daysWorked: -0.5 }, /daysWorked/],
    ['days not a number', { daysWorked: Number.NaN }, /daysWorked/],
    ['infinite days', { daysWorked: Number.POSITIVE_INFINITY }, /daysWorked/],
    ['days with 4 decimals', { daysWorked: 1.2345 }, /daysWorked/],
    ['a third of a day (no exact decimal)', { daysWorked: 1 / 3 }, /daysWorked/],
    ['days written with an exponent', { daysWorked: 1e-7 }, /daysWorked/],
    ['a target price too large to hold exactly', { targetDayRatePence: Number.MAX_SAFE_INTEGER, daysWorked: 2 }, /targetPricePence/],
  ])('%s', (_what, over, field) => {
    const call = () => jobProfit({ ...ok, ...over })
    expect(call).toThrow(RangeError)
    expect(call).toThrow(field)
  })
})

// Our own rule (issue 18): a job still on site (booked or on site, not yet marked finished) has
// figures so far only; finished, invoiced and paid jobs are judged. Cancelled jobs never reach the
// table, but are not "on site" either.
describe('isStillOnSite', () => {
  it.each<[JobStatus, boolean]>([
    ['booked', true],
    ['in-progress', true],
    ['finished', false],
    ['invoiced', false],
    ['paid', false],
    ['cancelled', false],
  ])('%s: %s', (status, want) => expect(isStillOnSite(status)).toBe(want))
  it('covers every status', () => expect(JOB_STATUSES.length).toBe(6))
})

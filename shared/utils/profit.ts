// Is a job paying? What the job left after its costs, the day rate that works out at for the days
// it really took, and what it would have had to be priced at to earn the day rate the firm aims for.
//
// A rule of thumb for the product, not accounting or tax advice: it leaves out overheads, the
// firm's own time off site, VAT and tax, and the firm's accountant decides what the books say.
// The product says so wherever these figures are shown.
//
// Source: DOMAIN.md ("Is the work paying?"): the plasterer thinks in a day rate, (price - materials
// - other costs) / days worked, compared with the day rate they aim for. Our own rules on top:
// - labour paid to others on the job (a labourer, a second plasterer) is a cost like materials,
//   so contribution = price - materials - other costs - labour paid;
// - target price = materials + other costs + labour paid + days worked x the target day rate;
//   difference = price - target price (positive: priced above target; negative: below);
// - margin = contribution / price x 100, to one decimal; null for a zero price; effective day rate
//   null for zero days (nothing to divide by).
//
// Arithmetic (our rules): pence are whole numbers, 0 or more; days worked are 0 or more with at
// most 3 decimals (half days 2.5, quarter days 0.25, an hour of an 8-hour day 0.125), read from
// their decimal digits as thousandths so nothing is lost to floating point; every division is
// exact in BigInt and rounded once. Rounding is half away from zero: +250.5p -> 251p and
// -250.5p -> -251p, so a loss rounds to the same size as a profit of the same size (only the
// effective day rate and the margin can be negative). Anything else is a RangeError naming the field.

import type { JobStatus } from './jobs'

export interface JobProfitInput {
  /** The price of the job, excluding VAT. */
  priceNetPence: number
  materialsPence: number
  otherCostsPence: number
  /** Paid to others who worked on the job (labourer, second plasterer). */
  labourPaidPence: number
  /** Days on site; may be fractional (2.5 for two and a half days). */
  daysWorked: number
  targetDayRatePence: number
}

export interface JobProfit {
  /** Price less materials, other costs and labour paid to others. */
  contributionPence: number
  /** Contribution per day worked, to the penny; null when no days were worked. */
  effectiveDayRatePence: number | null
  /** Costs plus days worked at the target day rate, to the penny. */
  targetPricePence: number
  /** Price less target price. */
  differencePence: number
  /** Contribution as a percentage of the price, to one decimal; null for a zero price. */
  marginPercent: number | null
}

const PENCE_FIELDS = ['priceNetPence', 'materialsPence', 'otherCostsPence', 'labourPaidPence', 'targetDayRatePence'] as const

function pence(value: unknown, field: string): bigint {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value < 0) throw new RangeError(`${field} must be a whole number of pence, 0 or more, got ${String(value)}`)
  return BigInt(value)
}

/** Days as thousandths (2.5 -> 2500n); RangeError naming the field when negative, not finite or over 3 decimals. */
function dayThousandths(value: unknown, field: string): bigint {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) throw new RangeError(`${field} must be a number of days, 0 or more, got ${String(value)}`)
  // String() gives the shortest decimal that reads back as the number: 2.5 -> '2.5'; 1e-7 -> '1e-7' (refused)
  const m = /^(\d+)(?:\.(\d+))?$/.exec(String(value))
  if (!m || (m[2] ?? '').length > 3) throw new RangeError(`${field} may have at most 3 decimals, got ${String(value)}`)
  return BigInt(m[1]!) * 1000n + BigInt((m[2] ?? '').padEnd(3, '0') || '0')
}

/** n / d rounded to the nearest whole number, halves away from zero; d > 0. */
function divRound(n: bigint, d: bigint): bigint {
  const magnitude = ((n < 0n ? -n : n) * 2n + d) / (2n * d)
  return n < 0n ? -magnitude : magnitude
}

function toSafe(n: bigint, field: string): number {
  const x = Number(n)
  if (!Number.isSafeInteger(x)) throw new RangeError(`${field} is too large`)
  return x
}

/**
 * The profitability of one job (see the file's note for the rules and rounding):
 * - contributionPence = price - materials - other costs - labour paid;
 * - effectiveDayRatePence = contribution / days worked, to the penny (null for 0 days);
 * - targetPricePence = materials + other costs + labour paid + days worked x target day rate, to the penny;
 * - differencePence = price - target price;
 * - marginPercent = contribution / price x 100, to one decimal (null for a zero price).
 * Rules of thumb for the product, not accounting advice.
 */
export function jobProfit(input: JobProfitInput): JobProfit {
  const [price, materials, other, labour, target] = PENCE_FIELDS.map(field => pence(input[field], field)) as [bigint, bigint, bigint, bigint, bigint]
  const days = dayThousandths(input.daysWorked, 'daysWorked')

  const costs = materials + other + labour
  const contribution = price - costs
  const targetPrice = costs + divRound(days * target, 1000n)
  const marginTenths = price === 0n ? null : divRound(contribution * 1000n, price) // percent x 10

  return {
    contributionPence: toSafe(contribution, 'contributionPence'),
    effectiveDayRatePence: days === 0n ? null : toSafe(divRound(contribution * 1000n, days), 'effectiveDayRatePence'),
    targetPricePence: toSafe(targetPrice, 'targetPricePence'),
    differencePence: toSafe(price - targetPrice, 'differencePence'),
    marginPercent: marginTenths === null ? null : Number(marginTenths) / 10,
  }
}

// ---------------------------------------------------------------------------------------------
// Provisional: a job still on site

/**
 * The statuses of a job still on site (our rule): booked or on site, not yet marked finished. Its
 * figures are so far only (a deposit may be all that is invoiced, more days may come), so the
 * profit table shows it as provisional, apart from the totals unless asked for, and never judges
 * its day rate against the target. Finished, invoiced and paid jobs are judged; cancelled ones are
 * not in the table at all.
 */
export const STILL_ON_SITE_STATUSES = ['booked', 'in-progress'] as const satisfies readonly JobStatus[]

/** Whether a job's profit figures are provisional: it is still on site (see STILL_ON_SITE_STATUSES). */
export function isStillOnSite(status: JobStatus): boolean {
  return (STILL_ON_SITE_STATUSES as readonly JobStatus[]).includes(status)
}

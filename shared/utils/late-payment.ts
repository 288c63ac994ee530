// Statutory late-payment claim on a business-to-business invoice: the due date when none was
// agreed, the interest rate, the interest to a day and the fixed compensation sum.
//
// A rule of thumb for the product, not legal advice: the firm's solicitor or accountant, and the
// court, decide what is owed. The product says so wherever these figures are shown.
//
// Sources (../shared/DOMAIN.md, "Money rules", "Late payment"):
// - Late Payment of Commercial Debts (Interest) Act 1998 (England, Wales and Northern Ireland;
//   Scotland has its own rate order with the same formula):
//   - s.1: the debt carries simple interest;
//   - s.4(5) as enacted (since SI 2015/1336, s.4(2A)(b) and (2H)): with no agreed payment date the
//     relevant day is the last day of the 30 days beginning with the later of the work being done
//     and the purchaser having notice of the debt (the invoice): `defaultDueDate`;
//   - s.4(2): interest runs from the day after the relevant day;
//   - s.5A: a fixed sum per debt: under GBP 1,000 -> 40, under GBP 10,000 -> 70, otherwise 100.
// - Late Payment of Commercial Debts (Rate of Interest) (No. 3) Order 2002 (SI 2002/1675) art. 4:
//   8% a year over the Bank of England official dealing rate (Bank Rate) in force on the 31 December
//   (interest starting 1 January to 30 June) or 30 June (starting 1 July to 31 December)
//   immediately before interest starts; that rate is fixed for the life of the debt.
// - Daily interest = debt x rate / 365 (DOMAIN.md), in leap years too.
//
// Our rules: interest is worked exactly in integers (the rate in hundredths of a percent, BigInt
// for the product) and rounded half up to the penny once, at the end. A debt of 0 claims nothing
// (no interest, no fixed sum). Out of scope: agreed payment dates (pass the agreed date as
// `dueDate`; the Act's caps on long agreed terms are not applied), part payments, public-authority
// purchasers and recovery costs beyond the fixed sum (s.5A(2A)).
import { dayNumber, isoFromDayNumber } from './dates'

export interface BankRateChange { from: string, ratePercent: number } // ISO date the rate took effect

export interface LatePaymentClaim {
  /** The day after the due date (Act s.4(2)). */
  interestStart: string
  /** 8 + the Bank Rate in force on the reference day (SI 2002/1675 art. 4). */
  ratePercent: number
  /** Calendar days from the due date to asOf; 0 when not yet overdue. */
  days: number
  interestPence: number
  /** Fixed compensation (Act s.5A); 0 when not yet overdue. */
  fixedSumPence: number
  totalPence: number
}

/**
 * Bank Rate changes since March 2009, each with the day it took effect. A seed for the firm's own
 * editable table, not a constant to calculate with.
 *
 * Source: ../shared/DOMAIN.md, "Bank Rate changes since 2009 (from memory of the Bank of England's
 * history; check against its published table before relying)". These rows are from memory of the
 * Bank of England's history, not copied from the Bank's published table: check them against it
 * before relying on them. The later rows agree with DOMAIN.md's news-report list ("5.25% to 1 Aug
 * 2024, 5.00%, 4.75% from Nov 2024, 4.50% from 6 Feb 2025, 4.25% from 8 May 2025, 4.00% from
 * 7 Aug 2025, 3.75% from Dec 2025"), which gives no day for November 2024 and December 2025; the
 * days here are the from-memory list's.
 */
export const DEFAULT_BANK_RATES: BankRateChange[] = [
  { from: '2009-03-05', ratePercent: 0.5 }, // DOMAIN.md, from memory: "0.5% from 5 Mar 2009"
  { from: '2016-08-04', ratePercent: 0.25 }, // DOMAIN.md, from memory: "0.25% 4 Aug 2016"
  { from: '2017-11-02', ratePercent: 0.5 }, // DOMAIN.md, from memory: "0.5% 2 Nov 2017"
  { from: '2018-08-02', ratePercent: 0.75 }, // DOMAIN.md, from memory: "0.75% 2 Aug 2018"
  { from: '2020-03-11', ratePercent: 0.25 }, // DOMAIN.md, from memory: "0.25% 11 Mar 2020"
  { from: '2020-03-19', ratePercent: 0.1 }, // DOMAIN.md, from memory: "0.1% 19 Mar 2020"
  { from: '2021-12-16', ratePercent: 0.25 }, // DOMAIN.md, from memory: "0.25% 16 Dec 2021"
  { from: '2022-02-03', ratePercent: 0.5 }, // DOMAIN.md, from memory: "0.5% 3 Feb 2022"
  { from: '2022-03-17', ratePercent: 0.75 }, // DOMAIN.md, from memory: "0.75% 17 Mar 2022"
  { from: '2022-05-05', ratePercent: 1 }, // DOMAIN.md, from memory: "1% 5 May 2022"
  { from: '2022-06-16', ratePercent: 1.25 }, // DOMAIN.md, from memory: "1.25% 16 Jun 2022"
  { from: '2022-08-04', ratePercent: 1.75 }, // DOMAIN.md, from memory: "1.75% 4 Aug 2022"
  { from: '2022-09-22', ratePercent: 2.25 }, // DOMAIN.md, from memory: "2.25% 22 Sep 2022"
  { from: '2022-11-03', ratePercent: 3 }, // DOMAIN.md, from memory: "3% 3 Nov 2022"
  { from: '2022-12-15', ratePercent: 3.5 }, // DOMAIN.md, from memory: "3.5% 15 Dec 2022"
  { from: '2023-02-02', ratePercent: 4 }, // DOMAIN.md, from memory: "4% 2 Feb 2023"
  { from: '2023-03-23', ratePercent: 4.25 }, // DOMAIN.md, from memory: "4.25% 23 Mar 2023"
  { from: '2023-05-11', ratePercent: 4.5 }, // DOMAIN.md, from memory: "4.5% 11 May 2023"
  { from: '2023-06-22', ratePercent: 5 }, // DOMAIN.md, from memory: "5% 22 Jun 2023"
  { from: '2023-08-03', ratePercent: 5.25 }, // DOMAIN.md, from memory: "5.25% 3 Aug 2023"
  { from: '2024-08-01', ratePercent: 5 }, // DOMAIN.md, from memory: "5% 1 Aug 2024"
  { from: '2024-11-07', ratePercent: 4.75 }, // DOMAIN.md, from memory: "4.75% 7 Nov 2024"
  { from: '2025-02-06', ratePercent: 4.5 }, // DOMAIN.md, from memory: "4.5% 6 Feb 2025"
  { from: '2025-05-08', ratePercent: 4.25 }, // DOMAIN.md, from memory: "4.25% 8 May 2025"
  { from: '2025-08-07', ratePercent: 4 }, // DOMAIN.md, from memory: "4% 7 Aug 2025"
  { from: '2025-12-18', ratePercent: 3.75 }, // DOMAIN.md, from memory: "3.75% 18 Dec 2025"
]

const STATUTORY_MARGIN_HUNDREDTHS = 800 // the 8% of SI 2002/1675 art. 4

/** The last day of the 30 days beginning with the later of the two dates (Act s.4(5) as enacted): the later date + 29 days. */
export function defaultDueDate(workDone: string, invoiceReceived: string): string {
  const later = Math.max(dayNumber(workDone, 'workDone'), dayNumber(invoiceReceived, 'invoiceReceived'))
  return isoFromDayNumber(later + 29, 'the due date')
}

/** The 31 December or 30 June whose Bank Rate fixes the rate for interest starting on interestStart (SI 2002/1675 art. 4). */
export function referenceDate(interestStart: string): string {
  dayNumber(interestStart, 'interestStart')
  const year = Number(interestStart.slice(0, 4))
  const month = Number(interestStart.slice(5, 7))
  if (month <= 6) {
    if (year === 0) throw new RangeError('interestStart is too early: its reference day would be before the year 0000')
    return `${String(year - 1).padStart(4, '0')}-12-31`
  }
  return `${String(year).padStart(4, '0')}-06-30`
}

/** ratePercent as whole hundredths of a percent (4.25 -> 425); RangeError when it has more than 2 decimals. */
function hundredths(ratePercent: unknown, field: string): number {
  if (typeof ratePercent !== 'number' || !Number.isFinite(ratePercent) || ratePercent < 0 || ratePercent > 100) {
    throw new RangeError(`${field} must be a percentage from 0 to 100, got ${String(ratePercent)}`)
  }
  const h = Math.round(ratePercent * 100)
  if (Math.abs(ratePercent * 100 - h) > 1e-6) throw new RangeError(`${field} must have at most 2 decimals, got ${ratePercent}`)
  return h
}

/** The Bank Rate (in hundredths) in force on the reference day: the latest change on or before it. The table may come in any order. */
function bankRateOn(reference: string, bankRates: readonly BankRateChange[]): number {
  if (!Array.isArray(bankRates) || bankRates.length === 0) throw new RangeError('bankRates must list at least one Bank Rate change')
  const changes = bankRates.map((c, i) => {
    if (c === null || typeof c !== 'object') throw new RangeError(`bankRates[${i}] must be { from, ratePercent }`)
    return { day: dayNumber(c.from, `bankRates[${i}].from`), from: c.from, h: hundredths(c.ratePercent, `bankRates[${i}].ratePercent`) }
  }).sort((a, b) => a.day - b.day)
  for (let i = 1; i < changes.length; i++) {
    if (changes[i]!.day === changes[i - 1]!.day && changes[i]!.h !== changes[i - 1]!.h) {
      throw new RangeError(`bankRates gives two different rates from ${changes[i]!.from}`)
    }
  }
  const refDay = dayNumber(reference, 'reference day')
  const inForce = changes.filter(c => c.day <= refDay).at(-1)
  if (!inForce) throw new RangeError(`bankRates has no rate in force on ${reference}, the reference day (SI 2002/1675 art. 4): add the Bank Rate in force then`)
  return inForce.h
}

/** Fixed compensation by the size of the debt (Act s.5A). */
function fixedSumPence(debtPence: number): number {
  if (debtPence < 100_000) return 4_000
  if (debtPence < 1_000_000) return 7_000
  return 10_000
}

/**
 * The claim on a debt as of a day: simple interest at 8% over the reference Bank Rate from the day
 * after dueDate to asOf, plus the fixed sum once it is overdue. See the header for the sources.
 */
export function latePaymentClaim(input: { debtPence: number, dueDate: string, asOf: string, bankRates: BankRateChange[] }): LatePaymentClaim {
  if (input === null || typeof input !== 'object') throw new RangeError('latePaymentClaim needs { debtPence, dueDate, asOf, bankRates }')
  const { debtPence, dueDate, asOf, bankRates } = input
  if (!Number.isSafeInteger(debtPence) || debtPence < 0) throw new RangeError(`debtPence must be a whole number of pence, 0 or more, got ${String(debtPence)}`)
  const due = dayNumber(dueDate, 'dueDate')
  const now = dayNumber(asOf, 'asOf')
  const interestStart = isoFromDayNumber(due + 1, 'interestStart (the day after dueDate)')
  const rateHundredths = STATUTORY_MARGIN_HUNDREDTHS + bankRateOn(referenceDate(interestStart), bankRates)
  const ratePercent = rateHundredths / 100

  const days = Math.max(0, now - due)
  if (days === 0 || debtPence === 0) return { interestStart, ratePercent, days, interestPence: 0, fixedSumPence: 0, totalPence: debtPence }

  // debt x (rate / 10000) x days / 365, half up: floor((2 x num + den) / (2 x den))
  const num = BigInt(debtPence) * BigInt(rateHundredths) * BigInt(days)
  const den = 10_000n * 365n
  const interestPence = Number((2n * num + den) / (2n * den))
  const fixed = fixedSumPence(debtPence)
  const totalPence = debtPence + interestPence + fixed
  if (!Number.isSafeInteger(totalPence)) throw new RangeError('debtPence is too large to total exactly')
  return { interestStart, ratePercent, days, interestPence, fixedSumPence: fixed, totalPence }
}

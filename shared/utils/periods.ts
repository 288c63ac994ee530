// Tax periods a small firm works to: the VAT quarter a date falls in (with the day its return and
// payment are due), and the CIS tax month a date falls in (with the days the contractor's monthly
// return and payment are due).
//
// Rules of thumb for the product, not tax advice: the firm's accountant and HMRC's guidance decide.
// HMRC tells each business its own VAT periods and due dates (on the VAT registration certificate
// and in its VAT online account); a business on non-standard periods, annual or monthly returns,
// or paying by Direct Debit has other dates. Where the product shows these dates it says so.
//
// Sources:
// - VAT quarters and staggers (as briefed; DOMAIN.md does not give them): stagger 1 quarters end in
//   March, June, September and December; stagger 2 in April, July, October and January; stagger 3
//   in May, August, November and February.
// - VAT return and payment due one calendar month and seven days after the end of the quarter
//   (gov.uk "VAT Returns"; as briefed, DOMAIN.md does not give the due date). "One calendar month
//   after" a quarter end (always a month end) is read as the end of the following month, then
//   + 7 days: 31 March -> 30 April -> 7 May; 30 April -> 31 May -> 7 June; 28/29 February ->
//   31 March -> 7 April; 31 January -> 28/29 February -> 7 March.
// - CIS tax month from the 6th of one month to the 5th of the next; the contractor's monthly return
//   is due on the 19th after it ends (DOMAIN.md, "Money rules", CIS; gov.uk "What you must do as a
//   CIS contractor"). Payment due on the 22nd (as briefed; the same gov.uk guide gives the 22nd
//   for electronic payment and the 19th for payment by post, which the product does not model).
//
// Dates are ISO YYYY-MM-DD strings, worked as UTC calendar dates (no time zone, no time of day).
// A string that is not a real date is a RangeError naming the field.
import { daysInMonth, isoDay } from './dates'

export interface VatQuarter { start: string, end: string, returnDue: string }
export interface CisTaxMonth { start: string, end: string, returnDue: string, paymentDue: string }

interface Ymd { y: number, m: number, d: number } // m is 1 to 12

/** Parses an ISO date; RangeError naming the field when it is not a real YYYY-MM-DD date. */
function parseIso(iso: unknown, field: string): Ymd {
  const match = typeof iso === 'string' ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso) : null
  if (!match) throw new RangeError(`${field} must be an ISO date (YYYY-MM-DD), got ${String(iso)}`)
  isoDay(iso, field) // RangeError naming the field for 31 April, 29 February 2027, month 13...
  return { y: Number(match[1]), m: Number(match[2]), d: Number(match[3]) }
}

/** The month `months` after (or before, when negative) month m of year y. */
function addMonths(y: number, m: number, months: number): { y: number, m: number } {
  const index = y * 12 + (m - 1) + months
  return { y: Math.floor(index / 12), m: (index % 12 + 12) % 12 + 1 }
}

/** Formats a calendar date; RangeError naming the field when the result falls outside 0000 to 9999. */
function formatIso({ y, m, d }: Ymd, field: string): string {
  if (y < 0 || y > 9999) throw new RangeError(`${field}: the period falls outside the years 0000 to 9999`)
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`
}

/**
 * The VAT quarter holding `date` for a business on `stagger` 1, 2 or 3:
 * - start: the first day of the quarter's first month; end: the last day of its last month;
 * - returnDue: one calendar month and seven days after the end (gov.uk "VAT Returns"), worked as
 *   the last day of the month after the end, + 7 days; the payment is due the same day.
 * Rules of thumb for the product, not tax advice (see the file's note).
 */
export function vatQuarter(date: string, stagger: 1 | 2 | 3): VatQuarter {
  const { y, m } = parseIso(date, 'date')
  if (stagger !== 1 && stagger !== 2 && stagger !== 3) throw new RangeError(`stagger must be 1, 2 or 3, got ${String(stagger)}`)
  // Quarters end in months congruent to stagger + 2 (mod 3): stagger 1 -> 3, 6, 9, 12; 2 -> 4, 7,
  // 10, 1; 3 -> 5, 8, 11, 2. Months forward from m to the quarter's last month: 0, 1 or 2.
  const toEnd = (((stagger + 2 - m) % 3) + 3) % 3
  const last = addMonths(y, m, toEnd)
  const first = addMonths(last.y, last.m, -2)
  const end = { ...last, d: daysInMonth(last.y, last.m) }
  const afterEnd = addMonths(last.y, last.m, 1)
  const monthAfter = { ...afterEnd, d: daysInMonth(afterEnd.y, afterEnd.m) } // "one calendar month" after a month end
  // + 7 days from a month end always lands on the 7th of the next month
  const due = { ...addMonths(monthAfter.y, monthAfter.m, 1), d: 7 }
  return {
    start: formatIso({ ...first, d: 1 }, 'date'),
    end: formatIso(end, 'date'),
    returnDue: formatIso(due, 'date'),
  }
}

/**
 * The CIS tax month holding `date`: from the 6th of one month to the 5th of the next (so 5 January
 * is in the month 6 December to 5 January, and 6 January starts a new one). The contractor's
 * monthly return is due on the 19th and the payment on the 22nd of the month it ends in (DOMAIN.md;
 * gov.uk "What you must do as a CIS contractor"). Rules of thumb, not tax advice (see the file's note).
 */
export function cisTaxMonth(date: string): CisTaxMonth {
  const { y, m, d } = parseIso(date, 'date')
  const startMonth = d >= 6 ? { y, m } : addMonths(y, m, -1)
  const endMonth = addMonths(startMonth.y, startMonth.m, 1)
  return {
    start: formatIso({ ...startMonth, d: 6 }, 'date'),
    end: formatIso({ ...endMonth, d: 5 }, 'date'),
    returnDue: formatIso({ ...endMonth, d: 19 }, 'date'),
    paymentDue: formatIso({ ...endMonth, d: 22 }, 'date'),
  }
}

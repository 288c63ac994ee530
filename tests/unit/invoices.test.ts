import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import type { AgeBucket, DraftInvoiceLine, InvoiceStatus, JobPrice, StatusInput } from '../../shared/utils/invoices'
import { daysBetween } from '../../shared/utils/dates'
import { ageBucket, dueDateFor, finalFromQuote, finalLines, invoiceStatus, outstandingPence, overpaidPence, partLines, prefixesClash } from '../../shared/utils/invoices'

// Sources (../shared/DOMAIN.md). CIS is deducted from the labour part only, so an invoice's labour
// net must stay apart from its materials ("Money rules", CIS: gov.uk "What you must do as a CIS
// contractor: make deductions and pay subcontractors"; HMRC COG909250), and what the customer owes
// is the gross less that deduction. Where no date was agreed a business debt is due 30 days after
// the invoice ("Money rules", Late payment: Late Payment of Commercial Debts (Interest) Act 1998).
// Everything else here is our own rule, written in shared/utils/invoices.ts: the status follows
// from dates, payments and credit notes and is never set by hand; the age buckets; a deposit or
// stage is split between labour and materials in the job's own proportion, half a penny rounded
// up; the final invoice is the price less what was invoiced before. Prices and dates are invented
// inputs; the arithmetic is written beside each case.

const net = (lines: DraftInvoiceLine[], kind: 'labour' | 'materials'): number =>
  lines.filter(l => l.kind === kind).reduce((s, l) => s + l.unitPence * l.quantityX1000 / 1000, 0)
/** What a set of lines claims, labour and materials apart (as invoicedForJob sums it). */
const claimed = (lines: DraftInvoiceLine[]) => ({ labourNetPence: net(lines, 'labour'), materialsNetPence: net(lines, 'materials') })
/** The lines as [kind, pence], to compare figures without the descriptions. */
const figures = (lines: DraftInvoiceLine[]) => lines.map(l => [l.kind, l.unitPence] as const)
const job = (labourNetPence: number, materialsNetPence: number): JobPrice => ({ reference: 'J-0007', labourNetPence, materialsNetPence })
/** a x num / den rounded half up, by exact integer arithmetic, to check against. */
const halfUp = (a: number, num: number, den: number): number => Number((2n * BigInt(a) * BigInt(num) + BigInt(den)) / (2n * BigInt(den)))

// £120.00 due, issued 2 March 2026 on 30 days' terms: due 1 April 2026.
const base: StatusInput = { issuedOn: '2026-03-02', dueOn: '2026-04-01', amountDuePence: 120_00, paidPence: 0, creditedPence: 0, today: '2026-03-10' }

describe('invoiceStatus: follows from the dates, payments and credit notes (our own rule)', () => {
  it.each<[string, Partial<StatusInput>, InvoiceStatus]>([
    ['not issued: a draft', { issuedOn: null, dueOn: null }, 'draft'],
    ['a draft stays a draft however late it is', { issuedOn: null, dueOn: null, today: '2027-01-01' }, 'draft'],
    ['issued, nothing paid, not yet due', {}, 'issued'],
    ['£40.00 of £120.00 paid', { paidPence: 40_00 }, 'part-paid'],
    ['paid exactly', { paidPence: 120_00 }, 'paid'],
    ['overpaid by £5.00: still paid (the overpayment is flagged apart)', { paidPence: 125_00 }, 'paid'],
    ['the day after the due date, nothing paid', { today: '2026-04-02' }, 'overdue'],
    ['part paid and past the due date: overdue wins', { paidPence: 40_00, today: '2026-04-02' }, 'overdue'],
    ['months late, nothing paid', { today: '2026-09-30' }, 'overdue'],
    ['due today is not overdue', { today: '2026-04-01' }, 'issued'],
    ['due today and part paid: part paid, not overdue', { paidPence: 40_00, today: '2026-04-01' }, 'part-paid'],
    ['paid in full after the due date: paid, not overdue', { paidPence: 120_00, today: '2026-05-01' }, 'paid'],
    ['credited in full', { creditedPence: 120_00 }, 'credited'],
    ['credited in full after the due date: credited, not overdue', { creditedPence: 120_00, today: '2026-05-01' }, 'credited'],
    ['credited in full after a part payment (the payment shows as overpaid)', { paidPence: 40_00, creditedPence: 120_00 }, 'credited'],
    ['£20.00 credited, nothing paid yet', { creditedPence: 20_00 }, 'issued'],
    ['£20.00 credited, then the other £100.00 paid', { creditedPence: 20_00, paidPence: 100_00 }, 'paid'],
    ['£20.00 credited, £50.00 paid', { creditedPence: 20_00, paidPence: 50_00 }, 'part-paid'],
    ['£20.00 credited and the rest late', { creditedPence: 20_00, today: '2026-04-02' }, 'overdue'],
    // paid is payments less refunds (StatusInput): £120.00 in, £50.00 refunded -> £70.00
    ['paid, then £50.00 refunded: part paid again', { paidPence: 120_00 - 50_00 }, 'part-paid'],
    ['paid, then refunded in full: issued again', { paidPence: 120_00 - 120_00 }, 'issued'],
    ['paid, then refunded in full after the due date: overdue', { paidPence: 120_00 - 120_00, today: '2026-04-02' }, 'overdue'],
    ['an overpayment of £5.00 refunded: still paid', { paidPence: 125_00 - 5_00 }, 'paid'],
    // DOMAIN.md "Money rules", CIS (gov.uk CIS guidance; COG909250): labour 500, materials 200, VAT 140 -> gross 840,
    // deduction 100 -> the contractor owes 740; 740 paid settles it although the gross is 840
    ['under CIS: the amount due is the gross less the deduction', { amountDuePence: 840_00 - 100_00, paidPence: 740_00 }, 'paid'],
  ])('%s', (_what, change, status) => expect(invoiceStatus({ ...base, ...change })).toBe(status))
})

describe('outstandingPence and overpaidPence: never below 0 (our own rule)', () => {
  it.each<[string, number, number, number, number, number]>([
    // what, amount due, paid, credited -> outstanding, overpaid
    ['nothing paid', 120_00, 0, 0, 120_00, 0],
    ['part paid', 120_00, 40_00, 0, 80_00, 0],
    ['paid exactly', 120_00, 120_00, 0, 0, 0],
    ['overpaid by £5.00', 120_00, 125_00, 0, 0, 5_00],
    ['credited in full', 120_00, 0, 120_00, 0, 0],
    ['part credited, the rest paid', 120_00, 100_00, 20_00, 0, 0],
    ['part credited, then paid in full as well', 120_00, 120_00, 20_00, 0, 20_00],
    ['a refund of all that was paid', 120_00, 120_00 - 120_00, 0, 120_00, 0],
  ])('%s', (_what, amountDuePence, paidPence, creditedPence, outstanding, overpaid) => {
    const i = { amountDuePence, paidPence, creditedPence }
    expect([outstandingPence(i), overpaidPence(i)]).toEqual([outstanding, overpaid])
  })

  it('for any figures: both at least 0, at most one above 0, and their difference is what is owed', () => {
    fc.assert(fc.property(fc.nat(10_000_000), fc.integer({ min: -10_000_000, max: 10_000_000 }), fc.nat(10_000_000), (amountDuePence, paidPence, creditedPence) => {
      const i = { amountDuePence, paidPence, creditedPence }
      const [o, p] = [outstandingPence(i), overpaidPence(i)]
      expect(o).toBeGreaterThanOrEqual(0)
      expect(p).toBeGreaterThanOrEqual(0)
      expect(o === 0 || p === 0).toBe(true)
      expect(o - p).toBe(amountDuePence - paidPence - creditedPence)
    }))
  })
})

describe('daysBetween: whole calendar days, b - a', () => {
  it.each<[string, string, number]>([
    ['2026-03-31', '2026-03-31', 0],
    ['2026-03-31', '2026-04-01', 1],
    ['2026-04-01', '2026-03-31', -1],
    ['2026-03-28', '2026-03-30', 2], // UK clocks go forward on 29 March 2026: still 2 days, not 1.96
    ['2026-10-24', '2026-10-26', 2], // and back on 25 October 2026
    ['2027-02-28', '2027-03-01', 1],
    ['2028-02-28', '2028-03-01', 2], // 2028 is a leap year: 29 February between
    ['2028-01-01', '2029-01-01', 366],
    ['2026-12-31', '2027-01-01', 1],
  ])('%s to %s: %i', (a, b, days) => expect(daysBetween(a, b)).toBe(days))
})

describe('ageBucket: by the days since the due date (our own buckets)', () => {
  it.each<[string, string, string, AgeBucket]>([
    // what, due on, today -> bucket; due on 31 March 2026, so the buckets cross month ends
    ['not yet due (30 days to go)', '2026-03-31', '2026-03-01', 'not-due'],
    ['0 days late: due today', '2026-03-31', '2026-03-31', 'not-due'],
    ['1 day late (31 Mar + 1 = 1 Apr)', '2026-03-31', '2026-04-01', '1-30'],
    ['30 days late (+30 = 30 Apr)', '2026-03-31', '2026-04-30', '1-30'],
    ['31 days late (+31 = 1 May)', '2026-03-31', '2026-05-01', '31-60'],
    ['60 days late (+60 = 30 May)', '2026-03-31', '2026-05-30', '31-60'],
    ['61 days late (+61 = 31 May)', '2026-03-31', '2026-05-31', '61-90'],
    ['90 days late (+90 = 29 Jun)', '2026-03-31', '2026-06-29', '61-90'],
    ['91 days late (+91 = 30 Jun)', '2026-03-31', '2026-06-30', 'over-90'],
    ['a year late', '2026-03-31', '2027-03-31', 'over-90'],
    ['across the year end: 31 Dec to 31 Jan is 31 days', '2026-12-31', '2027-01-31', '31-60'],
    ['across the year end: 31 Dec to 30 Jan is 30 days', '2026-12-31', '2027-01-30', '1-30'],
    // 2028 is a leap year
    ['due 28 Feb 2028, today the leap day: 1 day late', '2028-02-28', '2028-02-29', '1-30'],
    ['due on the leap day, today the leap day', '2028-02-29', '2028-02-29', 'not-due'],
    ['due on the leap day, today 1 Mar: 1 day late', '2028-02-29', '2028-03-01', '1-30'],
    ['due on the leap day, 30 days late (30 Mar)', '2028-02-29', '2028-03-30', '1-30'],
    ['due on the leap day, 31 days late (31 Mar)', '2028-02-29', '2028-03-31', '31-60'],
    ['due 31 Jan 2028, 30 days late is 1 Mar in a leap year (29 + 1)', '2028-01-31', '2028-03-01', '1-30'],
    ['due 31 Jan 2028, 31 days late is 2 Mar', '2028-01-31', '2028-03-02', '31-60'],
    ['due 31 Jan 2027, 31 days late is 3 Mar in a common year (28 + 3)', '2027-01-31', '2027-03-03', '31-60'],
  ])('%s', (_what, dueOn, today, bucket) => expect(ageBucket(dueOn, today)).toBe(bucket))
})

describe('dueDateFor: issued on + the firm\'s payment terms in days', () => {
  it.each<[string, string, number, string]>([
    // DOMAIN.md "Money rules", Late payment (Late Payment of Commercial Debts (Interest) Act 1998): 30 days where none agreed
    ['30 days', '2026-03-02', 30, '2026-04-01'],
    ['0 days: due on the day it is issued (our own rule)', '2026-03-02', 0, '2026-03-02'],
    ['7 days', '2026-03-25', 7, '2026-04-01'],
    ['14 days across the clocks going forward (29 March 2026)', '2026-03-25', 14, '2026-04-08'],
    ['30 days from 31 Jan in a common year: 28 Feb is +28, 2 Mar is +30', '2026-01-31', 30, '2026-03-02'],
    ['30 days from 31 Mar: 30 Apr', '2026-03-31', 30, '2026-04-30'],
    ['1 day from the year end', '2026-12-31', 1, '2027-01-01'],
    ['30 days across the year end: 15 Dec + 16 = 31 Dec, + 14 = 14 Jan', '2026-12-15', 30, '2027-01-14'],
    ['28 days from 1 Feb 2028: the leap day', '2028-02-01', 28, '2028-02-29'],
    ['28 days from 1 Feb 2027: 1 Mar (no leap day)', '2027-02-01', 28, '2027-03-01'],
    ['30 days from 31 Jan 2028: 29 Feb is +29, 1 Mar is +30', '2028-01-31', 30, '2028-03-01'],
    ['30 days from the leap day', '2028-02-29', 30, '2028-03-30'],
    ['366 days from 1 Jan 2028', '2028-01-01', 366, '2029-01-01'],
  ])('%s', (_what, issuedOn, termsDays, dueOn) => {
    expect(dueDateFor(issuedOn, termsDays)).toBe(dueOn)
    expect(daysBetween(issuedOn, dueDateFor(issuedOn, termsDays))).toBe(termsDays)
  })
})

describe('partLines: a deposit or stage split in the job\'s own proportion (our own rule), labour apart for CIS (DOMAIN.md CIS)', () => {
  it.each<[string, JobPrice, { percent: number } | { amountPence: number }, [string, number][]]>([
    // 25% of £2,000.04 = £500.01 exactly; labour is half the job, 500.01 / 2 = 250.005 -> 250.01 (half up), materials the rest 250.00
    // (each side rounded on its own would give 250.01 + 250.01 = 500.02, a penny more than 25% of the price)
    ['25% of labour £1,000.02 + materials £1,000.02', job(1000_02, 1000_02), { percent: 25 }, [['labour', 250_01], ['materials', 250_00]]],
    // 25% of £2,000.08 = £500.02 exactly; labour is 3/4 of the job: 375.015 -> 375.02 (half up), materials 125.00
    ['25% of labour £1,500.06 + materials £500.02', job(1500_06, 500_02), { percent: 25 }, [['labour', 375_02], ['materials', 125_00]]],
    // 25% of £1,000.02 = 250.005 -> £250.01 (half up); labour 250.01 x 600.01 / 1000.02 = 150.0055 -> 150.01, materials 100.00
    ['25% of £1,000.02: the deposit itself lands on half a penny', job(600_01, 400_01), { percent: 25 }, [['labour', 150_01], ['materials', 100_00]]],
    // 10% of £4,800.00 in 2:1 = £480.00 -> 320.00 + 160.00
    ['10% of labour £3,200 + materials £1,600', job(3200_00, 1600_00), { percent: 10 }, [['labour', 320_00], ['materials', 160_00]]],
    // 12.5% of £2,000.00 = 250.00 -> 187.50 + 62.50
    ['12.5% of labour £1,500 + materials £500', job(1500_00, 500_00), { percent: 12.5 }, [['labour', 187_50], ['materials', 62_50]]],
    ['100%: the whole job', job(1500_06, 500_02), { percent: 100 }, [['labour', 1500_06], ['materials', 500_02]]],
    // £100.00 of a 2:1 job: labour 66.666... -> 66.67, materials the rest 33.33 (adds up to £100.00 exactly)
    ['£100.00 of labour £1,000 + materials £500', job(1000_00, 500_00), { amountPence: 100_00 }, [['labour', 66_67], ['materials', 33_33]]],
    // £100.01 of a 1:1 job: labour 50.005 -> 50.01 (half up), materials 50.00
    ['£100.01 of labour £500 + materials £500', job(500_00, 500_00), { amountPence: 100_01 }, [['labour', 50_01], ['materials', 50_00]]],
    // £1.00 of a 1:2 job: labour 33.33... -> 33p, materials 67p
    ['£1.00 of labour £500 + materials £1,000', job(500_00, 1000_00), { amountPence: 1_00 }, [['labour', 33], ['materials', 67]]],
    ['the whole price as an amount', job(1500_06, 500_02), { amountPence: 2000_08 }, [['labour', 1500_06], ['materials', 500_02]]],
    ['a job with only labour, by percent: one line', job(1200_00, 0), { percent: 25 }, [['labour', 300_00]]],
    ['a job with only labour, by amount: one line', job(1200_00, 0), { amountPence: 50_00 }, [['labour', 50_00]]],
    ['a job with only materials: one line', job(0, 400_00), { percent: 50 }, [['materials', 200_00]]],
    // 50% of 2p is 1p, not 2p: labour 1 x 1/2 = 0.5 -> 1p, materials nothing
    ['50% of a 2p job is 1p', job(1, 1), { percent: 50 }, [['labour', 1]]],
  ])('%s', (_what, price, part, expected) => {
    const lines = partLines('deposit', price, part)
    expect(figures(lines)).toEqual(expected)
    // the amount asked for, or the percentage of the whole price rounded half up, exactly
    const total = price.labourNetPence + price.materialsNetPence
    const asked = 'amountPence' in part ? part.amountPence : halfUp(total, Math.round(part.percent * 100), 10_000)
    expect(net(lines, 'labour') + net(lines, 'materials')).toBe(asked)
  })

  it('describes each line, one of each at the default 20% (DOMAIN.md VAT: standard rate 20%)', () => {
    expect(partLines('deposit', job(1000_00, 500_00), { percent: 25 })).toEqual([
      { kind: 'labour', description: 'Deposit 25% of J-0007: labour', quantityX1000: 1000, unit: 'item', unitPence: 250_00, vatRatePercent: 20 },
      { kind: 'materials', description: 'Deposit 25% of J-0007: materials', quantityX1000: 1000, unit: 'item', unitPence: 125_00, vatRatePercent: 20 },
    ])
    expect(partLines('stage', job(1000_00, 500_00), { amountPence: 300_00 }, 0).map(l => [l.description, l.vatRatePercent])).toEqual([
      ['Stage payment towards J-0007: labour', 0],
      ['Stage payment towards J-0007: materials', 0],
    ])
    expect(partLines('stage', job(1000_00, 500_00), { percent: 40 }, 5).map(l => [l.description, l.vatRatePercent])).toEqual([
      ['Stage payment 40% of J-0007: labour', 5],
      ['Stage payment 40% of J-0007: materials', 5],
    ])
  })

  it.each<[string, { percent: number } | { amountPence: number }]>([
    ['0%', { percent: 0 }],
    ['101%', { percent: 101 }],
    ['a negative percent', { percent: -25 }],
    ['a percent that is not a number', { percent: Number.NaN }],
    ['an infinite percent', { percent: Number.POSITIVE_INFINITY }],
    ['an amount of 0', { amountPence: 0 }],
    ['a negative amount', { amountPence: -100 }],
    ['an amount over the price (£1,500.01 of £1,500.00)', { amountPence: 1500_01 }],
    ['an amount with a fraction of a penny', { amountPence: 100.5 }],
    ['an amount that is not a number', { amountPence: Number.NaN }],
  ])('%s is a RangeError', (_what, part) => expect(() => partLines('deposit', job(1000_00, 500_00), part)).toThrow(RangeError))
})

describe('finalLines: the price less what was invoiced before, labour and materials apart', () => {
  // Labour and materials stay on lines of their own because CIS is deducted from the labour net only
  // (DOMAIN.md "Money rules", CIS: gov.uk "What you must do as a CIS contractor"; HMRC COG909250).
  it.each<[string, JobPrice, { labourNetPence: number, materialsNetPence: number }, [string, string, number][]]>([
    ['nothing invoiced yet: the full labour and materials', job(1500_06, 500_02), { labourNetPence: 0, materialsNetPence: 0 }, [
      ['labour', 'Labour for J-0007', 1500_06], ['materials', 'Materials for J-0007', 500_02]]],
    // the 25% deposit above was labour 375.02 + materials 125.00: 1500.06 - 375.02 = 1125.04 and 500.02 - 125.00 = 375.02
    ['less a 25% deposit, each side apart', job(1500_06, 500_02), { labourNetPence: 375_02, materialsNetPence: 125_00 }, [
      ['labour', 'Labour for J-0007, less invoiced before', 1125_04], ['materials', 'Materials for J-0007, less invoiced before', 375_02]]],
    ['the labour invoiced in full already: the materials only', job(1500_00, 500_00), { labourNetPence: 1500_00, materialsNetPence: 200_00 }, [
      ['materials', 'Materials for J-0007, less invoiced before', 300_00]]],
    ['everything invoiced already: no lines', job(1500_06, 500_02), { labourNetPence: 1500_06, materialsNetPence: 500_02 }, []],
    ['more than the price invoiced already: no lines', job(1500_00, 500_00), { labourNetPence: 1600_00, materialsNetPence: 500_00 }, []],
    ['a job with only labour', job(1200_00, 0), { labourNetPence: 300_00, materialsNetPence: 0 }, [
      ['labour', 'Labour for J-0007, less invoiced before', 900_00]]],
    // Two stages of £100.01 on a job of 100.01 + 100.01: each split 50.01 + 50.00 (half up), so together they claimed
    // labour 100.02 (1p over) and materials 100.00 (1p under): the whole £200.02 is invoiced, nothing is left to ask
    ['a penny over on one side from earlier rounding, the whole price invoiced: no lines', job(100_01, 100_01), { labourNetPence: 100_02, materialsNetPence: 100_00 }, []],
    // the same penny netted against the other side: £2,000.00 - £1,900.01 = £99.99 is left, all of it materials
    ['a penny over on one side, something left: netted on the other side', job(1000_00, 1000_00), { labourNetPence: 1000_01, materialsNetPence: 900_00 }, [
      ['materials', 'Materials for J-0007, less invoiced before', 99_99]]],
  ])('%s', (_what, price, invoiced, expected) => {
    expect(finalLines(price, invoiced).map(l => [l.kind, l.description, l.unitPence])).toEqual(expected)
  })

  it('carries the VAT rate asked for, one of each, as one item', () => {
    expect(finalLines(job(1000_00, 500_00), { labourNetPence: 0, materialsNetPence: 0 }, 0)).toEqual([
      { kind: 'labour', description: 'Labour for J-0007', quantityX1000: 1000, unit: 'item', unitPence: 1000_00, vatRatePercent: 0 },
      { kind: 'materials', description: 'Materials for J-0007', quantityX1000: 1000, unit: 'item', unitPence: 500_00, vatRatePercent: 0 },
    ])
  })

  it('after two stages that claimed a penny too much labour, the final asks for nothing more', () => {
    const price = job(100_01, 100_01)
    const stage = partLines('stage', price, { amountPence: 100_01 })
    expect(figures(stage)).toEqual([['labour', 50_01], ['materials', 50_00]])
    expect(finalLines(price, claimed([...stage, ...stage]))).toEqual([])
  })
})

describe('a deposit and then the final add up to the job exactly (property)', () => {
  const price = fc.record({ labourNetPence: fc.nat(50_000_000), materialsNetPence: fc.nat(50_000_000) })
    .filter(p => p.labourNetPence + p.materialsNetPence > 0)
    .map(p => ({ reference: 'J-0001', ...p }))
  // whole percents and ones with two decimals (12.5, 33.33), 0.01% to 100%
  const percent = fc.integer({ min: 1, max: 10_000 }).map(bp => bp / 100)

  it('by percent: labour and materials each add up to the job\'s, and the deposit is the percentage of the price', () => {
    fc.assert(fc.property(price, percent, (p, pc) => {
      const deposit = partLines('deposit', p, { percent: pc })
      const final = finalLines(p, claimed(deposit))
      expect(net(deposit, 'labour') + net(final, 'labour')).toBe(p.labourNetPence)
      expect(net(deposit, 'materials') + net(final, 'materials')).toBe(p.materialsNetPence)
      expect(net(deposit, 'labour') + net(deposit, 'materials')).toBe(halfUp(p.labourNetPence + p.materialsNetPence, Math.round(pc * 100), 10_000))
      expect([...deposit, ...final].every(l => Number.isSafeInteger(l.unitPence) && l.unitPence > 0)).toBe(true)
    }))
  })

  it('by amount: labour and materials each add up to the job\'s, and the deposit is the amount exactly', () => {
    fc.assert(fc.property(price.chain(p => fc.tuple(fc.constant(p), fc.integer({ min: 1, max: p.labourNetPence + p.materialsNetPence }))), ([p, amountPence]) => {
      const deposit = partLines('deposit', p, { amountPence })
      const final = finalLines(p, claimed(deposit))
      expect(net(deposit, 'labour') + net(deposit, 'materials')).toBe(amountPence)
      expect(net(deposit, 'labour') + net(final, 'labour')).toBe(p.labourNetPence)
      expect(net(deposit, 'materials') + net(final, 'materials')).toBe(p.materialsNetPence)
    }))
  })

  it('after any stages within the price, the final brings the total to the price exactly', () => {
    fc.assert(fc.property(price, fc.array(percent, { minLength: 1, maxLength: 4 }), (p, percents) => {
      const total = p.labourNetPence + p.materialsNetPence
      const stages: DraftInvoiceLine[] = []
      for (const pc of percents) {
        const left = total - net(stages, 'labour') - net(stages, 'materials')
        const amountPence = Math.min(left, halfUp(total, Math.round(pc * 100), 10_000))
        if (amountPence > 0) stages.push(...partLines('stage', p, { amountPence }))
      }
      const final = finalLines(p, claimed(stages))
      const all = [...stages, ...final]
      expect(net(all, 'labour') + net(all, 'materials')).toBe(total)
      expect(final.every(l => l.unitPence > 0)).toBe(true)
    }))
  })
})

describe('prefixesClash: could an invoice and a credit note numbered apart share a reference?', () => {
  // Our own rule (shared/utils/invoices.ts), from how issuing writes a reference: the prefix, then
  // the number padded to four digits (INV-0001, INV-10001). VAT invoice numbers must be unique
  // (gov.uk "VAT record keeping: VAT invoices"), so two series must never give the same one.
  it.each([
    ['CN-', 'CN-', true, 'the same prefix: both series start at 0001'],
    ['cn-', 'CN-', true, 'the same to a reader (case), so refused too'],
    ['', '', true, 'no prefix on either: both 0001'],
    ['A', 'A1', true, 'A at 10001 is A10001, as A1 at 1 is A10001 (A1 + 0001)'],
    ['INV', 'INV12', true, 'INV at 120001 is INV120001, as INV12 at 1'],
    ['A', 'A0', false, 'A numbers never start with 0 past four digits, and A0001.. are four'],
    ['INV', 'INV-', false, 'a dash never appears in a number'],
    ['', 'X', false, 'a number alone never starts with a letter'],
    ['INV-', 'CR-', false, 'different prefixes'],
  ])('%j and %j: %s (%s)', (a, b, clash) => {
    expect(prefixesClash(a, b)).toBe(clash)
    expect(prefixesClash(b, a)).toBe(clash)
  })
})

describe('finalFromQuote: the quote\'s lines, less each invoice before, by kind and VAT rate (our own rule)', () => {
  const quoteLines = [
    { kind: 'labour' as const, description: 'Skim walls: Front room', quantityX1000: 6977, unit: 'm²', unitPence: 18_07, vatRatePercent: 20 },
    { kind: 'materials' as const, description: 'Multi-finish', quantityX1000: 2000, unit: 'packs', unitPence: 11_11, vatRatePercent: 5 },
  ]

  it('is the quote\'s lines as they are when nothing was invoiced before', () => {
    expect(finalFromQuote(quoteLines, [])).toEqual(quoteLines)
  })

  it('takes off each invoice before as a line naming it, at its kind and rate; both kinds told apart', () => {
    const lines = finalFromQuote(quoteLines, [
      { reference: 'BP-3', kind: 'labour', vatRatePercent: 20, netPence: 30_00 },
      { reference: 'BP-3', kind: 'materials', vatRatePercent: 20, netPence: 5_00 },
      { reference: 'BP-5', kind: 'labour', vatRatePercent: 20, netPence: 12_00 },
      // credited in full: nothing to take off
      { reference: 'BP-4', kind: 'labour', vatRatePercent: 20, netPence: 0 },
    ])
    expect(lines.slice(2).map(l => [l.kind, l.description, l.quantityX1000, l.unitPence, l.vatRatePercent])).toEqual([
      ['labour', 'Less invoiced before: BP-3 (labour)', 1000, -30_00, 20],
      ['materials', 'Less invoiced before: BP-3 (materials)', 1000, -5_00, 20],
      ['labour', 'Less invoiced before: BP-5', 1000, -12_00, 20],
    ])
  })
})

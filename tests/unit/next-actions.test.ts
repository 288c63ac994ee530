import { describe, expect, it } from 'vitest'
import {
  KIND_URGENCY, MAX_WAIT_BONUS, bankLinesAction, cisReturnAction, dayNoSetAction, daysWaited, enquiryAction, invoiceOverdueAction,
  onceEach, promiseOverOverdue, setupActions, sortActions, urgencyOf, vatReturnAction, waitingWords, type NextAction,
} from '../../shared/utils/next-actions'
import { vatQuarter, cisTaxMonth } from '../../shared/utils/periods'

// Today's next actions: our own rules (no trade figure) for the order, the words of a wait, and
// which prompts show. The VAT and CIS due dates come from shared/utils/periods.ts (gov.uk, see there).

describe('waitingWords: how long a thing has waited, in words', () => {
  it.each([
    ['the same day', '2026-12-05', '2026-12-05', 'since today'],
    ['one day', '2026-12-04', '2026-12-05', 'waiting 1 day'],
    ['twelve days', '2026-11-23', '2026-12-05', 'waiting 12 days'],
    ['a timestamp late at night in summer is the next London day', '2026-07-01T23:30:00Z', '2026-07-02', 'since today'],
    ['a date to come never waits a negative time', '2026-12-09', '2026-12-05', 'since today'],
  ])('%s', (_what, since, today, want) => expect(waitingWords(since, today)).toBe(want))
})

describe('urgencyOf: the kind first, then one a day of waiting, capped', () => {
  it.each([
    ['an overdue invoice waiting no days', 'invoice-overdue', '2026-12-05', KIND_URGENCY['invoice-overdue']],
    ['waiting ten days', 'invoice-overdue', '2026-11-25', KIND_URGENCY['invoice-overdue'] + 10],
    ['waiting a year is capped', 'invoice-overdue', '2025-12-05', KIND_URGENCY['invoice-overdue'] + MAX_WAIT_BONUS],
  ] as const)('%s', (_what, kind, since, want) => expect(urgencyOf(kind, since, '2026-12-05')).toBe(want))

  it('a year-old receipt never outranks a new enquiry: the gap between kinds is wider than the cap', () => {
    const kinds = Object.values(KIND_URGENCY).sort((a, b) => a - b)
    const gaps = kinds.slice(1).map((u, i) => u - kinds[i]!).filter(g => g > 0)
    expect(Math.min(...gaps)).toBeGreaterThan(MAX_WAIT_BONUS)
  })
})

const action = (key: string, urgency: number, since: string): NextAction =>
  ({ kind: 'enquiry-new', key, title: key, detail: '', href: '/', actionLabel: 'Go', since, urgency })

describe('sortActions: most urgent first, then the oldest, then by key', () => {
  it.each([
    ['by urgency', [action('a', 1, '2026-12-01'), action('b', 5, '2026-12-04')], ['b', 'a']],
    ['the same urgency: oldest first', [action('a', 5, '2026-12-04'), action('b', 5, '2026-12-01')], ['b', 'a']],
    ['a date and a timestamp of the same London day: the earlier moment first', [action('a', 5, '2026-12-04T15:00:00.000Z'), action('b', 5, '2026-12-04T09:00:00.000Z')], ['b', 'a']],
    ['all the same: by key, so the list never wobbles', [action('b', 5, '2026-12-04'), action('a', 5, '2026-12-04')], ['a', 'b']],
  ])('%s', (_what, list, want) => expect(sortActions(list).map(a => a.key)).toEqual(want))
})

describe('onceEach: a thing listed once', () => {
  it('drops later copies of a key (one job on two people\'s days)', () => {
    expect(onceEach([action('x', 1, '2026-12-01'), action('y', 1, '2026-12-01'), action('x', 9, '2026-12-02')]).map(a => a.key)).toEqual(['x', 'y'])
  })
})

describe('promiseOverOverdue: an invoice chased once', () => {
  const on = (kind: NextAction['kind'], key: string, href: string): NextAction => ({ ...action(key, 1, '2026-12-01'), kind, href })
  it.each<[string, NextAction[], string[]]>([
    ['a broken promise replaces the same invoice overdue', [on('invoice-overdue', 'o1', '/invoices/1'), on('promise-broken', 'p1', '/invoices/1')], ['p1']],
    ['another invoice overdue stays', [on('invoice-overdue', 'o2', '/invoices/2'), on('promise-broken', 'p1', '/invoices/1')], ['o2', 'p1']],
    ['no promise: overdue stays', [on('invoice-overdue', 'o1', '/invoices/1')], ['o1']],
    ['other kinds to the same page stay', [on('job-not-invoiced', 'j1', '/jobs/1'), on('day-no-set-logged', 'd1', '/jobs/1')], ['j1', 'd1']],
  ])('%s', (_what, list, want) => expect(promiseOverOverdue(list).map(a => a.key)).toEqual(want))
})

describe('the words of each action', () => {
  it('a new enquiry: answer it, with what they asked and their phone', () => {
    const a = enquiryAction({ id: 'e1', customer: 'Tamsin Quillane', description: 'Skim the back bedroom\nceiling and walls', phone: '01632 960123', createdAt: '2026-12-02T10:00:00Z' }, '2026-12-05')
    expect(a).toMatchObject({ kind: 'enquiry-new', key: 'enquiry-new:e1', title: 'Answer Tamsin Quillane\'s enquiry', detail: 'Skim the back bedroom ceiling and walls · 01632 960123', href: '/enquiries/e1', actionLabel: 'Answer', urgency: KIND_URGENCY['enquiry-new'] + 3 })
    expect(enquiryAction({ id: 'e2', customer: 'Ross Adams', description: 'x', phone: '', createdAt: '2026-12-05T08:00:00Z' }, '2026-12-05').title).toBe('Answer Ross Adams\' enquiry')
  })

  it('an overdue invoice: chase it, with the reference, what is left and how late', () => {
    expect(invoiceOverdueAction({ id: 'i1', reference: 'BP-12', customer: 'Wren Ashdown', dueOn: '2026-11-26', outstandingPence: 740_90 }, '2026-12-05'))
      .toMatchObject({ key: 'invoice-overdue:i1', title: 'Chase Wren Ashdown for BP-12', detail: 'BP-12 · £740.90 · 9 days overdue', href: '/invoices/i1', actionLabel: 'Chase', since: '2026-11-26' })
  })

  it.each([
    ['many lines: counted, from the oldest', { accountId: 'a1', account: 'Business current account', open: 1234, oldest: '2026-11-03' }, 'Match 1,234 lines of the bank statement', 'Business current account · the oldest from 3 Nov 2026'],
    ['one line', { accountId: 'a1', account: 'Card account', open: 1, oldest: '2026-12-01' }, 'Match a line of the bank statement', 'Card account · from 1 Dec 2026'],
  ])('bank lines to match, %s', (_what, r, title, detail) => {
    const a = bankLinesAction(r, '2026-12-05')
    expect([a.title, a.detail, a.href, a.since, a.urgency]).toEqual([title, detail, '/bank', r.oldest, KIND_URGENCY['bank-lines-open'] + Math.min(MAX_WAIT_BONUS, Math.round((Date.parse('2026-12-05') - Date.parse(r.oldest)) / 86_400_000))])
  })

  it('a day with no set logged is one action per job and day, with its people', () => {
    const a = dayNoSetAction({ jobId: 'j1', reference: 'BP-J7', customer: 'Ada Penrose', day: '2026-12-03', people: ['Jess Marlow', 'Owen Tredinnick'] }, '2026-12-05')
    expect(a).toMatchObject({ key: 'day-no-set-logged:j1:2026-12-03', detail: 'Ada Penrose · Jess Marlow, Owen Tredinnick', href: '/jobs/j1/log' })
  })
})

describe('vatReturnAction: the quarter just ended, until its return is due', () => {
  // stagger 1: quarters end March, June, September, December; the quarter to 30 September is due 7 November
  const q = vatQuarter('2026-09-15', 1)
  it.each([
    ['during the quarter: nothing yet', '2026-09-30', false],
    ['the day after it ends', '2026-10-01', true],
    ['on the due date', '2026-11-07', true],
    ['after the due date: gone (no "passed" prompts)', '2026-11-08', false],
  ])('%s', (_what, today, shows) => expect(vatReturnAction(q, today) !== null).toBe(shows))

  it('says when it is due and defers to HMRC', () => {
    const a = vatReturnAction(q, '2026-11-01')!
    expect(a.title).toBe('VAT return for 1 Jul 2026 to 30 Sept 2026')
    expect(a.detail).toContain('due by 7 Nov 2026 · in 6 days')
    expect(a.detail).toContain('HMRC')
  })
})

describe('cisReturnAction: the tax month just ended, until the 19th', () => {
  const m = cisTaxMonth('2026-11-20') // 6 November to 5 December, due 19 December
  it.each([
    ['within the month', '2026-12-05', false],
    ['the 6th', '2026-12-06', true],
    ['the 19th', '2026-12-19', true],
    ['the 20th', '2026-12-20', false],
  ])('%s', (_what, today, shows) => expect(cisReturnAction(m, today) !== null).toBe(shows))
})

describe('setupActions: only what is really missing', () => {
  const done = { createdAt: '2026-01-05T09:00:00Z', hasAddress: true, hasPhoneOrEmail: true, bankMissing: false, dayRateSet: true, rolesIn: ['owner', 'office', 'crew', 'accountant'] }
  it.each([
    ['everything in: no prompt at all', done, []],
    ['office, crew and accountant all in: no invitation prompt', { ...done, rolesIn: ['owner', 'office', 'crew', 'accountant'] }, []],
    ['only the accountant missing', { ...done, rolesIn: ['owner', 'office', 'crew'] }, ['Invite your accountant']],
    ['crew and accountant missing', { ...done, rolesIn: ['owner', 'office'] }, ['Invite your crew and your accountant']],
    ['nobody yet', { ...done, rolesIn: ['owner'] }, ['Invite your office partner, your crew and your accountant']],
    ['no bank account, no day rate', { ...done, bankMissing: true, dayRateSet: false }, ['Fill in the firm\'s bank account', 'Set your target day rate']],
    ['no address', { ...done, hasAddress: false }, ['Fill in the firm\'s address and phone']],
  ])('%s', (_what, setup, want) => expect(setupActions(setup, '2026-12-05').map(a => a.title)).toEqual(want))
})

describe('daysWaited', () => {
  it('counts London days', () => expect(daysWaited('2026-03-28T23:30:00Z', '2026-03-29')).toBe(1))
})

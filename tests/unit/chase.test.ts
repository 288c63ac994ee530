import { describe, expect, it } from 'vitest'
import { brokenPromiseWords, chaseRemoval, PROMISE_DATE_PAST, promiseBroken, promiseDateProblem, type PromiseState } from '../../shared/utils/chase'
import { chaseEntrySchemaFor } from '../../shared/schemas/chase'

// Sources: the firm's own rules for its chase log (issue 18, part 2): a promise is for today or a
// later day; it is broken from the day after its day while less than was promised has come in; an
// entry is removed by its writer the same London day, or by the owner. London's days: The Summer
// Time Act 1972 / Summer Time Order 2002 (BST from 01:00 GMT on the last Sunday of March).

describe('promiseDateProblem: a promise is for today or later', () => {
  it.each<[string, string, string, string | null]>([
    ['yesterday is refused', '2026-12-04', '2026-12-05', PROMISE_DATE_PAST],
    ['today is fine', '2026-12-05', '2026-12-05', null],
    ['tomorrow is fine', '2026-12-06', '2026-12-05', null],
    ['last year is refused', '2025-12-31', '2026-01-01', PROMISE_DATE_PAST],
    ['next year is fine', '2027-01-01', '2026-12-31', null],
  ])('%s', (_, promisedOn, today, want) => {
    expect(promiseDateProblem(promisedOn, today)).toBe(want)
  })
})

describe('chaseRemoval: who may take an entry out of the log', () => {
  const writer = 'a0000000-0000-4000-8000-000000000001'
  const other = 'a0000000-0000-4000-8000-000000000002'
  // 23:30 UTC on 5 July is 00:30 on 6 July in London (BST); 23:30 UTC on 5 December is still 5 December
  it.each<[string, { userId: string, role: string }, { kind: string, byUserId: string | null, at: string }, string, string]>([
    ['the writer, the same day', { userId: writer, role: 'office' }, { kind: 'call', byUserId: writer, at: '2026-12-05T09:00:00Z' }, '2026-12-05T17:00:00Z', 'ok'],
    ['the writer, the next day', { userId: writer, role: 'office' }, { kind: 'call', byUserId: writer, at: '2026-12-04T09:00:00Z' }, '2026-12-05T08:00:00Z', 'not-today'],
    ['the writer, just before midnight in winter (London is UTC)', { userId: writer, role: 'office' }, { kind: 'letter', byUserId: writer, at: '2026-12-05T00:10:00Z' }, '2026-12-05T23:50:00Z', 'ok'],
    ['the writer in summer: 23:30 UTC is already the next London day', { userId: writer, role: 'office' }, { kind: 'message', byUserId: writer, at: '2026-07-05T22:00:00Z' }, '2026-07-05T23:30:00Z', 'not-today'],
    ['someone else with money:write, the same day', { userId: other, role: 'office' }, { kind: 'call', byUserId: writer, at: '2026-12-05T09:00:00Z' }, '2026-12-05T10:00:00Z', 'not-yours'],
    ['an entry whose writer has gone (no writer): not theirs', { userId: other, role: 'office' }, { kind: 'call', byUserId: null, at: '2026-12-05T09:00:00Z' }, '2026-12-05T10:00:00Z', 'not-yours'],
    ['the owner, months later', { userId: other, role: 'owner' }, { kind: 'call', byUserId: writer, at: '2026-01-05T09:00:00Z' }, '2026-12-05T10:00:00Z', 'ok'],
    ['the owner, a reminder that was sent', { userId: other, role: 'owner' }, { kind: 'reminder', byUserId: null, at: '2026-12-05T09:00:00Z' }, '2026-12-05T10:00:00Z', 'reminder'],
    ['the writer of a reminder sent by hand, the same day', { userId: writer, role: 'office' }, { kind: 'reminder', byUserId: writer, at: '2026-12-05T09:00:00Z' }, '2026-12-05T10:00:00Z', 'reminder'],
  ])('%s', (_, who, entry, now, want) => {
    expect(chaseRemoval(who, entry, new Date(now))).toBe(want)
  })
})

describe('promiseBroken: from the day after its day, while less than promised has come in', () => {
  const base: PromiseState = { promisedOn: '2026-12-04', promisedPence: 200_00, paidSincePence: 0, outstandingPence: 740_90, chasedAfter: false }
  it.each<[string, Partial<PromiseState>, string, boolean]>([
    ['on its day: not yet', {}, '2026-12-04', false],
    ['before its day: not yet', {}, '2026-12-01', false],
    ['the day after, nothing paid: broken', {}, '2026-12-05', true],
    ['weeks after, nothing paid: broken', {}, '2027-01-20', true],
    ['the amount came in: kept', { paidSincePence: 200_00 }, '2026-12-05', false],
    ['more than the amount came in: kept', { paidSincePence: 300_00 }, '2026-12-05', false],
    ['a penny short: broken', { paidSincePence: 199_99 }, '2026-12-05', true],
    ['a refund took it back under: broken', { paidSincePence: 200_00 - 50_00 }, '2026-12-05', true],
    ['nothing left to pay (a credit note): not broken', { outstandingPence: 0 }, '2026-12-05', false],
    ['chased again after its day: answered', { chasedAfter: true }, '2026-12-05', false],
    ['an old promise with no amount, still owed: broken', { promisedPence: null }, '2026-12-05', true],
    ['an old promise with no amount, a part paid: still owed, broken', { promisedPence: null, paidSincePence: 100_00 }, '2026-12-05', true],
  ])('%s', (_, change, today, want) => {
    expect(promiseBroken({ ...base, ...change }, today)).toBe(want)
  })
})

describe('brokenPromiseWords', () => {
  it.each<[string, Parameters<typeof brokenPromiseWords>[0], { title: string, detail: string }]>([
    ['with an amount', { customerName: 'Ada Penrose', reference: 'BP-12', promisedOn: '2026-12-04', promisedPence: 200_00, outstandingPence: 740_90 }, { title: 'Chase Ada Penrose: a promise to pay was not kept', detail: 'BP-12 · £200.00 promised by Fri 4 Dec · £740.90 still to pay' }],
    ['an old promise with no amount', { customerName: 'Osric Vane', reference: 'BP-3', promisedOn: '2026-11-30', promisedPence: null, outstandingPence: 55_00 }, { title: 'Chase Osric Vane: a promise to pay was not kept', detail: 'BP-3 · promised by Mon 30 Nov · £55.00 still to pay' }],
  ])('%s', (_, input, want) => {
    expect(brokenPromiseWords(input)).toEqual(want)
  })
})

describe('chaseEntrySchema: one entry, the promise beside it', () => {
  const schema = chaseEntrySchemaFor(() => '2026-12-05')
  const fields = (body: unknown) => {
    const r = schema.safeParse(body)
    return r.success ? null : Object.fromEntries(r.error.issues.map(i => [i.path.join('.'), i.message]))
  }
  it.each<[string, unknown, Record<string, string> | null]>([
    ['a call that promised, today', { kind: 'call', outcome: 'promised', promisedPence: 250_00, promisedOn: '2026-12-05' }, null],
    ['a letter, no reply', { kind: 'letter', outcome: 'no-reply' }, null],
    ['a message, disputed, with words', { kind: 'message', outcome: 'disputed', note: 'Says the ceiling cracked' }, null],
    ['a promise dated yesterday', { kind: 'call', outcome: 'promised', promisedPence: 250_00, promisedOn: '2026-12-04' }, { promisedOn: PROMISE_DATE_PAST }],
    ['a promise with no amount or day', { kind: 'call', outcome: 'promised' }, { promisedPence: 'Enter the amount they promised to pay.', promisedOn: 'Pick the day they promised to pay by.' }],
    ['a promise of nothing', { kind: 'call', outcome: 'promised', promisedPence: 0, promisedOn: '2026-12-06' }, { promisedPence: 'Enter the amount they promised.' }],
    ['pounds as a fraction', { kind: 'call', outcome: 'promised', promisedPence: 12.5, promisedOn: '2026-12-06' }, { promisedPence: 'Enter the amount they promised in pounds and pence, like 250.00.' }],
    ['a promise without the outcome "promised"', { kind: 'call', outcome: 'no-reply', promisedPence: 100_00, promisedOn: '2026-12-06' }, { outcome: 'An amount and a day go with "Promised to pay": choose it, or leave them out.' }],
    ['the old kind "promise"', { kind: 'promise', outcome: 'promised', promisedPence: 100_00, promisedOn: '2026-12-06' }, { kind: 'A call, a message or a letter?' }],
    ['no outcome', { kind: 'call' }, { outcome: 'Choose how it went.' }],
    ['a reminder cannot be written by hand', { kind: 'reminder', outcome: 'other' }, { kind: 'A call, a message or a letter?' }],
  ])('%s', (_, body, want) => {
    expect(fields(body)).toEqual(want)
  })
})

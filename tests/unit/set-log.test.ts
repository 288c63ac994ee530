import { describe, expect, it } from 'vitest'
import { coatForSet, MAX_PACKS_X1000, MAX_SET_HOURS, setLogFieldErrors, setLogTimes, setProgress, setToLog, setTooLong } from '../../shared/utils/set-log'

// Sources: the coat rule is the firm's own (DOMAIN.md "Planning the sets": a set is laid on and
// trowelled up in one go); the clocks, The Summer Time Act 1972 / Summer Time Order 2002 (BST from
// 01:00 GMT on the last Sunday of March to 01:00 GMT on the last Sunday of October).
describe('coatForSet: the coat a set on the plan is logged as', () => {
  it.each<[string, ('fill' | 'tight-coat' | 'skim')[], string]>([
    ['a skim with its fills is the second coat', ['fill', 'skim'], 'second'],
    ['a skim alone is the second coat', ['skim'], 'second'],
    ['fills only are a fill', ['fill', 'fill'], 'fill'],
    ['a fill with a tight coat is a fill', ['tight-coat', 'fill'], 'fill'],
    ['tight coats only are a tight coat', ['tight-coat'], 'tight-coat'],
    ['an empty set is a tight coat', [], 'tight-coat'],
  ])('%s', (_what, actions, coat) => expect(coatForSet(actions.map(action => ({ action })))).toBe(coat))
})

describe('setLogTimes: the times typed on site, London time, as instants', () => {
  it.each<[string, string, string, string, string | null, string | null]>([
    ['a winter morning (GMT)', '2026-12-04', '08:30', '10:15', '2026-12-04T08:30:00.000Z', '2026-12-04T10:15:00.000Z'],
    ['a summer morning (BST, an hour ahead of UTC)', '2026-07-01', '08:30', '10:15', '2026-07-01T07:30:00.000Z', '2026-07-01T09:15:00.000Z'],
    ['past midnight: started the day before', '2026-12-05', '23:10', '00:40', '2026-12-04T23:10:00.000Z', '2026-12-05T00:40:00.000Z'],
    ['past midnight over the new year', '2027-01-01', '23:30', '01:00', '2026-12-31T23:30:00.000Z', '2027-01-01T01:00:00.000Z'],
    ['past midnight into the leap day', '2028-02-29', '22:00', '00:30', '2028-02-28T22:00:00.000Z', '2028-02-29T00:30:00.000Z'],
    ['the night the clocks go forward: 00:30 GMT to 03:30 BST is two hours', '2026-03-29', '00:30', '03:30', '2026-03-29T00:30:00.000Z', '2026-03-29T02:30:00.000Z'],
    ['the night the clocks go back: 00:30 BST to 03:30 GMT is four hours', '2026-10-25', '00:30', '03:30', '2026-10-24T23:30:00.000Z', '2026-10-25T03:30:00.000Z'],
    ['no times given', '2026-12-04', '', '', null, null],
  ])('%s', (_what, day, start, end, startedAt, endedAt) => {
    expect(setLogTimes(day, start, end)).toEqual({ startedAt, endedAt, fields: {} })
  })

  it('a time that is not a time is named beside its field, and past midnight is not guessed from it', () => {
    expect(setLogTimes('2026-12-04', '8.30', '25:00')).toEqual({
      startedAt: null,
      endedAt: null,
      fields: { startedAt: 'Enter the time like 08:30.', endedAt: 'Enter the time like 10:15.' },
    })
    expect(setLogTimes('2026-12-04', '09:00', 'soon').fields).toEqual({ endedAt: 'Enter the time like 10:15.' })
  })
})

// The limits are common practice (a set is laid on and trowelled up within a working day; a room
// takes a handful of bags), not a published figure.
describe('setTooLong: a set runs at most MAX_SET_HOURS', () => {
  it.each<[string, string, string, string | null]>([
    ['08:30 to 10:15 (common practice)', '2026-12-07T08:30:00Z', '2026-12-07T10:15:00Z', null],
    ['22:00 to 01:00, past midnight (common practice)', '2026-12-06T22:00:00Z', '2026-12-07T01:00:00Z', null],
    ['exactly 12 hours (common practice)', '2026-12-07T07:00:00Z', '2026-12-07T19:00:00Z', null],
    ['14:00 to 09:00 the next day is 19 hours (common practice)', '2026-12-06T14:00:00Z', '2026-12-07T09:00:00Z', 'A set from 14:00 to 09:00 would run 19 hours: check the times.'],
    ['London\'s times in summer: 15:00 to 10:00 BST (The Summer Time Act 1972)', '2026-07-06T14:00:00Z', '2026-07-07T09:00:00Z', 'A set from 15:00 to 10:00 would run 19 hours: check the times.'],
  ])('%s', (_what, start, end, want) => expect(setTooLong(start, end)).toBe(want))
  it('is 12 hours and 100 packs (common practice)', () => {
    expect(MAX_SET_HOURS).toBe(12)
    expect(MAX_PACKS_X1000).toBe(100_000)
  })
})

describe('setLogFieldErrors: the API\'s errors on the fields the set log page shows', () => {
  const sent = [{ materialId: 'finish-id' }, { materialId: 'bonding-id' }]
  it.each<[string, Record<string, string>, Record<string, string>]>([
    ['the second material\'s bags are its bags box', { 'materials.1.packsX1000': 'Check the figure.' }, { 'bags.bonding-id': 'Check the figure.' }],
    ['the first material itself', { 'materials.0.materialId': 'Choose one of the firm\'s materials.' }, { 'bags.finish-id': 'Choose one of the firm\'s materials.' }],
    ['other fields as they are', { endedAt: 'The end is before the start.', coat: 'Choose the coat.' }, { endedAt: 'The end is before the start.', coat: 'Choose the coat.' }],
    ['a place that was not sent stays as it is', { 'materials.5.packsX1000': 'x' }, { 'materials.5.packsX1000': 'x' }],
    ['the list of materials as a whole', { materials: 'Each material once: add the bags together.' }, { materials: 'Each material once: add the bags together.' }],
  ])('%s', (_what, fields, want) => expect(setLogFieldErrors(fields, sent)).toEqual(want))
})

describe('setProgress and setToLog: the set the log opens on never moves on by itself', () => {
  // the firm's own rule (DOMAIN.md "Planning the sets"): a set with a skim is done at its second coat
  const sets = [
    { number: 1, tasks: [{ action: 'fill' as const }, { action: 'tight-coat' as const }, { action: 'skim' as const }] },
    { number: 2, tasks: [{ action: 'skim' as const }] },
    { number: 3, tasks: [{ action: 'fill' as const }] },
  ]
  const log = (setNumber: number | null, coat: 'fill' | 'tight-coat' | 'first' | 'second' | null, kind = 'set') => ({ kind, setNumber, coat })
  it.each<[string, ReturnType<typeof log>[], string | undefined, number, string]>([
    ['nothing logged: set 1', [], undefined, 1, 'to-do'],
    ['set 1\'s fill and tight coat logged: still set 1 (the bug: it moved to set 2)', [log(1, 'fill'), log(1, 'tight-coat')], undefined, 1, 'partly'],
    ['set 1\'s first coat: still set 1', [log(1, 'first')], undefined, 1, 'partly'],
    ['set 1\'s second coat: set 1 done, set 2 next', [log(1, 'first'), log(1, 'second')], undefined, 2, 'done'],
    ['a problem noted against set 1 does not count', [log(1, null, 'problem')], undefined, 1, 'to-do'],
    ['asked for set 3 (the job page\'s "Log set 3")', [], '3', 3, 'to-do'],
    ['asked for a set the plan does not have: the first not done', [], '9', 1, 'to-do'],
    ['asked for something that is not a number', [], 'two', 1, 'to-do'],
  ])('%s', (_what, logs, asked, opens, set1) => {
    expect(setToLog(sets, logs, asked)).toBe(opens)
    expect(setProgress(sets[0]!, logs)).toBe(set1)
  })
  it('every set done: the form opens on set 1 rather than nowhere', () => {
    const all = [log(1, 'second'), log(2, 'second'), log(3, 'fill')]
    expect(sets.map(s => setProgress(s, all))).toEqual(['done', 'done', 'done'])
    expect(setToLog(sets, all)).toBe(1)
  })
})

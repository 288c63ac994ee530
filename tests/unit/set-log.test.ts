import { describe, expect, it } from 'vitest'
import { coatForSet, setLogTimes } from '../../shared/utils/set-log'

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

import { describe, expect, it } from 'vitest'
import { atLondonTime, daysInWords, fullDateAtTime } from '../../shared/utils/dates'

// Dates and times in e-mails and letters: words, London time (BST in summer), never ISO.
describe('fullDateAtTime and atLondonTime', () => {
  it.each([
    ['winter (GMT)', '2026-12-04T22:46:09.500Z', 'Friday 4 December 2026 at 22:46', 'at 22:46'],
    ['summer (BST): the next day in London', '2026-07-31T23:30:00Z', 'Saturday 1 August 2026 at 00:30', 'at 00:30'],
    ['the morning the clocks go forward', '2026-03-29T01:15:00Z', 'Sunday 29 March 2026 at 02:15', 'at 02:15'],
  ])('%s', (_what, at, full, time) => {
    expect(fullDateAtTime(new Date(at))).toBe(full)
    expect(atLondonTime(new Date(at))).toBe(time)
  })
})

describe('daysInWords', () => {
  it.each([[1, '1 day'], [0, '0 days'], [2, '2 days'], [40, '40 days'], [-1, '-1 day']])('%i -> %s', (n, words) => expect(daysInWords(n)).toBe(words))
})

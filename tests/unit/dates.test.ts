import { afterEach, describe, expect, it, vi } from 'vitest'
import { todayIso } from '../../server/utils/invoices'

// The server's "today" dates invoices, payments and refunds. It is Britain's calendar day, not
// UTC's: Europe/London is UTC+1 from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
// Sunday of October (The Summer Time Act 1972 / Summer Time Order 2002).
describe('the server\'s today (issue dates, payments received today)', () => {
  afterEach(() => vi.useRealTimers())
  it.each<[string, string, string]>([
    ['half past midnight BST on 2 July 2026 is 2 July, not UTC\'s 1 July', '2026-07-01T23:30:00Z', '2026-07-02'],
    ['22:59 UTC in summer is still the same day', '2026-07-01T22:59:00Z', '2026-07-01'],
    ['winter: GMT, the UTC day', '2026-12-04T23:30:00Z', '2026-12-04'],
  ])('%s', (_what, at, day) => {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(new Date(at))
    expect(todayIso()).toBe(day)
  })
})

import { describe, expect, it } from 'vitest'
import { jobsOfTheWeek, latestJobsWorked } from '../../shared/utils/today'

// Our own rules for the Today screen (no trade figure): a job booked on several days or with
// several people is one line; the days keep the diary's order; the latest jobs worked come first.

const day = (jobId: string, number: number, d: string, person: string) => ({ jobId, reference: `BP-J${number}`, customer: `Customer ${number}`, day: d, person })

describe('jobsOfTheWeek: the week\'s booked days gathered by job', () => {
  it.each([
    ['nothing booked', [], []],
    ['one day, one person', [day('a', 1, '2026-12-07', 'Jess')], [{ jobId: 'a', reference: 'BP-J1', customer: 'Customer 1', days: ['2026-12-07'], people: ['Jess'] }]],
    ['two people on the same day: the day once, both people', [day('a', 1, '2026-12-07', 'Jess'), day('a', 1, '2026-12-07', 'Tamsin')],
      [{ jobId: 'a', reference: 'BP-J1', customer: 'Customer 1', days: ['2026-12-07'], people: ['Jess', 'Tamsin'] }]],
    ['two jobs across three days, in the order each first appears', [day('b', 2, '2026-12-07', 'Jess'), day('a', 1, '2026-12-08', 'Jess'), day('b', 2, '2026-12-09', 'Jess')],
      [{ jobId: 'b', reference: 'BP-J2', customer: 'Customer 2', days: ['2026-12-07', '2026-12-09'], people: ['Jess'] }, { jobId: 'a', reference: 'BP-J1', customer: 'Customer 1', days: ['2026-12-08'], people: ['Jess'] }]],
  ])('%s', (_what, entries, want) => expect(jobsOfTheWeek(entries)).toEqual(want))
})

describe('latestJobsWorked: the latest last days first, at most n', () => {
  const rows = [{ id: 1, lastDay: '2026-11-02' }, { id: 2, lastDay: '2026-12-01' }, { id: 3, lastDay: '2026-11-20' }, { id: 4, lastDay: '2026-12-01' }]
  it.each([
    [2, [2, 4]],
    [5, [2, 4, 3, 1]],
    [0, []],
  ])('n = %i', (n, ids) => expect(latestJobsWorked(rows, n).map(r => r.id)).toEqual(ids))
  it('leaves the list it was given as it was', () => {
    latestJobsWorked(rows, 2)
    expect(rows.map(r => r.id)).toEqual([1, 2, 3, 4])
  })
})

import { describe, expect, it } from 'vitest'
import { keepDue, pathsToKeep, type KeepDay, type KeepVisit } from '../../shared/utils/offline-plan'

// What a phone keeps for no signal. Invented ids; "the next 7 days" is the rule.
const ME = 'u-kieran'
const OTHER = 'u-jess'
const day = (jobId: string, userId: string, d: string): KeepDay => ({ jobId, userId, day: d })
const visit = (id: string, visitor: string | null, startsAt: string, status = 'booked'): KeepVisit => ({ id, status, startsAt, visitor: visitor ? { id: visitor } : null })
const base = ['/', '/api/me', '/api/today']
const job = (id: string, log = true) => [`/jobs/${id}`, `/jobs/${id}/sheet`, `/api/jobs/${id}`, ...(log ? [`/jobs/${id}/log`] : [])]
const vis = (id: string) => [`/visits/${id}`, `/api/visits/${id}`, `/api/visits/${id}/rooms`]

describe('pathsToKeep: the person\'s jobs and visits from today to the sixth day after', () => {
  const from = '2026-12-05'
  const to = '2026-12-11'
  const cases: [string, Parameters<typeof pathsToKeep>[0], KeepDay[], KeepVisit[], string[]][] = [
    ['nothing booked: Today and who is signed in', { userId: ME, canLog: true }, [], [], base],
    ['a job booked for them on two days is kept once', { userId: ME, canLog: true }, [day('j1', ME, '2026-12-05'), day('j1', ME, '2026-12-06')], [], [...base, ...job('j1')]],
    ['another person\'s day is not theirs (the owner sees every day)', { userId: ME, canLog: true }, [day('j1', OTHER, '2026-12-05'), day('j2', ME, '2026-12-07')], [], [...base, ...job('j2')]],
    ['days outside the week are left', { userId: ME, canLog: true }, [day('j1', ME, '2026-12-04'), day('j2', ME, '2026-12-12'), day('j3', ME, '2026-12-11')], [], [...base, ...job('j3')]],
    ['no log page for someone who may not log', { userId: ME, canLog: false }, [day('j1', ME, '2026-12-05')], [], [...base, ...job('j1', false)]],
    ['a visit booked for them this week, with its rooms', { userId: ME, canLog: true }, [], [visit('v1', ME, '2026-12-08T09:00:00Z')], [...base, ...vis('v1')]],
    ['done, cancelled, someone else\'s or nobody\'s visits are left', { userId: ME, canLog: true }, [], [visit('v1', ME, '2026-12-08T09:00:00Z', 'done'), visit('v2', ME, '2026-12-08T09:00:00Z', 'cancelled'), visit('v3', OTHER, '2026-12-08T09:00:00Z'), visit('v4', null, '2026-12-08T09:00:00Z')], base],
    ['a visit late on the last day is kept; the next morning is not', { userId: ME, canLog: true }, [], [visit('v1', ME, '2026-12-11T18:00:00Z'), visit('v2', ME, '2026-12-12T09:00:00Z')], [...base, ...vis('v1')]],
  ]
  it.each(cases)('%s', (_name, who, days, visits, want) => {
    expect(pathsToKeep(who, days, visits, from, to)).toEqual(want)
  })
})

describe('keepDue: hourly while on screen, when asked at most every five minutes', () => {
  const H = 3600_000
  const M = 60_000
  const now = Date.parse('2026-12-05T10:00:00Z')
  // our own rule (issue 19: the keep was most of a firm's requests), no trade source
  const cases: [string, number, boolean, boolean, boolean][] = [
    ['never kept: kept at once', 0, false, false, true],
    ['never kept, page hidden: waits until looked at', 0, false, true, false],
    ['never kept, page hidden, asked (another firm chosen): kept', 0, true, true, true],
    ['kept 59 minutes ago: not yet', now - 59 * M, false, false, false],
    ['kept an hour ago: again', now - H, false, false, true],
    ['kept an hour ago, page hidden: not until looked at', now - H, false, true, false],
    ['signal back 4 minutes after the last keep: not again', now - 4 * M, true, false, false],
    ['signal back 5 minutes after the last keep: again', now - 5 * M, true, false, true],
    ['the phone\'s clock put back (last keep in the future): kept, the stamp is not trusted', now + 10 * M, false, false, true],
  ]
  it.each(cases)('%s', (_name, last, asked, hidden, want) => {
    expect(keepDue(now, last, asked, hidden)).toBe(want)
  })
})

import { describe, expect, it } from 'vitest'
import { canCancel, canMarkDone, canReschedule, doneAtProblem, enquiryAfterCancel, visitDayLimits, visitStartProblem } from '../../shared/utils/visit-status'
import { visitsStillToDo } from '../../shared/utils/today'
import { visitFeedEntry } from '../../shared/utils/ics'

// Our own rules for a visit after it is booked (no trade or legal figure): what each status may
// become, the time limits the server and the date picker share, where the enquiry goes, and what
// the calendar feed carries. The slack figures (5 minutes for a phone's clock, 15 for a form left
// open) are our choice.

const NOW = new Date('2026-12-05T10:00:00Z')
const min = (n: number) => new Date(NOW.getTime() + n * 60_000)

describe('what a visit in each status may become', () => {
  it.each([
    ['booked', { ok: true, same: false }, { ok: true, same: false }, { ok: true, same: false }],
    ['done', { ok: true, same: true }, { ok: false }, { ok: false }],
    ['cancelled', { ok: false }, { ok: true, same: true }, { ok: false }],
  ] as const)('%s: done, cancel, move', (status, done, cancel, move) => {
    expect(canMarkDone(status)).toMatchObject(done)
    expect(canCancel(status)).toMatchObject(cancel)
    expect(canReschedule(status)).toMatchObject(move)
  })
})

describe('times', () => {
  it.each<[string, Date, string | null]>([
    ['now', NOW, null],
    ['an hour ago', min(-60), null],
    ['a phone clock 4 minutes ahead', min(4), null],
    ['6 minutes ahead', min(6), 'The time it was done cannot be in the future.'],
  ])('done %s', (_what, at, problem) => expect(doneAtProblem(at, NOW)).toBe(problem))

  it.each<[string, Date, 'book' | 'move', RegExp | null]>([
    ['a booking next week', min(7 * 1440), 'book', null],
    ['a booking last week (recorded after the fact)', min(-7 * 1440), 'book', null],
    ['a move to last week', min(-7 * 1440), 'move', /past/],
    ['a move to 10 minutes ago (the form was open a while)', min(-10), 'move', null],
    ['any time on the last day the picker offers (2027-12-05 23:30 UTC)', new Date('2027-12-05T23:30:00Z'), 'move', null],
    ['two days past it', new Date('2027-12-07T10:00:00Z'), 'book', /within a year \(by 2027-12-05\)/],
  ])('%s', (_what, at, kind, problem) => {
    const got = visitStartProblem(at, NOW, kind)
    if (problem) expect(got).toMatch(problem)
    else expect(got).toBeNull()
  })

  it('offers the days from today (in Britain) to a year ahead', () => {
    expect(visitDayLimits(NOW)).toEqual({ first: '2026-12-05', last: '2027-12-05' })
    // 23:30 UTC on 30 June is already 1 July in Britain (BST)
    expect(visitDayLimits(new Date('2026-06-30T23:30:00Z')).first).toBe('2026-07-01')
  })
})

describe('the enquiry after a cancel', () => {
  it.each([
    ['back to new', 'visit-booked', 'new', 0, 'new'],
    ['back to quoted, when it was quoted before the visit was booked', 'visit-booked', 'quoted', 0, 'quoted'],
    ['no history: new', 'visit-booked', null, 0, 'new'],
    ['another visit still booked: stays', 'visit-booked', 'new', 1, null],
    ['already moved on (quoted): stays', 'quoted', 'new', 0, null],
  ] as const)('%s', (_what, current, before, others, want) => expect(enquiryAfterCancel(current, before, others)).toBe(want))
})

describe('Today and the calendar feed', () => {
  it('Today lists only the visits still to do, soonest first', () => {
    const rows = [
      { id: 'c', status: 'booked' as const, startsAt: '2026-12-07T09:00:00Z' },
      { id: 'a', status: 'done' as const, startsAt: '2026-12-05T09:00:00Z' },
      { id: 'b', status: 'booked' as const, startsAt: '2026-12-06T09:00:00Z' },
      { id: 'd', status: 'cancelled' as const, startsAt: '2026-12-06T08:00:00Z' },
    ]
    expect(visitsStillToDo(rows, 5).map(r => r.id)).toEqual(['b', 'c'])
    expect(visitsStillToDo(rows, 1).map(r => r.id)).toEqual(['b'])
  })

  it('keeps a visit\'s UID, counts its moves as the SEQUENCE, and leaves a cancelled one out', () => {
    const v = { id: 'v1', startsAt: new Date('2026-12-10T09:00:00Z'), durationMinutes: 90 }
    expect(visitFeedEntry({ ...v, status: 'booked' }, 2)).toEqual({ uid: 'visit-v1@setwell', sequence: 2, startMs: Date.parse('2026-12-10T09:00:00Z'), endMs: Date.parse('2026-12-10T10:30:00Z') })
    expect(visitFeedEntry({ ...v, status: 'done' }, 0)?.uid).toBe('visit-v1@setwell')
    expect(visitFeedEntry({ ...v, status: 'cancelled' }, 1)).toBeNull()
  })
})

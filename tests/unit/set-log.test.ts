import { describe, expect, it } from 'vitest'
import {
  coatForSet, FUTURE_SLACK_MINUTES, inTheFuture, loggedTasks, MAX_PACKS_X1000, MAX_SET_HOURS, mayChangeLog, plannedBags, setLogFieldErrors, setLogTimes, setProgress,
  setToLog, setTooLong, tasksToTick,
} from '../../shared/utils/set-log'
import { setLogSchema } from '../../shared/schemas/job'

// Sources: the coat rule is the firm's own (DOMAIN.md "Planning the sets": a set is laid on and
// trowelled up in one go); the clocks, The Summer Time Act 1972 / Summer Time Order 2002 (BST from
// 01:00 GMT on the last Sunday of March to 01:00 GMT on the last Sunday of October).
describe('coatForSet: the coat a set on the plan is logged as', () => {
  it.each<[string, ('fill' | 'undercoat' | 'tight-coat' | 'skim')[], string]>([
    ['a skim with its fills is the second coat', ['fill', 'skim'], 'second'],
    // an undercoat over a whole surface is undercoat like a patch fill, and dries as one (the firm's undercoat days)
    ['an undercoat is a fill', ['undercoat'], 'fill'],
    ['an undercoat with a tight coat is a fill', ['tight-coat', 'undercoat'], 'fill'],
    ['a skim with an undercoat in the set is the second coat', ['undercoat', 'skim'], 'second'],
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

describe('setProgress with the plan\'s tasks ticked: a set can be logged in parts', () => {
  // the firm's own rule (DOMAIN.md "Planning the sets"): a set is its tasks; it is done when each is done
  const A = '00000000-0000-4000-8000-00000000000a'
  const B = '00000000-0000-4000-8000-00000000000b'
  const C = '00000000-0000-4000-8000-00000000000c'
  const set1 = { number: 1, tasks: [{ surfaceId: A, action: 'fill' as const, bags: 0.5 }, { surfaceId: B, action: 'tight-coat' as const, bags: 1 }, { surfaceId: C, action: 'skim' as const, bags: 2.3 }] }
  type T = { surfaceId: string, action: 'fill' | 'tight-coat' | 'skim' }
  const entry = (tasks: T[], coat: 'fill' | 'tight-coat' | 'first' | 'second' | null = coatForSet(tasks), setNumber = 1, kind = 'set', id?: string) => ({ id, kind, setNumber, coat, tasks })
  const fill: T = { surfaceId: A, action: 'fill' }
  const tight: T = { surfaceId: B, action: 'tight-coat' }
  const skim: T = { surfaceId: C, action: 'skim' }
  it.each<[string, ReturnType<typeof entry>[], string, string[]]>([
    ['nothing logged (common practice)', [], 'to-do', ['A|fill', 'B|tight-coat', 'C|skim']],
    ['the fill now, the rest later: part logged (common practice)', [entry([fill])], 'partly', ['B|tight-coat', 'C|skim']],
    ['the fill and tight coat in one entry, the skim in another: done (common practice)', [entry([fill, tight]), entry([skim])], 'done', []],
    ['every task in one entry: done (common practice)', [entry([fill, tight, skim])], 'done', []],
    ['the skim alone, even as the final coat, leaves the fill to do: part logged (common practice)', [entry([skim], 'second')], 'partly', ['A|fill', 'B|tight-coat']],
    ['the same task twice is still one task (common practice)', [entry([fill]), entry([fill])], 'partly', ['B|tight-coat', 'C|skim']],
    ['an entry made before tasks, at the set\'s final coat: done the old way (from memory: entries logged before this change)', [{ id: undefined, kind: 'set', setNumber: 1, coat: 'second' as const, tasks: [] }], 'done', []],
    ['an entry made before tasks, at a first coat: part logged, nothing ticked off (from memory)', [{ id: undefined, kind: 'set', setNumber: 1, coat: 'first' as const, tasks: [] }], 'partly', ['A|fill', 'B|tight-coat', 'C|skim']],
    ['another set\'s entry does not count (common practice)', [entry([fill, tight, skim], 'second', 2)], 'to-do', ['A|fill', 'B|tight-coat', 'C|skim']],
    ['a problem found does not count (common practice)', [entry([fill], null, 1, 'problem')], 'to-do', ['A|fill', 'B|tight-coat', 'C|skim']],
  ])('%s', (_what, logs, progress, toTick) => {
    const key = (k: string) => k.replace('A|', `${A}|`).replace('B|', `${B}|`).replace('C|', `${C}|`)
    expect(setProgress(set1, logs)).toBe(progress)
    expect(tasksToTick(set1, logs)).toEqual(toTick.map(key))
  })
  it('leaves out the entry being corrected, so its own tasks can be ticked again', () => {
    const logs = [entry([fill], 'fill', 1, 'set', 'one'), entry([skim], 'second', 1, 'set', 'two')]
    expect([...loggedTasks(set1, logs, 'two')]).toEqual([`${A}|fill`])
  })
  it.each<[string, string[], string]>([
    ['every task ticked: the plan\'s bags added in tenths (0.5 + 1 + 2.3)', [`${A}|fill`, `${B}|tight-coat`, `${C}|skim`], '3.8'],
    ['the skim only', [`${C}|skim`], '2.3'],
    ['nothing ticked: left empty', [], ''],
  ])('plannedBags: %s', (_what, ticked, bags) => expect(plannedBags(set1.tasks, ticked)).toBe(bags))
})

describe('inTheFuture and the schema: a set is logged once it is done (a few minutes\' slack for a phone\'s clock)', () => {
  const now = new Date('2026-12-05T10:00:00Z')
  it.each<[string, string, boolean]>([
    ['an hour ago', '2026-12-05T09:00:00Z', false],
    ['now', '2026-12-05T10:00:00Z', false],
    ['four minutes ahead: a phone\'s clock (common practice)', '2026-12-05T10:04:00Z', false],
    ['exactly the slack', '2026-12-05T10:05:00Z', false],
    ['six minutes ahead', '2026-12-05T10:06:00Z', true],
    ['tomorrow morning', '2026-12-06T08:00:00Z', true],
  ])('%s', (_what, at, refused) => {
    expect(FUTURE_SLACK_MINUTES).toBe(5)
    expect(inTheFuture(at, now) !== null).toBe(refused)
  })
  it('names the time in London words', () => expect(inTheFuture('2026-12-06T08:00:00Z', now)).toBe('08:00 on Sun 6 Dec is still to come: log a set once it is done.'))
  it('the schema refuses a start or a finish still to come, beside the field', () => {
    const later = new Date(Date.now() + 3 * 3600_000).toISOString()
    const earlier = new Date(Date.now() - 3600_000).toISOString()
    const r = setLogSchema.safeParse({ kind: 'set', setNumber: 1, coat: 'fill', surfaceIds: ['00000000-0000-4000-8000-00000000000a'], startedAt: earlier, endedAt: later })
    expect(r.success).toBe(false)
    expect(r.error!.issues.map(i => i.path.join('.'))).toEqual(['endedAt'])
    expect(setLogSchema.safeParse({ kind: 'set', setNumber: 1, coat: 'fill', surfaceIds: ['00000000-0000-4000-8000-00000000000a'], startedAt: earlier, endedAt: new Date().toISOString() }).success).toBe(true)
  })
  it('the schema refuses the same task twice', () => {
    const t = { surfaceId: '00000000-0000-4000-8000-00000000000a', action: 'fill' }
    const r = setLogSchema.safeParse({ kind: 'set', setNumber: 1, coat: 'fill', surfaceIds: [t.surfaceId], tasks: [t, t] })
    expect(r.error!.issues.map(i => i.path.join('.'))).toEqual(['tasks'])
  })
  it('the schema takes an undercoat task (the plan\'s undercoat over a whole surface), and refuses an action the plan does not have', () => {
    const surfaceId = '00000000-0000-4000-8000-00000000000a'
    expect(setLogSchema.safeParse({ kind: 'set', setNumber: 1, coat: 'fill', surfaceIds: [surfaceId], tasks: [{ surfaceId, action: 'undercoat' }] }).success).toBe(true)
    const r = setLogSchema.safeParse({ kind: 'set', setNumber: 1, coat: 'fill', surfaceIds: [surfaceId], tasks: [{ surfaceId, action: 'render' }] })
    expect(r.error!.issues.map(i => [i.path.join('.'), i.message])).toEqual([['tasks.0.action', 'Choose fill, undercoat, tight coat or skim.']])
  })
})

describe('mayChangeLog: who may correct or remove an entry', () => {
  // the firm's own rule (issue 15): the person who logged it, the same London day; the owner any time
  const now = new Date('2026-12-05T23:30:00Z') // 23:30 in London (GMT)
  const log = (loggedBy: string, createdAt: string) => ({ loggedBy, createdAt })
  it.each<[string, { userId: string, role: string }, ReturnType<typeof log>, string, boolean]>([
    ['the logger, the same day', { userId: 'kit', role: 'crew' }, log('kit', '2026-12-05T08:00:00Z'), 'in-progress', true],
    ['the logger, the next day', { userId: 'kit', role: 'crew' }, log('kit', '2026-12-04T16:00:00Z'), 'in-progress', false],
    ['another crew member, the same day', { userId: 'ash', role: 'crew' }, log('kit', '2026-12-05T08:00:00Z'), 'in-progress', false],
    ['the office, who did not log it', { userId: 'ola', role: 'office' }, log('kit', '2026-12-05T08:00:00Z'), 'in-progress', false],
    ['the owner, a week on', { userId: 'jo', role: 'owner' }, log('kit', '2026-11-28T08:00:00Z'), 'finished', true],
    ['the owner, on an invoiced job', { userId: 'jo', role: 'owner' }, log('kit', '2026-12-05T08:00:00Z'), 'invoiced', false],
    ['the logger, on a cancelled job', { userId: 'kit', role: 'crew' }, log('kit', '2026-12-05T08:00:00Z'), 'cancelled', false],
    ['a summer day is London\'s: 00:30 BST on 1 July is 1 July (The Summer Time Act 1972)', { userId: 'kit', role: 'crew' }, log('kit', '2026-06-30T23:30:00Z'), 'in-progress', true],
  ])('%s', (_what, who, entry, status, may) => {
    const at = entry.createdAt.startsWith('2026-06') ? new Date('2026-07-01T20:00:00Z') : now
    expect(mayChangeLog(who, entry, status, at)).toBe(may)
  })
})

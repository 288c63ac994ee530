import { describe, expect, it } from 'vitest'
import { DEFAULT_REMINDERS, fillTemplate, lateness, reminderForToday, ruleStageLabel, scheduledStep, standing, TEMPLATE_FIELDS } from '../../shared/utils/reminders'
import { addDays } from '../../shared/utils/dates'

// Which reminder fits where an invoice stands: before its due date, on it, overdue by N days.
const DUE = '2026-12-03'
const on = (days: number) => addDays(DUE, days)
const offsets = (rules: { offsetDays: number }[]) => rules.map(r => r.offsetDays)

describe('standing: the stage of a day', () => {
  it.each([
    [-5, 'before', -5], [-1, 'before', -1], [0, 'on', 0], [1, 'overdue', 1], [40, 'overdue', 40],
  ] as const)('%i days from the due date: %s', (days, stage, n) => {
    expect(standing(DUE, on(days))).toEqual({ stage, days: n })
  })
})

describe('reminderForToday ("send now"), with the starting schedule -3, 0, 7, 14, 30', () => {
  it.each([
    // [days from the due date, the rule chosen]
    [-10, -3], // before any step: the earliest one before the due date
    [-3, -3], [-1, -3],
    [0, 0], // on it
    [1, 7], // overdue, before any overdue step: the first overdue one ("1 day overdue")
    [6, 7], [7, 7], [13, 7], [14, 14], [29, 14], [30, 30],
    [36, 30], // the bug seen: 36 days late said "is due today"
    [40, 30], [400, 30],
  ])('%i days -> the %i-day rule', (days, offset) => {
    expect(reminderForToday(DEFAULT_REMINDERS, DUE, on(days)).offsetDays).toBe(offset)
  })

  it('falls back to our words for a stage the firm\'s schedule has none for, never to another stage\'s', () => {
    const onlyLate = [{ offsetDays: 10, subject: 'late', body: 'late' }]
    expect(reminderForToday(onlyLate, DUE, on(-2))).toEqual(DEFAULT_REMINDERS.find(r => r.offsetDays === -3))
    expect(reminderForToday(onlyLate, DUE, on(0))).toEqual(DEFAULT_REMINDERS.find(r => r.offsetDays === 0))
    expect(reminderForToday(onlyLate, DUE, on(3)).subject).toBe('late')
    expect(reminderForToday([], DUE, on(36)).offsetDays).toBe(30)
  })
})

describe('scheduledStep: the step the schedule sends today', () => {
  it.each([
    [-10, null], [-3, -3], [-1, -3], [0, 0],
    [1, null], // the due-date step's words say "today": not sent the day after
    [6, null], [7, 7], [13, 7], [14, 14], [30, 30], [40, 30],
  ])('%i days from the due date -> %s', (days, step) => {
    expect(scheduledStep(DEFAULT_REMINDERS, DUE, on(days))).toBe(step)
  })
})

describe('the starting words are true on every day they can be sent', () => {
  const values = (days: number) => ({ customer: 'Perpetua Gaunt', reference: 'BP-12', amount: '£640.00', due: 'Thursday 3 December 2026', ...lateness(DUE, on(days)), firm: 'Brackenridge Plastering', phone: '01632 960 733', bank: '' })
  it.each([-10, -3, -1, 0, 1, 2, 7, 13, 14, 29, 30, 36, 40, 400])('%i days from the due date', (days) => {
    const rule = reminderForToday(DEFAULT_REMINDERS, DUE, on(days))
    const words = `${fillTemplate(rule.subject, values(days))}\n${fillTemplate(rule.body, values(days))}`
    expect(words).not.toMatch(/\{\w+\}/)
    if (days !== 0) expect(words).not.toMatch(/today/)
    if (days <= 0) expect(words).not.toMatch(/overdue/)
    if (days > 0) expect(words).toContain(`${days} ${days === 1 ? 'day' : 'days'} overdue`)
    expect(words).not.toMatch(/a week|two weeks|a month|1 days/)
  })

  it('every field is known to the template', () => {
    expect(TEMPLATE_FIELDS).toEqual(expect.arrayContaining(['days', 'overdue', 'phone', 'amount']))
    expect(offsets(DEFAULT_REMINDERS)).toEqual([-3, 0, 7, 14, 30])
  })
})

describe('lateness and the stage labels', () => {
  it.each([
    [-3, { days: '3', overdue: 'due in 3 days' }], [0, { days: '0', overdue: 'due today' }],
    [1, { days: '1', overdue: '1 day overdue' }], [40, { days: '40', overdue: '40 days overdue' }],
  ] as const)('%i days', (days, out) => expect(lateness(DUE, on(days))).toEqual(out))

  it.each([
    [-3, 'Before the due date: sent 3 days before it'], [-1, 'Before the due date: sent 1 day before it'], [0, 'On the due date'],
    [7, 'Overdue: sent 7 days after the due date, and used until the next overdue reminder'],
  ])('%i days: %s', (offset, label) => expect(ruleStageLabel(offset)).toBe(label))
})

// Payment reminders: the schedule a firm starts with (days from the due date; negative is before
// it), the words, and which reminder fits where an invoice stands today. Pure.
//
// An invoice stands in one of three stages on a day: before its due date, on it, or overdue by N
// days. A rule belongs to the stage of its own day (offset < 0 before, 0 on, > 0 overdue), and its
// words are only ever sent in that stage, so "is due today" never reaches a customer 36 days late.
import { addDays, daysBetween, daysInWords } from './dates'

export interface ReminderRule { offsetDays: number, subject: string, body: string }

export type ReminderStage = 'before' | 'on' | 'overdue'

/**
 * Our own starting schedule and words; the firm changes them. Each is true on every day it can be
 * sent: a step stays in use until the next one, and "send now" may pick an overdue step before its
 * day, so the overdue words say how late the invoice is with {overdue} ("40 days overdue"), never
 * "a week" or "a month". The firm's name, phone and e-mail, the pay link and the bank details are
 * added under the words with a "Thank you," (server/utils/mail.ts), so the words need no sign-off.
 */
export const DEFAULT_REMINDERS: ReminderRule[] = [
  { offsetDays: -3, subject: 'Invoice {reference} is due on {due}', body: 'Hello {customer},\n\nA friendly note that invoice {reference} for {amount} is due on {due}. If you have already paid, thank you, and please ignore this.' },
  { offsetDays: 0, subject: 'Invoice {reference} is due today', body: 'Hello {customer},\n\nInvoice {reference} for {amount} is due today, {due}. If you have already paid, thank you, and please ignore this.' },
  { offsetDays: 7, subject: 'Invoice {reference} is overdue', body: 'Hello {customer},\n\nInvoice {reference} was due on {due} and is now {overdue}: {amount} is still to pay. Please pay it, or let us know if something is wrong.' },
  { offsetDays: 14, subject: 'Invoice {reference} is still unpaid', body: 'Hello {customer},\n\nInvoice {reference} is now {overdue} and {amount} is still to pay. Please pay it this week, or give us a ring to agree a date.' },
  { offsetDays: 30, subject: 'Invoice {reference}: please pay now', body: 'Hello {customer},\n\nInvoice {reference} was due on {due} and is now {overdue}. {amount} is still to pay: please pay it now, or give us a ring.' },
]

export const TEMPLATE_FIELDS = ['customer', 'reference', 'amount', 'due', 'days', 'overdue', 'firm', 'phone', 'bank'] as const
export type TemplateValues = Record<(typeof TEMPLATE_FIELDS)[number], string>

/** What each {field} puts in, for the settings screen. */
export const TEMPLATE_FIELD_HELP: Record<(typeof TEMPLATE_FIELDS)[number], string> = {
  customer: 'the customer\'s contact name',
  reference: 'the invoice\'s reference',
  amount: 'what is still owed',
  due: 'the due date, like Thursday 3 December 2026',
  days: 'how many days late (or, before the due date, how many days are left), as a number',
  overdue: 'how late, in words: "1 day overdue", "40 days overdue"',
  firm: 'your trading name',
  phone: 'your phone number',
  bank: 'your bank account for transfers (blank when you do not take transfers)',
}

/** Put the invoice's details into a template's {fields}; an unknown {field} stays as written. */
export function fillTemplate(template: string, values: TemplateValues): string {
  return template.replace(/\{(\w+)\}/g, (whole, key: string) => (key in values ? values[key as keyof TemplateValues] : whole))
}

/** The stage of a day relative to the due date: days < 0 before, 0 on, > 0 overdue. */
export const stageOfOffset = (offsetDays: number): ReminderStage => (offsetDays < 0 ? 'before' : offsetDays === 0 ? 'on' : 'overdue')

/** Where an invoice stands on `today`: its stage and the days from the due date (negative: before it). */
export function standing(dueOn: string, today: string): { stage: ReminderStage, days: number } {
  const days = daysBetween(dueOn, today)
  if (Number.isNaN(days)) throw new RangeError(`not ISO dates: ${dueOn}, ${today}`)
  return { stage: stageOfOffset(days), days }
}

/** Which stage a rule's words are for, in words for the settings screen. */
export function ruleStageLabel(offsetDays: number): string {
  if (offsetDays < 0) return `Before the due date: sent ${daysInWords(-offsetDays)} before it`
  if (offsetDays === 0) return 'On the due date'
  return `Overdue: sent ${daysInWords(offsetDays)} after the due date, and used until the next overdue reminder`
}

/**
 * The step of the schedule an unpaid invoice has reached on a day: the latest rule whose date
 * (due date + offset) has come. Null when none has come yet.
 */
export function reminderDue(rules: readonly Pick<ReminderRule, 'offsetDays'>[], dueOn: string, today: string): number | null {
  let step: number | null = null
  for (const r of [...rules].sort((a, b) => a.offsetDays - b.offsetDays)) {
    if (addDays(dueOn, r.offsetDays) <= today) step = r.offsetDays
  }
  return step
}

/**
 * The step the schedule sends today: the latest step reached, but only while the invoice is still
 * in that step's stage. An invoice found 40 days late gets the 30-day reminder, not all five at
 * once; the due-date step is not sent the day after (its words say "today"), and a step before
 * the due date is not sent once the day has come. Null when nothing is to be sent.
 */
export function scheduledStep(rules: readonly Pick<ReminderRule, 'offsetDays'>[], dueOn: string, today: string): number | null {
  const step = reminderDue(rules, dueOn, today)
  if (step === null) return null
  return stageOfOffset(step) === standing(dueOn, today).stage ? step : null
}

/**
 * The rule whose words fit where the invoice stands today ("send now" from the invoice's page):
 * in the invoice's stage, the latest step reached; before any step of that stage is reached, the
 * stage's earliest step (before the due date: the earliest reminder before it; overdue: the first
 * overdue one, whose words say how late with {overdue}). When the firm's schedule has no rule for
 * the stage, our default words for it, so the words are always true.
 */
export function reminderForToday<R extends Pick<ReminderRule, 'offsetDays'>>(rules: readonly R[], dueOn: string, today: string): R | ReminderRule {
  const { stage, days } = standing(dueOn, today)
  const pick = <T extends Pick<ReminderRule, 'offsetDays'>>(list: readonly T[]): T | undefined => {
    const inStage = [...list].filter(r => stageOfOffset(r.offsetDays) === stage).sort((a, b) => a.offsetDays - b.offsetDays)
    return [...inStage].reverse().find(r => r.offsetDays <= days) ?? inStage[0]
  }
  return pick(rules) ?? pick(DEFAULT_REMINDERS)!
}

/** The {days} and {overdue} fields for an invoice on a day. */
export function lateness(dueOn: string, today: string): { days: string, overdue: string } {
  const { days } = standing(dueOn, today)
  return { days: String(Math.abs(days)), overdue: days > 0 ? `${daysInWords(days)} overdue` : days === 0 ? 'due today' : `due in ${daysInWords(-days)}` }
}

/** A reminder's key: the invoice and the step, so the same reminder is never sent twice. */
export const reminderKey = (invoiceId: string, offsetDays: number) => `${invoiceId}:${offsetDays}`

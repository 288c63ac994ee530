// Payment reminders: the schedule a firm starts with (days from the due date; negative is before
// it), the words, and which step of the schedule an invoice has reached. Pure.
import { addDays } from './dates'

export interface ReminderRule { offsetDays: number, subject: string, body: string }

/** Our own starting schedule and words; the firm changes them. */
export const DEFAULT_REMINDERS: ReminderRule[] = [
  { offsetDays: -3, subject: 'Invoice {reference} is due on {due}', body: 'Hello {customer},\n\nA friendly note that invoice {reference} for {amount} from {firm} is due on {due}.\n\nThank you,\n{firm}' },
  { offsetDays: 0, subject: 'Invoice {reference} is due today', body: 'Hello {customer},\n\nInvoice {reference} for {amount} is due today. If you have already paid, thank you, and please ignore this.\n\n{firm}' },
  { offsetDays: 7, subject: 'Invoice {reference} is a week overdue', body: 'Hello {customer},\n\nInvoice {reference} was due on {due} and {amount} is still to pay. Please pay it, or let us know if something is wrong.\n\n{firm}' },
  { offsetDays: 14, subject: 'Invoice {reference} is two weeks overdue', body: 'Hello {customer},\n\nInvoice {reference} is now two weeks overdue: {amount} is still to pay. Please pay it this week, or call us to agree a date.\n\n{firm}' },
  { offsetDays: 30, subject: 'Invoice {reference}: a month overdue', body: 'Hello {customer},\n\nInvoice {reference} is a month overdue and {amount} is still to pay. Please pay it now, or call us.\n\n{firm}' },
]

export const TEMPLATE_FIELDS = ['customer', 'reference', 'amount', 'due', 'firm', 'bank'] as const
export type TemplateValues = Record<(typeof TEMPLATE_FIELDS)[number], string>

/** Put the invoice's details into a template's {fields}; an unknown {field} stays as written. */
export function fillTemplate(template: string, values: TemplateValues): string {
  return template.replace(/\{(\w+)\}/g, (whole, key: string) => (key in values ? values[key as keyof TemplateValues] : whole))
}

/**
 * The step of the schedule an unpaid invoice has reached on a day: the latest rule whose date
 * (due date + offset) has come. Only that one is sent: an invoice found 40 days late gets the
 * 30-day reminder, not all five at once. Null when none has come yet.
 */
export function reminderDue(rules: readonly Pick<ReminderRule, 'offsetDays'>[], dueOn: string, today: string): number | null {
  let step: number | null = null
  for (const r of [...rules].sort((a, b) => a.offsetDays - b.offsetDays)) {
    if (addDays(dueOn, r.offsetDays) <= today) step = r.offsetDays
  }
  return step
}

/** A reminder's key: the invoice and the step, so the same reminder is never sent twice. */
export const reminderKey = (invoiceId: string, offsetDays: number) => `${invoiceId}:${offsetDays}`

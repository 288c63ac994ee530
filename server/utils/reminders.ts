// Sending payment reminders: the firm's schedule (the defaults from when the firm was made), which
// invoices are due one today, and sending one at most once per invoice and step (the chase log's
// reminder key is unique, written before the e-mail goes). The background job (server/plugins/
// jobs.ts) and "send a reminder now" both come here.
import { and, asc, eq, isNull, sql } from 'drizzle-orm'
import { chaseNotes, customers, firms, invoices, reminderRules } from '../db/schema'
import { bankAccountInline, hasBankAccount } from '#shared/utils/bank-details'
import { fullDate } from '#shared/utils/dates'
import { fillTemplate, lateness, reminderForToday, reminderKey, scheduledStep, stageOfOffset, standing } from '#shared/utils/reminders'
import { transferSentence } from './invoice-mail'

/**
 * The firm's schedule. The defaults are the firm's from when it was made (server/db/firm-defaults.ts,
 * recorded as 'reminders.defaulted'); an empty schedule the firm saved stays empty (no reminders).
 */
export async function reminderRulesFor(f: FirmScope) {
  return f.tx.select().from(reminderRules).where(f.where(reminderRules)).orderBy(asc(reminderRules.offsetDays))
}

/** The reminders the schedule asks for today: each owing invoice at its latest step not yet sent, while it is still in that step's stage. */
export async function dueReminders(f: FirmScope, today = todayIso()) {
  const rules = await reminderRulesFor(f)
  if (!rules.length) return []
  const owing = (await listOwing(f, today)).filter(i => i.dueOn && i.outstandingPence > 0)
  const sent = new Set((await f.tx.select({ key: chaseNotes.reminderKey }).from(chaseNotes).where(f.where(chaseNotes, eq(chaseNotes.kind, 'reminder')))).map(r => r.key))
  const out: { invoiceId: string, offsetDays: number }[] = []
  for (const i of owing) {
    const step = scheduledStep(rules, i.dueOn!, today)
    if (step !== null && !sent.has(reminderKey(i.id, step))) out.push({ invoiceId: i.id, offsetDays: step })
  }
  return out
}

/**
 * Send one reminder, at most once per key: the chase note with the key is written (or found) and
 * claimed (marked sent) in one transaction; the e-mail goes after; a failed send unmarks it so a
 * retry can send it. Two senders at once, or a retry after success, find it claimed.
 * `offsetDays` null is "send one now" from the invoice's page, with a key of its own.
 *
 * The words are the firm's rule for where the invoice stands today (shared/utils/reminders.ts
 * reminderForToday): a scheduled step whose stage has passed is not sent (dueReminders never asks
 * for one), and "send now" picks the same way. Each carries the amount outstanding, the firm's
 * phone (its sign-off), a pay link and, when the firm takes transfers, its bank account.
 *
 * The pay link: only a link's hash is kept, so the reminder gives the customer a new link to the
 * invoice page, as "Send again" does (the one sent before stops working, and the e-mail says so).
 * When the e-mail fails, the old link is put back with the unmarked note.
 */
export async function sendReminder(scope: { firmId: string, userId: string | null }, invoiceId: string, offsetDays: number | null, today = todayIso()): Promise<'sent' | 'already sent' | 'nothing owed'> {
  const key = offsetDays === null ? `${invoiceId}:now:${crypto.randomUUID()}` : reminderKey(invoiceId, offsetDays)
  const prepared = await withFirm(scope, async (f) => {
    const inv = await findOr404(f, invoices, invoiceId, { lock: true })
    const money = await moneyAgainst(f, [inv.id])
    const { outstandingPence: owed } = statusOf(inv, money)
    if (!inv.issuedOn || !inv.dueOn || inv.kind === 'credit-note' || owed <= 0) return null
    const rules = await reminderRulesFor(f)
    // a step of the schedule sends its own words; by hand (or a step no longer in the schedule), the words for where the invoice stands
    const stepRule = offsetDays !== null ? rules.find(r => r.offsetDays === offsetDays) : undefined
    const rule = stepRule && stageOfOffset(stepRule.offsetDays) === standing(inv.dueOn, today).stage ? stepRule : reminderForToday(rules, inv.dueOn, today)
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId))
    if (!customer?.email) return null
    await f.tx.insert(chaseNotes).values(f.values({ invoiceId, kind: 'reminder' as const, note: offsetDays === null ? 'Reminder sent by hand' : `Reminder ${offsetDays < 0 ? `${-offsetDays} days before` : offsetDays === 0 ? 'on' : `${offsetDays} days after`} the due date`, reminderKey: key, byUserId: f.userId }))
      .onConflictDoNothing()
    // claim it: only one sender marks the note (the invoice row is locked meanwhile); a failed send gives it back
    const [note] = await f.tx.update(chaseNotes).set({ sentAt: new Date() }).where(f.where(chaseNotes, eq(chaseNotes.reminderKey, key), isNull(chaseNotes.sentAt))).returning()
    if (!note) return 'already sent' as const
    // a new link to the invoice page (only its hash is kept); the old one is put back if the e-mail fails
    const { token, hash } = newLinkToken(f.firmId)
    await f.tx.update(invoices).set({ tokenHash: hash, updatedAt: sql`now()` }).where(f.where(invoices, eq(invoices.id, inv.id)))
    const contact = await firmContact(f)
    const bank = firm!.takesTransfer && hasBankAccount(firm!) ? bankAccountInline(firm!) : ''
    const values = { customer: customer.contactName || customer.name, reference: inv.reference ?? '', amount: formatPence(owed), due: fullDate(inv.dueOn), ...lateness(inv.dueOn, today), firm: contact.tradingName, phone: contact.phone, bank }
    const mail = firmMail(contact, {
      to: customer.email,
      subject: fillTemplate(rule.subject, values),
      text: fillTemplate(rule.body, values),
      links: [{ label: `View invoice ${inv.reference} and pay ${formatPence(owed)} by card here`, url: appLink(`/i/${token}`) }],
      after: [
        transferSentence(firm, inv.reference),
        'This link replaces the one sent before, which no longer works. It is for you only; please do not forward it.',
      ].filter(Boolean).join('\n\n'),
    })
    return { noteId: note!.id, oldTokenHash: inv.tokenHash, newTokenHash: hash, mail }
  })
  if (prepared === null) return 'nothing owed'
  if (prepared === 'already sent') return 'already sent'
  try {
    await sendMail(prepared.mail)
  }
  catch (err) {
    await withFirm(scope, async (f) => {
      await f.tx.update(chaseNotes).set({ sentAt: null }).where(f.where(chaseNotes, eq(chaseNotes.id, prepared.noteId)))
      // the customer never got the new link: the one they hold works again (unless it changed since)
      await f.tx.update(invoices).set({ tokenHash: prepared.oldTokenHash }).where(f.where(invoices, and(eq(invoices.id, invoiceId), eq(invoices.tokenHash, prepared.newTokenHash))))
    })
    throw err
  }
  return 'sent'
}

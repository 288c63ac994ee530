// Sending payment reminders: the firm's schedule (the defaults from when the firm was made), which
// invoices are due one today, and sending one at most once per invoice and step (the chase log's
// reminder key is unique, written before the e-mail goes). The background job (server/plugins/
// jobs.ts) and "send a reminder now" both come here.
import { asc, eq, isNull } from 'drizzle-orm'
import { chaseNotes, customers, firms, invoices, reminderRules } from '../db/schema'
import { DEFAULT_REMINDERS, fillTemplate, reminderDue, reminderKey } from '#shared/utils/reminders'

/**
 * The firm's schedule. The defaults are the firm's from when it was made (server/db/firm-defaults.ts,
 * recorded as 'reminders.defaulted'); an empty schedule the firm saved stays empty (no reminders).
 */
export async function reminderRulesFor(f: FirmScope) {
  return f.tx.select().from(reminderRules).where(f.where(reminderRules)).orderBy(asc(reminderRules.offsetDays))
}

/** The reminders the schedule asks for today: each owing invoice at its latest step not yet sent. */
export async function dueReminders(f: FirmScope, today = todayIso()) {
  const rules = await reminderRulesFor(f)
  if (!rules.length) return []
  const owing = (await listOwing(f, today)).filter(i => i.dueOn && i.outstandingPence > 0)
  const sent = new Set((await f.tx.select({ key: chaseNotes.reminderKey }).from(chaseNotes).where(f.where(chaseNotes, eq(chaseNotes.kind, 'reminder')))).map(r => r.key))
  const out: { invoiceId: string, offsetDays: number }[] = []
  for (const i of owing) {
    const step = reminderDue(rules, i.dueOn!, today)
    if (step !== null && !sent.has(reminderKey(i.id, step))) out.push({ invoiceId: i.id, offsetDays: step })
  }
  return out
}

/**
 * Send one reminder, at most once per key: the chase note with the key is written (or found) and
 * claimed (marked sent) in one transaction; the e-mail goes after; a failed send unmarks it so a
 * retry can send it. Two senders at once, or a retry after success, find it claimed.
 * `offsetDays` null is "send one now" from the invoice's page, with a key of its own.
 */
export async function sendReminder(scope: { firmId: string, userId: string | null }, invoiceId: string, offsetDays: number | null): Promise<'sent' | 'already sent' | 'nothing owed'> {
  const key = offsetDays === null ? `${invoiceId}:now:${crypto.randomUUID()}` : reminderKey(invoiceId, offsetDays)
  const prepared = await withFirm(scope, async (f) => {
    const inv = await findOr404(f, invoices, invoiceId, { lock: true })
    const money = await moneyAgainst(f, [inv.id])
    const { outstandingPence: owed } = statusOf(inv, money)
    if (!inv.issuedOn || inv.kind === 'credit-note' || owed <= 0) return null
    const rules = await reminderRulesFor(f)
    // by hand with no schedule at all (the firm stopped reminders): the default words for the due date
    const rule = rules.find(r => r.offsetDays === offsetDays) ?? rules.find(r => r.offsetDays >= 0) ?? rules[0] ?? (offsetDays === null ? DEFAULT_REMINDERS.find(r => r.offsetDays === 0) : undefined)
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    const [firm] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId))
    if (!customer?.email || !rule) return null
    await f.tx.insert(chaseNotes).values(f.values({ invoiceId, kind: 'reminder' as const, note: offsetDays === null ? 'Reminder sent by hand' : `Reminder ${offsetDays < 0 ? `${-offsetDays} days before` : offsetDays === 0 ? 'on' : `${offsetDays} days after`} the due date`, reminderKey: key, byUserId: f.userId }))
      .onConflictDoNothing()
    // claim it: only one sender marks the note (the invoice row is locked meanwhile); a failed send gives it back
    const [note] = await f.tx.update(chaseNotes).set({ sentAt: new Date() }).where(f.where(chaseNotes, eq(chaseNotes.reminderKey, key), isNull(chaseNotes.sentAt))).returning()
    if (!note) return 'already sent' as const
    const values = { customer: customer.contactName || customer.name, reference: inv.reference ?? '', amount: formatPence(owed), due: inv.dueOn ?? '', firm: firm!.tradingName, bank: firm!.bankDetails }
    const extra = `\n\nPay by card from the link in our invoice e-mail${firm!.bankDetails ? `, or by bank transfer quoting ${inv.reference}: ${firm!.bankDetails}` : ''}.`
    return { noteId: note!.id, to: customer.email, subject: fillTemplate(rule.subject, values), text: fillTemplate(rule.body, values) + extra }
  })
  if (prepared === null) return 'nothing owed'
  if (prepared === 'already sent') return 'already sent'
  try {
    await sendMail({ to: prepared.to, subject: prepared.subject, text: prepared.text })
  }
  catch (err) {
    await withFirm(scope, f => f.tx.update(chaseNotes).set({ sentAt: null }).where(f.where(chaseNotes, eq(chaseNotes.id, prepared.noteId))))
    throw err
  }
  return 'sent'
}

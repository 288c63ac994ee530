import { addDays, fullDate, londonToday } from '../../shared/utils/dates'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { statuses, together } from '../reliability/race'

const OWNER_URL = () => requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL')

// The reminder is chosen by where the invoice stands today (before its due date, on it, overdue by
// N days), by "send now" and by the schedule alike, with the firm's starting words: never "is due
// today" on an invoice that is late (the bug seen: 36 days overdue, "is due today").

let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Stagewise Plastering'))
  // bank details, so an invoice offering transfer can be issued
  await queryAsFirm(OWNER_URL(), firmId, `update firms set phone = '01632 960 733', bank_account_name = 'Stagewise Plastering', bank_sort_code = '608371', bank_account_number = '31926819' where id = $1`, [firmId])
})
afterAll(async () => {
  await app?.stop()
})

async function setDueOn(invoiceId: string, date: string) {
  await queryAsFirm(OWNER_URL(), firmId, 'update invoices set due_on = $1 where id = $2', [date, invoiceId])
}

/** An issued invoice due `daysFromToday` from today (negative: overdue). */
async function invoiceDue(daysFromToday: number) {
  const email = uniqueEmail('stage')
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Perpetua Gaunt', email } })).body
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Render the garden wall', quantityX1000: 1000, unitPence: 640_00 }] })
  const issued = await owner.post(`/api/invoices/${d.id}/issue`)
  expect(issued.status, JSON.stringify(issued.body)).toBe(200)
  await app.waitForMail(email, /^Invoice /)
  const dueOn = addDays(londonToday(), daysFromToday)
  await setDueOn(d.id, dueOn)
  return { invoice: issued.body, email, dueOn }
}

const remindersTo = (email: string) => app.mails.filter(m => JSON.stringify(m.to).includes(email) && !/^Invoice \S+ from /.test(m.subject ?? ''))

async function onlyReminder(email: string) {
  await expect.poll(() => remindersTo(email).length).toBe(1)
  await new Promise(r => setTimeout(r, 200))
  expect(remindersTo(email)).toHaveLength(1)
  return remindersTo(email)[0]!
}

describe('"send now" picks the reminder for where the invoice stands', () => {
  it.each([
    // [stage, days from today to the due date, subject (with {reference}), words in the text, words never in it]
    ['5 days before the due date', 5, 'Invoice {reference} is due on {due}', ['is due on {due}'], ['today', 'overdue']],
    ['on the due date', 0, 'Invoice {reference} is due today', ['is due today'], ['overdue']],
    ['1 day after', -1, 'Invoice {reference} is overdue', ['is now 1 day overdue'], ['due today', '1 days']],
    ['40 days after', -40, 'Invoice {reference}: please pay now', ['is now 40 days overdue'], ['due today', 'a month']],
  ] as const)('%s', async (_stage, days, subject, has, hasNot) => {
    const { invoice, email, dueOn } = await invoiceDue(days)
    const fill = (s: string) => s.replace('{reference}', invoice.reference).replace('{due}', fullDate(dueOn))
    const res = await owner.post(`/api/invoices/${invoice.id}/reminders`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const mail = await onlyReminder(email)
    expect(mail.subject).toBe(fill(subject))
    for (const s of has) expect(mail.text).toContain(fill(s))
    for (const s of hasNot) expect(mail.text).not.toContain(s)
    expect(mail.text).toContain('£640.00')
    expect(mail.text).toContain('01632 960 733')
    expect(mail.text).toMatch(/\/i\/[\w-]+/)
    expect(mail.text).not.toMatch(/\d{4}-\d{2}-\d{2}/)
  })
})

describe('the schedule sends the step for where the invoice stands', () => {
  it('the day after the due date, the due-date step is not sent ("is due today" would be untrue)', async () => {
    const { invoice, email } = await invoiceDue(-1)
    const run = await owner.post('/api/reminders/run')
    expect(run.status).toBe(200)
    expect(run.body.results.filter((r: any) => r.invoiceId === invoice.id)).toEqual([])
    await new Promise(r => setTimeout(r, 300))
    expect(remindersTo(email)).toEqual([])
  })

  it('40 days late: the 30-day step, in words true at 40 days', async () => {
    const { invoice, email } = await invoiceDue(-40)
    const run = await owner.post('/api/reminders/run')
    expect(run.body.results.filter((r: any) => r.invoiceId === invoice.id)).toEqual([{ invoiceId: invoice.id, offsetDays: 30, result: 'sent' }])
    const mail = await onlyReminder(email)
    expect(mail.subject).toBe(`Invoice ${invoice.reference}: please pay now`)
    expect(mail.text).toContain('40 days overdue')
  })
})

describe('at most once, whatever runs at once', () => {
  it('ten schedule runs at once send the 30-day step once: one chase note in the database, one e-mail, and its link opens the invoice', async () => {
    const { invoice, email } = await invoiceDue(-40)
    const runs = await together(10, () => owner.post('/api/reminders/run'))
    expect(statuses(runs)).toEqual({ 200: 10 })
    const sent = runs.flatMap(r => r.body.results).filter((r: any) => r.invoiceId === invoice.id && r.result === 'sent')
    expect(sent).toHaveLength(1)
    const mail = await onlyReminder(email)
    await new Promise(r => setTimeout(r, 500))
    expect(remindersTo(email)).toHaveLength(1)
    const rows = await queryAsFirm<{ reminder_key: string, sent: boolean }>(OWNER_URL(), firmId, `select reminder_key, sent_at is not null as sent from chase_notes where firm_id = $1 and invoice_id = $2 and kind = 'reminder'`, [firmId, invoice.id])
    expect(rows).toEqual([{ reminder_key: `${invoice.id}:30`, sent: true }])
    // the link in the one e-mail sent is the invoice's live link
    const token = /\/i\/([\w-]+)/.exec(mail.text!)![1]!
    expect((await new Client(app.url).get(`/api/public/invoices/${token}`)).status).toBe(200)
  })
})

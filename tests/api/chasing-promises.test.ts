import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, londonToday } from '../../shared/utils/dates'
import { CHASE_REMOVAL_WORDS, PROMISE_DATE_PAST } from '../../shared/utils/chase'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { type ApiResponse, type Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { inviteAndJoin } from './support'

// Chasing that fits the partner's day (issue 18, part 2): one entry is a call, a message or a
// letter with how it went and, when they promised, the amount and the day (today or later); a
// promise not kept comes back as a next action the day after its day, and leaves once the amount
// is paid or someone chases again; an entry is removed by its writer that day or the owner any
// time, each removal in the audit log; a reminder sent stays.

let app: TestApp
let owner: Client
let firmId: string
let office: Client
let otherOffice: Client
let elsewhere: Client

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Promise Keepers Plastering'))
  office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office', 'Wenna Trask')).client
  otherOffice = (await inviteAndJoin(app, owner, uniqueEmail('office2'), 'office', 'Idris Pollard')).client
  elsewhere = (await signUpFirm(app.url, 'Elsewhere Coving')).client
})
afterAll(async () => {
  await app?.stop()
})

const short = (r: ApiResponse) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 400)}`
const today = () => londonToday()
const db = <T>(text: string, values: unknown[]) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)

async function issued(name: string, amountPence = 600_00) {
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name, email: uniqueEmail('customer'), billingLine1: '9 Quillet Row', billingPostcode: 'KB2 7PL' } })).body
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the back bedroom', quantityX1000: 1000, unitPence: amountPence }] })
  const inv = await owner.post(`/api/invoices/${d.id}/issue`)
  expect(inv.status, short(inv)).toBe(200)
  return inv.body as { id: string, reference: string, amountDuePence: number }
}

async function entry(who: Client, invoiceId: string, body: Record<string, unknown>) {
  const res = await who.post(`/api/invoices/${invoiceId}/chase-notes`, body)
  expect(res.status, short(res)).toBe(201)
  return res.body.chase.at(-1) as { id: string, kind: string, outcome: string, promisedPence: number | null, promisedOn: string | null }
}

const removal = (who: Client, invoiceId: string, noteId: string) => who.request('DELETE', `/api/invoices/${invoiceId}/chase-notes/${noteId}`)
const chaseOf = async (invoiceId: string) => (await owner.get(`/api/invoices/${invoiceId}`)).body.chase as { id: string, kind: string }[]
const auditOf = (noteId: string) => db<{ action: string, detail: any }>(`select action, detail from audit_log where firm_id = $1 and entity = 'chase_note' and entity_id = $2`, [firmId, noteId])
const broken = async (who = owner) => {
  const res = await who.get('/api/promises/broken')
  expect(res.status, short(res)).toBe(200)
  return res.body as { kind: string, key: string, title: string, detail: string, href: string, actionLabel: string, since: string, urgency: number }[]
}

describe('one chase entry', () => {
  it('is a call with how it went and a promise beside it; a promise dated in the past is refused beside its field and nothing is written', async () => {
    const inv = await issued('Morwenna Gilbey')
    const past = await office.post(`/api/invoices/${inv.id}/chase-notes`, { kind: 'call', outcome: 'promised', note: 'Will pay by Friday', promisedPence: 150_00, promisedOn: addDays(today(), -1) })
    expect(past.status, short(past)).toBe(400)
    expect(past.body.data.fields).toEqual({ promisedOn: PROMISE_DATE_PAST })
    expect(await chaseOf(inv.id)).toEqual([])
    // more than is owed is refused beside the amount
    const over = await office.post(`/api/invoices/${inv.id}/chase-notes`, { kind: 'call', outcome: 'promised', promisedPence: inv.amountDuePence + 1, promisedOn: today() })
    expect(over.status, short(over)).toBe(400)
    expect(Object.keys(over.body.data.fields)).toEqual(['promisedPence'])
    // a promise needs its outcome, and the outcome its promise
    const stray = await office.post(`/api/invoices/${inv.id}/chase-notes`, { kind: 'letter', outcome: 'no-reply', promisedPence: 100_00, promisedOn: today() })
    expect(Object.keys(stray.body.data.fields)).toEqual(['outcome'])
    expect(Object.keys((await office.post(`/api/invoices/${inv.id}/chase-notes`, { kind: 'call', outcome: 'promised' })).body.data.fields).sort()).toEqual(['promisedOn', 'promisedPence'])
    expect(await chaseOf(inv.id)).toEqual([])

    const call = await entry(office, inv.id, { kind: 'call', outcome: 'promised', note: 'Will pay by Friday', promisedPence: 150_00, promisedOn: today() })
    expect(call).toMatchObject({ kind: 'call', outcome: 'promised', promisedPence: 150_00, promisedOn: today(), note: 'Will pay by Friday' })
    const letter = await entry(office, inv.id, { kind: 'letter', outcome: 'no-reply' })
    expect(letter).toMatchObject({ kind: 'letter', outcome: 'no-reply', promisedPence: null, promisedOn: null })
    expect((await chaseOf(inv.id)).map(c => c.id)).toEqual([call.id, letter.id])
  })
})

describe('removing an entry', () => {
  it('is for its writer on the day and the owner any time, each in the audit log; others get 403, another firm 404', async () => {
    const inv = await issued('Tobias Quennell')
    const mine = await entry(office, inv.id, { kind: 'message', outcome: 'disputed', note: 'Says the coving is cracked' })
    // another office partner (no owner) is refused in words; the row stays
    const theirs = await removal(otherOffice, inv.id, mine.id)
    expect(theirs.status, short(theirs)).toBe(403)
    expect(theirs.body.data.message).toBe(CHASE_REMOVAL_WORDS['not-yours'])
    // another firm's owner, and this firm's entry under another invoice: no such entry
    expect((await removal(elsewhere, inv.id, mine.id)).status).toBe(404)
    const otherInvoice = await issued('Tobias Quennell')
    expect((await removal(owner, otherInvoice.id, mine.id)).status).toBe(404)
    expect((await chaseOf(inv.id)).map(c => c.id)).toEqual([mine.id])
    expect(await auditOf(mine.id)).toEqual([])

    // its writer, the same day
    const gone = await removal(office, inv.id, mine.id)
    expect(gone.status, short(gone)).toBe(204)
    expect(await chaseOf(inv.id)).toEqual([])
    const audit = await auditOf(mine.id)
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({ action: 'invoice.chase-removed', detail: { invoiceId: inv.id, removed: { kind: 'message', outcome: 'disputed', note: 'Says the coving is cracked' } } })

    // written yesterday (as time would have it): not its writer's any more, the owner's still
    const old = await entry(office, inv.id, { kind: 'call', outcome: 'no-reply' })
    await db('update chase_notes set at = at - interval \'1 day\' where firm_id = $1 and id = $2', [firmId, old.id])
    const late = await removal(office, inv.id, old.id)
    expect(late.status, short(late)).toBe(403)
    expect(late.body.data.message).toBe(CHASE_REMOVAL_WORDS['not-today'])
    await db('update chase_notes set at = at - interval \'90 days\' where firm_id = $1 and id = $2', [firmId, old.id])
    expect((await removal(owner, inv.id, old.id)).status).toBe(204)
    expect(await chaseOf(inv.id)).toEqual([])
    expect((await auditOf(old.id)).map(a => a.action)).toEqual(['invoice.chase-removed'])

    // a reminder that was sent stays, even for the owner
    expect((await owner.post(`/api/invoices/${inv.id}/reminders`)).status).toBe(200)
    const [reminder] = await chaseOf(inv.id)
    expect(reminder!.kind).toBe('reminder')
    const kept = await removal(owner, inv.id, reminder!.id)
    expect(kept.status, short(kept)).toBe(409)
    expect(kept.body.data.message).toBe(CHASE_REMOVAL_WORDS.reminder)
    expect((await chaseOf(inv.id)).map(c => c.id)).toEqual([reminder!.id])
    expect(await auditOf(reminder!.id)).toEqual([])
  })
})

describe('a broken promise', () => {
  it('comes back the day after its day (not on it), and leaves once the amount promised is paid', async () => {
    const inv = await issued('Saoirse Penhallow')
    const promise = await entry(office, inv.id, { kind: 'call', outcome: 'promised', note: 'Pays on payday', promisedPence: 150_00, promisedOn: today() })
    const key = `promise-broken:${promise.id}`
    // its own day: not broken yet
    expect((await broken()).map(a => a.key)).not.toContain(key)
    // the next day (its day moved back one, as time would)
    await db('update chase_notes set promised_on = $3 where firm_id = $1 and id = $2', [firmId, promise.id, addDays(today(), -1)])
    const listed = (await broken()).find(a => a.key === key)
    expect(listed, JSON.stringify(await broken())).toMatchObject({
      kind: 'promise-broken', href: `/invoices/${inv.id}`, actionLabel: 'Chase', since: today(), urgency: expect.any(Number),
      title: 'Chase Saoirse Penhallow: a promise to pay was not kept',
    })
    expect(listed!.detail).toContain(inv.reference)
    expect(listed!.detail).toContain('£150.00 promised by')
    // the office sees it too; another firm does not
    expect((await broken(office)).map(a => a.key)).toContain(key)
    expect((await broken(elsewhere)).map(a => a.key)).not.toContain(key)

    // part of it paid: still broken; the rest: kept
    const pay = (amountPence: number) => owner.post(`/api/invoices/${inv.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence, receivedOn: today() })
    expect((await pay(100_00)).status).toBe(201)
    expect((await broken()).map(a => a.key)).toContain(key)
    expect((await pay(50_00)).status).toBe(201)
    expect((await broken()).map(a => a.key)).not.toContain(key)
  })

  it('leaves once someone chases again after its day; a newer promise is the one that counts', async () => {
    const inv = await issued('Kitto Abernethy')
    const first = await entry(owner, inv.id, { kind: 'message', outcome: 'promised', promisedPence: 300_00, promisedOn: today() })
    await db('update chase_notes set promised_on = $3, at = at - interval \'3 days\' where firm_id = $1 and id = $2', [firmId, first.id, addDays(today(), -2)])
    expect((await broken()).map(a => a.key)).toContain(`promise-broken:${first.id}`)
    // a call today with no answer: chased again, off the list
    await entry(office, inv.id, { kind: 'call', outcome: 'no-reply' })
    expect((await broken()).map(a => a.key)).not.toContain(`promise-broken:${first.id}`)
    // a new promise for tomorrow: nothing to do until the day after it
    const second = await entry(office, inv.id, { kind: 'call', outcome: 'promised', promisedPence: 300_00, promisedOn: addDays(today(), 1) })
    expect((await broken()).filter(a => a.href === `/invoices/${inv.id}`)).toEqual([])
    await db('update chase_notes set promised_on = $3 where firm_id = $1 and id = $2', [firmId, second.id, addDays(today(), -1)])
    expect((await broken()).filter(a => a.href === `/invoices/${inv.id}`).map(a => a.key)).toEqual([`promise-broken:${second.id}`])
    // removing the promise takes it off the list
    expect((await removal(office, inv.id, second.id)).status).toBe(204)
    expect((await broken()).filter(a => a.href === `/invoices/${inv.id}`)).toEqual([])
  })
})

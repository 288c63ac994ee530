import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail, type ApiResponse } from '../support/client'
import { inviteAndJoin } from './support'

// Visits that can be finished, moved and cancelled (issue 15, part 3): the rules of
// POST /api/visits/:id/done, POST /api/visits/:id/cancel and PATCH /api/visits/:id (a move), who
// may do each, the audit log, the enquiry the visit came from, the lists and the calendar feed.

let app: TestApp
let owner: Client
let office: Client
let crew: Client
let crewId: string
let otherCrew: Client
let accountant: Client
let other: Client

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  owner = (await signUpFirm(app.url, 'Visit Rules Plastering')).client
  other = (await signUpFirm(app.url, 'Someone Else Plastering')).client
  office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office', 'Ona Office')).client
  crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew', 'Cass Crewe')).client
  otherCrew = (await inviteAndJoin(app, owner, uniqueEmail('crew2'), 'crew', 'Reg Notmine')).client
  accountant = (await inviteAndJoin(app, owner, uniqueEmail('acc'), 'accountant', 'Abi Ledger')).client
  crewId = (await crew.get('/api/me')).body.user.id
})
afterAll(async () => {
  await app?.stop()
})

const show = (r: ApiResponse) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 400)}`
const inDays = (n: number, hhmm = '09:00') => `${new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10)}T${hhmm}:00.000Z`
const minutesFromNow = (n: number) => new Date(Date.now() + n * 60_000).toISOString()

/** A customer with an enquiry and `n` visits booked for it (the crew member goes). */
async function booked(n = 1, startsAt = inDays(4)) {
  const c = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Hester Quoin', email: uniqueEmail('hester') }, site: { line1: '11 Pargeter Lane', town: 'Kettlebury', postcode: 'KB8 1PL' } })
  expect(c.status, show(c)).toBe(201)
  const e = await owner.post('/api/enquiries', { customerId: c.body.id, siteId: c.body.sites[0].id, source: 'phone', description: 'Reskim the hall after rewiring' })
  expect(e.status, show(e)).toBe(201)
  const ids: string[] = []
  for (let i = 0; i < n; i++) {
    const v = await owner.post('/api/visits', { customerId: c.body.id, siteId: c.body.sites[0].id, enquiryId: e.body.id, startsAt, visitorUserId: crewId })
    expect(v.status, show(v)).toBe(201)
    ids.push(v.body.id)
  }
  return { enquiryId: e.body.id as string, visitId: ids[0]!, visitIds: ids }
}

async function enquiryStatus(id: string) {
  return (await owner.get(`/api/enquiries/${id}`)).body.status as string
}

async function auditOf(visitId: string) {
  const res = await owner.get('/api/audit?limit=200')
  expect(res.status, show(res)).toBe(200)
  return (res.body as { action: string, entityId: string, detail: any }[]).filter(a => a.entityId === visitId)
}

describe('marking a visit done', () => {
  it('the visitor marks it done on the phone; a resend is a 200 that keeps the first time', async () => {
    const { visitId, enquiryId } = await booked()
    const at = minutesFromNow(-30)
    const first = await crew.post(`/api/visits/${visitId}/done`, { at, clientId: randomUUID() })
    expect(first.status, show(first)).toBe(200)
    expect(first.body.status).toBe('done')
    expect(new Date(first.body.doneAt).toISOString()).toBe(at)

    const again = await crew.post(`/api/visits/${visitId}/done`, { at: minutesFromNow(-1), clientId: randomUUID() })
    expect(again.status, show(again)).toBe(200)
    expect(new Date(again.body.doneAt).toISOString()).toBe(at)

    const got = (await owner.get(`/api/visits/${visitId}`)).body
    expect(got).toMatchObject({ status: 'done', cancelReason: '' })
    expect(new Date(got.doneAt).toISOString()).toBe(at)
    const audit = await auditOf(visitId)
    expect(audit.filter(a => a.action === 'visit.done')).toHaveLength(1)
    expect(audit.find(a => a.action === 'visit.done')!.detail.at).toBe(at)
    // no "visited" status exists: the enquiry stays at "visit booked" until a quote is sent
    expect(await enquiryStatus(enquiryId)).toBe('visit-booked')
  })

  it('takes now when no time is sent, and a phone clock a minute ahead', async () => {
    const { visitId } = await booked()
    const res = await owner.post(`/api/visits/${visitId}/done`, {})
    expect(res.status, show(res)).toBe(200)
    expect(Math.abs(new Date(res.body.doneAt).getTime() - Date.now())).toBeLessThan(10 * 60_000)
    const ahead = await booked()
    expect((await office.post(`/api/visits/${ahead.visitId}/done`, { at: minutesFromNow(1) })).status).toBe(200)
  })

  it('refuses a time in the future (400 on the field) and a cancelled visit (409)', async () => {
    const { visitId } = await booked()
    const future = await crew.post(`/api/visits/${visitId}/done`, { at: minutesFromNow(30) })
    expect(future.status, show(future)).toBe(400)
    expect(future.body.data.fields.at).toMatch(/future/)
    expect((await crew.post(`/api/visits/${visitId}/done`, { at: 'yesterday' })).body.data.fields.at).toBeTruthy()
    expect((await owner.get(`/api/visits/${visitId}`)).body.status).toBe('booked')

    expect((await office.post(`/api/visits/${visitId}/cancel`, { reason: 'Tenant moved out' })).status).toBe(200)
    const late = await crew.post(`/api/visits/${visitId}/done`, {})
    expect(late.status, show(late)).toBe(409)
    expect(late.body.data.message).toMatch(/cancelled/)
  })
})

describe('cancelling a visit', () => {
  it('needs a reason, keeps it, and puts the enquiry back to new', async () => {
    const { visitId, enquiryId } = await booked()
    expect(await enquiryStatus(enquiryId)).toBe('visit-booked')
    for (const body of [{}, { reason: '' }, { reason: '   ' }]) {
      const res = await office.post(`/api/visits/${visitId}/cancel`, body)
      expect(res.status, show(res)).toBe(400)
      expect(res.body.data.fields.reason).toMatch(/why/)
    }
    const res = await office.post(`/api/visits/${visitId}/cancel`, { reason: '  Customer is in hospital  ' })
    expect(res.status, show(res)).toBe(200)
    expect(res.body).toMatchObject({ status: 'cancelled', cancelReason: 'Customer is in hospital', doneAt: null })
    const again = await owner.post(`/api/visits/${visitId}/cancel`, { reason: 'Another reason' })
    expect(again.status).toBe(200)
    expect(again.body.cancelReason).toBe('Customer is in hospital')

    expect(await enquiryStatus(enquiryId)).toBe('new')
    const history = (await owner.get(`/api/enquiries/${enquiryId}`)).body.history as { from: string, to: string, reason: string }[]
    expect(history.at(-1)).toMatchObject({ from: 'visit-booked', to: 'new', reason: 'The visit was cancelled.' })
    const audit = await auditOf(visitId)
    expect(audit.filter(a => a.action === 'visit.cancelled').map(a => a.detail.reason)).toEqual(['Customer is in hospital'])
  })

  it('leaves the enquiry at "visit booked" while another visit for it is booked', async () => {
    const { visitIds, enquiryId } = await booked(2)
    expect((await owner.post(`/api/visits/${visitIds[0]}/cancel`, { reason: 'Booked twice by mistake' })).status).toBe(200)
    expect(await enquiryStatus(enquiryId)).toBe('visit-booked')
    expect((await owner.post(`/api/visits/${visitIds[1]}/cancel`, { reason: 'Customer went elsewhere' })).status).toBe(200)
    expect(await enquiryStatus(enquiryId)).toBe('new')
  })

  it('refuses a done visit (409)', async () => {
    const { visitId } = await booked()
    expect((await crew.post(`/api/visits/${visitId}/done`, {})).status).toBe(200)
    const res = await owner.post(`/api/visits/${visitId}/cancel`, { reason: 'Changed my mind' })
    expect(res.status, show(res)).toBe(409)
    expect(res.body.data.message).toMatch(/done/)
  })
})

describe('moving a visit', () => {
  it('moves a booked one, in the audit log, the enquiry staying "visit booked"', async () => {
    const { visitId, enquiryId } = await booked()
    const to = inDays(9, '13:30')
    const res = await office.patch(`/api/visits/${visitId}`, { startsAt: to })
    expect(res.status, show(res)).toBe(200)
    expect(new Date(res.body.startsAt).toISOString()).toBe(to)
    expect(await enquiryStatus(enquiryId)).toBe('visit-booked')
    const moved = (await auditOf(visitId)).filter(a => a.action === 'visit.moved')
    expect(moved).toHaveLength(1)
    expect(moved[0]!.detail).toMatchObject({ from: inDays(4), to })
    // notes alone are not a move
    expect((await office.patch(`/api/visits/${visitId}`, { notes: 'Park on the drive' })).status).toBe(200)
    expect((await auditOf(visitId)).filter(a => a.action === 'visit.moved')).toHaveLength(1)
  })

  it('needs a time from now on and within a year (400 on the field)', async () => {
    const { visitId } = await booked()
    for (const startsAt of [null, '', 'next Tuesday', minutesFromNow(-24 * 60), inDays(400)]) {
      const res = await owner.patch(`/api/visits/${visitId}`, { startsAt })
      expect(res.status, `${String(startsAt)}: ${show(res)}`).toBe(400)
      expect(res.body.data.fields.startsAt).toBeTruthy()
    }
    expect((await owner.patch(`/api/visits/${visitId}`, { startsAt: inDays(400) })).body.data.fields.startsAt).toMatch(/within a year/)
    expect((await owner.patch(`/api/visits/${visitId}`, { startsAt: minutesFromNow(-24 * 60) })).body.data.fields.startsAt).toMatch(/past/)
    // booking takes the same limit ahead
    const c = (await owner.get(`/api/visits/${visitId}`)).body
    const far = await owner.post('/api/visits', { customerId: c.customer.id, siteId: c.site.id, startsAt: inDays(400) })
    expect(far.status, show(far)).toBe(400)
    expect(far.body.data.fields.startsAt).toMatch(/within a year/)
  })

  it('refuses to move a cancelled or a done visit (409 with a clear message), but takes its notes', async () => {
    const a = await booked()
    expect((await owner.post(`/api/visits/${a.visitId}/cancel`, { reason: 'Weather' })).status).toBe(200)
    const res = await owner.patch(`/api/visits/${a.visitId}`, { startsAt: inDays(6) })
    expect(res.status, show(res)).toBe(409)
    expect(res.body.data.message).toMatch(/cancelled, so it cannot be moved/)
    expect((await owner.patch(`/api/visits/${a.visitId}`, { durationMinutes: 120 })).status).toBe(409)
    expect((await owner.patch(`/api/visits/${a.visitId}`, { notes: 'Rebook in spring' })).status).toBe(200)

    const b = await booked()
    expect((await crew.post(`/api/visits/${b.visitId}/done`, {})).status).toBe(200)
    const done = await owner.patch(`/api/visits/${b.visitId}`, { startsAt: inDays(6) })
    expect(done.status, show(done)).toBe(409)
    expect(done.body.data.message).toMatch(/done, so it cannot be moved/)
  })

  it('no longer takes a status (done and cancel have their own routes)', async () => {
    const { visitId } = await booked()
    await owner.patch(`/api/visits/${visitId}`, { status: 'done' })
    expect((await owner.get(`/api/visits/${visitId}`)).body.status).toBe('booked')
  })
})

describe('who may do what', () => {
  it('office and owner book, move and cancel; the visitor marks their own visit done; others are refused', async () => {
    const { visitId } = await booked()
    const anon = new Client(app.url)
    expect((await anon.post(`/api/visits/${visitId}/done`, {})).status).toBe(401)
    expect((await anon.post(`/api/visits/${visitId}/cancel`, { reason: 'x' })).status).toBe(401)
    expect((await anon.patch(`/api/visits/${visitId}`, { startsAt: inDays(5) })).status).toBe(401)

    expect((await accountant.post(`/api/visits/${visitId}/done`, {})).status).toBe(403)
    expect((await accountant.post(`/api/visits/${visitId}/cancel`, { reason: 'x' })).status).toBe(403)
    expect((await crew.post(`/api/visits/${visitId}/cancel`, { reason: 'Van broke down' })).status).toBe(403)
    expect((await crew.patch(`/api/visits/${visitId}`, { startsAt: inDays(5) })).status).toBe(403)
    // crew only see (and mark) the visits they are down to make
    expect((await otherCrew.post(`/api/visits/${visitId}/done`, {})).status).toBe(404)
    // another firm: the same 404 as a visit that does not exist
    expect((await other.post(`/api/visits/${visitId}/done`, {})).status).toBe(404)
    expect((await other.post(`/api/visits/${visitId}/cancel`, { reason: 'x' })).status).toBe(404)
    expect((await other.patch(`/api/visits/${visitId}`, { startsAt: inDays(5) })).status).toBe(404)
    expect((await owner.post(`/api/visits/${randomUUID()}/done`, {})).status).toBe(404)

    expect((await owner.get(`/api/visits/${visitId}`)).body.status).toBe('booked')
    expect((await crew.post(`/api/visits/${visitId}/done`, {})).status).toBe(200)
  })
})

describe('the lists', () => {
  it('show only what is still to do, and the done and cancelled ones on asking', async () => {
    const day = 30 + Math.floor(Math.random() * 200)
    const from = `${inDays(day).slice(0, 10)}T00:00:00.000Z`
    const to = `${inDays(day + 1).slice(0, 10)}T00:00:00.000Z`
    const a = await booked(1, inDays(day, '08:00'))
    const b = await booked(1, inDays(day, '10:00'))
    const c = await booked(1, inDays(day, '12:00'))
    // done ahead of time is odd, but allowed: the visit may have been brought forward by phone
    expect((await crew.post(`/api/visits/${a.visitId}/done`, {})).status).toBe(200)
    expect((await owner.post(`/api/visits/${b.visitId}/cancel`, { reason: 'Duplicate' })).status).toBe(200)
    const ids = async (client: Client, show = '') => ((await client.get(`/api/visits?from=${from}&to=${to}${show}`)).body as { id: string }[]).map(v => v.id)
    expect(await ids(owner)).toEqual([c.visitId])
    expect(await ids(crew)).toEqual([c.visitId])
    expect(await ids(owner, '&show=finished')).toEqual([b.visitId, a.visitId])
    expect(await ids(crew, '&show=finished')).toEqual([b.visitId, a.visitId])
    expect((await owner.get('/api/visits?show=everything')).status).toBe(400)
  })
})

describe('the calendar feed', () => {
  async function feedOf(client: Client) {
    const url = (await client.post('/api/me/calendar')).body.url as string
    const res = await fetch(app.url + new URL(url).pathname)
    expect(res.status).toBe(200)
    const text = (await res.text()).replace(/\r\n[ \t]/g, '')
    return text.split('BEGIN:VEVENT').slice(1).map(e => e.split('END:VEVENT')[0]!.split('\r\n').filter(Boolean))
  }
  const field = (lines: string[], name: string) => lines.find(l => l.startsWith(`${name}:`) || l.startsWith(`${name};`))?.replace(/^[^:]+:/, '')
  const ics = (iso: string) => iso.replace(/[-:]/g, '').replace(/\.\d{3}/, '')

  it('keeps a moved visit\'s UID with a higher SEQUENCE, leaves a cancelled one out and a done one as it was', async () => {
    const moved = await booked(1, inDays(5, '09:00'))
    const cancelled = await booked(1, inDays(5, '11:00'))
    const done = await booked(1, minutesFromNow(-120).replace(/\d\d\.\d{3}Z$/, '00.000Z'))
    const before = await feedOf(crew)
    const uidOf = (id: string) => `visit-${id}@setwell`
    const event = (events: string[][], id: string) => events.find(e => field(e, 'UID') === uidOf(id))
    expect(field(event(before, moved.visitId)!, 'SEQUENCE')).toBe('0')
    expect(field(event(before, moved.visitId)!, 'DTSTART')).toBe(ics(inDays(5, '09:00')))
    expect(field(event(before, moved.visitId)!, 'SUMMARY')).toBe('Site visit: Hester Quoin')
    const doneBefore = event(before, done.visitId)!

    expect((await owner.patch(`/api/visits/${moved.visitId}`, { startsAt: inDays(7, '14:00') })).status).toBe(200)
    expect((await owner.post(`/api/visits/${cancelled.visitId}/cancel`, { reason: 'Customer away' })).status).toBe(200)
    expect((await crew.post(`/api/visits/${done.visitId}/done`, {})).status).toBe(200)

    const after = await feedOf(crew)
    const m = event(after, moved.visitId)!
    expect(field(m, 'SEQUENCE')).toBe('1')
    expect(field(m, 'DTSTART')).toBe(ics(inDays(7, '14:00')))
    expect(field(m, 'DTEND')).toBe(ics(new Date(Date.parse(inDays(7, '14:00')) + 60 * 60_000).toISOString()))
    expect(event(after, cancelled.visitId)).toBeUndefined()
    const d = event(after, done.visitId)!
    for (const name of ['DTSTART', 'DTEND', 'SEQUENCE', 'STATUS', 'SUMMARY']) expect(field(d, name), name).toBe(field(doneBefore, name))
    // a second move: one more
    expect((await owner.patch(`/api/visits/${moved.visitId}`, { startsAt: inDays(8, '14:00') })).status).toBe(200)
    expect(field(event(await feedOf(crew), moved.visitId)!, 'SEQUENCE')).toBe('2')
    // someone else's feed does not carry the crew member's visits
    expect(event(await feedOf(owner), moved.visitId)).toBeUndefined()
  })
})

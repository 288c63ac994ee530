import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, londonToday } from '../../shared/utils/dates'
import { vatQuarter } from '../../shared/utils/periods'
import { KIND_URGENCY, sortActions, urgencyOf, vatReturnAction, type NextAction, type NextActionKind, type TodayView } from '../../shared/utils/next-actions'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { inviteAndJoin } from './support'

// Today as next actions (issue 18, part 1), against a firm this test builds itself: each list
// holds exactly what the test works out it should, and not what it must not (a visit already
// done, a visit still to come, a quote answered, a job on two people's days counted twice, a
// receipt kept, an invoice paid, a VAT date for a firm not registered for VAT); a thing done
// drops off at once; each role gets its own lists, and another firm sees none of it.

let app: TestApp
let owner: Client
let firmId: string
let office: Client
let crewA: Client
let crewB: Client
let accountant: Client
let crewAId: string
const today = londonToday()

const sql = <T = any>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
const one = async <T = any>(text: string, values: unknown[] = []) => (await sql<T>(text, values))[0]!
const iso = (d: Date | string) => (d instanceof Date ? d.toISOString() : d)

/** What the test expects in a list: kind, key, since; sorted the way the server must sort it. */
interface Want { kind: NextActionKind, key: string, since: string }
const inOrder = (wants: Want[]) => sortActions(wants.map(w => ({ ...w, title: '', detail: '', href: '', actionLabel: '', urgency: urgencyOf(w.kind, w.since, today) })))
  .map(a => a.key)

async function todayOf(c: Client): Promise<TodayView> {
  const res = await c.get('/api/today')
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body
}
const keysOf = (t: TodayView) => t.actions.map(a => a.key)
const action = (t: TodayView, key: string) => t.actions.find(a => a.key === key)

// the firm's rows, made straight in the database as the firm (row-level security on), dated in the past as time would
let customerId: string
let siteId: string
const wants: Want[] = []
const ids: Record<string, string> = {}

async function customer(name: string, phone = '') {
  const c = await one<{ id: string }>('insert into customers (firm_id, kind, name, phone, email, billing_line1, billing_postcode) values ($1, \'homeowner\', $2, $3, $4, \'4 Pellow Row\', \'KB4 6RS\') returning id', [firmId, name, phone, uniqueEmail('customer')])
  const s = await one<{ id: string }>('insert into sites (firm_id, customer_id, line1, postcode) values ($1, $2, \'4 Pellow Row\', \'KB4 6RS\') returning id', [firmId, c.id])
  return { customerId: c.id, siteId: s.id }
}

async function issuedInvoice(amountPence: number) {
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId })).body
  await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the landing', quantityX1000: 1000, unitPence: amountPence }] })
  const inv = await owner.post(`/api/invoices/${d.id}/issue`)
  expect(inv.status, JSON.stringify(inv.body)).toBe(200)
  return inv.body
}

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Pellow Row Plastering'))
  // the firm's details filled in, so the only set-up prompts are about the team
  const firm = (await owner.get('/api/firm')).body
  const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, referenceLetters: _l, ...settings } = firm
  const patched = await owner.patch('/api/firm', { ...settings, addressLine1: '1 Quarry Lane', postcode: 'KB1 2AA', phone: '01632 960000', dayRatePence: 220_00 })
  expect(patched.status, JSON.stringify(patched.body)).toBe(200)
})
afterAll(async () => {
  await app?.stop()
})

describe('the owner\'s set-up prompts show only what is really missing', () => {
  it('asks for the whole team at first, then only for who is not in; nothing once all three are in or invited', async () => {
    const first = await todayOf(owner)
    expect(first.actions.filter(a => a.kind === 'setup-missing').map(a => a.title)).toEqual(['Invite your office partner, your crew and your accountant'])

    ;({ client: office } = await inviteAndJoin(app, owner, uniqueEmail('office'), 'office', 'Orla Penhallow'))
    ;({ client: crewA } = await inviteAndJoin(app, owner, uniqueEmail('crew-a'), 'crew', 'Kit Trevaskis'))
    ;({ client: crewB } = await inviteAndJoin(app, owner, uniqueEmail('crew-b'), 'crew', 'Lowen Bray'))
    crewAId = (await crewA.get('/api/me')).body.user.id
    expect((await todayOf(owner)).actions.filter(a => a.kind === 'setup-missing').map(a => a.title)).toEqual(['Invite your accountant'])

    // an invitation still open counts: the prompt goes as soon as it is sent
    const email = uniqueEmail('acct')
    expect((await owner.post('/api/team/invitations', { email, role: 'accountant' })).status).toBe(201)
    expect((await todayOf(owner)).actions.filter(a => a.kind === 'setup-missing')).toEqual([])
    const { invitationToken } = await import('./support')
    const token = await invitationToken(app, email)
    accountant = new Client(app.url)
    expect((await accountant.post(`/api/invitations/${token}/accept`, { name: 'Petroc Maddern', password: 'wet-edge-trowel-42' })).status).toBe(200)
    expect((await todayOf(owner)).actions.filter(a => a.kind === 'setup-missing')).toEqual([])
  })
})

describe('each next-action list, worked out by the test', () => {
  beforeAll(async () => {
    ;({ customerId, siteId } = await customer('Tamsin Quillane', '01632 960123'))

    // enquiries: one new (shown), one with a visit booked and one lost (not)
    const e1 = await one('insert into enquiries (firm_id, customer_id, source, description, status, created_at) values ($1, $2, \'phone\', \'Skim the back bedroom\', \'new\', now() - interval \'5 days\') returning id, created_at', [firmId, customerId])
    ids.enquiry = e1.id
    wants.push({ kind: 'enquiry-new', key: `enquiry-new:${e1.id}`, since: iso(e1.created_at) })
    await sql('insert into enquiries (firm_id, customer_id, source, description, status) values ($1, $2, \'phone\', \'Booked already\', \'visit-booked\'), ($1, $2, \'phone\', \'Went elsewhere\', \'lost\')', [firmId, customerId])

    // visits: gone by and still booked (shown); done with no quote (shown); done with a quote, to come, cancelled (not)
    const v1 = await one('insert into visits (firm_id, customer_id, site_id, starts_at, visitor_user_id) values ($1, $2, $3, now() - interval \'3 days\', $4) returning id, starts_at', [firmId, customerId, siteId, crewAId])
    ids.visitGoneBy = v1.id
    wants.push({ kind: 'visit-not-marked', key: `visit-not-marked:${v1.id}`, since: iso(v1.starts_at) })
    const v2 = await one('insert into visits (firm_id, customer_id, site_id, starts_at, status, done_at) values ($1, $2, $3, now() - interval \'2 days 2 hours\', \'done\', now() - interval \'2 days\') returning id, done_at', [firmId, customerId, siteId])
    wants.push({ kind: 'visit-not-written-up', key: `visit-not-written-up:${v2.id}`, since: iso(v2.done_at) })
    const v3 = await one('insert into visits (firm_id, customer_id, site_id, starts_at, status, done_at) values ($1, $2, $3, now() - interval \'8 days\', \'done\', now() - interval \'8 days\') returning id', [firmId, customerId, siteId])
    ids.visitQuoted = v3.id
    const v4 = await one('insert into visits (firm_id, customer_id, site_id, starts_at) values ($1, $2, $3, now() + interval \'1 day\') returning id', [firmId, customerId, siteId])
    ids.visitToCome = v4.id
    await sql('insert into visits (firm_id, customer_id, site_id, starts_at, status, cancel_reason) values ($1, $2, $3, now() - interval \'4 days\', \'cancelled\', \'Rained off\')', [firmId, customerId, siteId])

    // quotes: sent 10 days ago (past the firm's 7 days: shown); sent 2 days ago (not); accepted with no job (shown);
    // accepted with a job and its days (not); accepted with a job and no days (shown)
    const quote = async (n: number, status: string, sentAgo: string, visitId: string | null = null) => {
      const q = await one('insert into quotes (firm_id, number, customer_id, site_id, visit_id) values ($1, $2, $3, $4, $5) returning id', [firmId, n, customerId, siteId, visitId])
      const v = await one(`insert into quote_versions (firm_id, quote_id, version, status, vat, valid_until, sent_at, responded_at, totals)
        values ($1, $2, 1, $3, 'not-registered', '2027-01-31', now() - $4::interval, case when $5 then now() - $4::interval + interval '1 day' end, '{"grossPence": 120000}') returning sent_at, responded_at`, [firmId, q.id, status, sentAgo, status === 'accepted'])
      return { id: q.id as string, sentAt: iso(v.sent_at), respondedAt: v.responded_at ? iso(v.responded_at) : null }
    }
    const q1 = await quote(901, 'sent', '10 days', v3.id)
    wants.push({ kind: 'quote-unanswered', key: `quote-unanswered:${q1.id}`, since: q1.sentAt })
    await quote(902, 'sent', '2 days')
    const q3 = await quote(903, 'accepted', '5 days')
    wants.push({ kind: 'quote-not-booked', key: `quote-not-booked:${q3.id}`, since: q3.respondedAt! })
    const q4 = await quote(904, 'accepted', '6 days')
    const q5 = await quote(905, 'accepted', '7 days')
    wants.push({ kind: 'quote-not-booked', key: `quote-not-booked:${q5.id}`, since: q5.respondedAt! })

    // jobs: J1 worked yesterday by two people with no set logged (one action, both people), and the day
    // before with a set logged (not); J2 on today by both (on site once, with both); J4 from quote 904 with days;
    // J5 from quote 905, no days; J3 finished six days ago (shown); J6 invoiced (not)
    const crewBId = (await crewB.get('/api/me')).body.user.id
    const job = async (n: number, status: string, quoteId: string | null = null) =>
      (await one('insert into jobs (firm_id, number, title, customer_id, site_id, quote_id, status, gross_pence) values ($1, $2, \'Skim\', $3, $4, $5, $6, 150000) returning id', [firmId, n, customerId, siteId, quoteId, status])).id as string
    const j1 = await job(1, 'in-progress')
    const j2 = await job(2, 'in-progress')
    const j4 = await job(4, 'booked', q4.id)
    await job(5, 'booked', q5.id)
    const j3 = await job(3, 'finished')
    await job(6, 'invoiced')
    ids.j1 = j1
    ids.j2 = j2
    const finished = await one('insert into job_status_changes (firm_id, job_id, from_status, to_status, changed_at) values ($1, $2, \'in-progress\', \'finished\', now() - interval \'6 days\') returning changed_at', [firmId, j3])
    wants.push({ kind: 'job-not-invoiced', key: `job-not-invoiced:${j3}`, since: iso(finished.changed_at) })
    const day = async (jobId: string, d: string, userId: string) => sql('insert into job_days (firm_id, job_id, day, user_id) values ($1, $2, $3, $4)', [firmId, jobId, d, userId])
    for (const u of [crewAId, crewBId]) {
      await day(j1, addDays(today, -1), u)
      await day(j1, addDays(today, -2), u)
      await day(j2, today, u)
    }
    await day(j4, addDays(today, 3), crewBId)
    await sql('insert into set_logs (firm_id, job_id, kind, started_at) values ($1, $2, \'set\', ($3::date + time \'10:00\') at time zone \'Europe/London\')', [firmId, j1, addDays(today, -2)])
    wants.push({ kind: 'day-no-set-logged', key: `day-no-set-logged:${j1}:${addDays(today, -1)}`, since: addDays(today, -1) })

    // invoices: one overdue (shown), one not yet due (not)
    const overdue = await issuedInvoice(740_90)
    ids.overdueInvoice = overdue.id
    ids.overdueAmount = String(overdue.amountDuePence)
    await sql('update invoices set due_on = $1 where id = $2', [addDays(today, -9), overdue.id])
    wants.push({ kind: 'invoice-overdue', key: `invoice-overdue:${overdue.id}`, since: addDays(today, -9) })
    await issuedInvoice(100_00)

    // purchases: no receipt ten days ago (shown); with its receipt (not); no receipt 200 days ago (not: history)
    const p1 = await one('insert into purchases (firm_id, supplier, bought_on, category, net_pence, vat_pence) values ($1, \'Hobblecote Fuel Stop\', $2, \'fuel\', 5000, 1000) returning id', [firmId, addDays(today, -10)])
    wants.push({ kind: 'purchase-no-receipt', key: `purchase-no-receipt:${p1.id}`, since: addDays(today, -10) })
    const p2 = await one('insert into purchases (firm_id, supplier, bought_on, category, net_pence) values ($1, \'Trowel Yard\', $2, \'materials\', 9000) returning id', [firmId, addDays(today, -4)])
    await sql('insert into documents (firm_id, purchase_id, storage_key, content_type, bytes) values ($1, $2, \'receipts/x.pdf\', \'application/pdf\', 100)', [firmId, p2.id])
    await sql('insert into purchases (firm_id, supplier, bought_on, category, net_pence) values ($1, \'Old Yard\', $2, \'materials\', 9000)', [firmId, addDays(today, -200)])
  })

  it('gives the owner exactly these actions, most urgent first, and nothing else', async () => {
    const t = await todayOf(owner)
    expect(t.today).toBe(today)
    expect(keysOf(t)).toEqual(inOrder(wants))
    // kinds in the order of their urgency (an overdue invoice first, the receipt last)
    const kinds = t.actions.map(a => KIND_URGENCY[a.kind])
    expect(kinds).toEqual([...kinds].sort((a, b) => b - a))
    // must not appear: the done-and-quoted visit, the visit to come, a quote sent two days ago, answered enquiries
    const all = JSON.stringify(t.actions)
    expect(all).not.toContain(ids.visitQuoted)
    expect(all).not.toContain(ids.visitToCome)
    expect(t.actions.filter(a => a.kind === 'enquiry-new')).toHaveLength(1)
    expect(t.actions.filter(a => a.kind === 'vat-return-due' || a.kind === 'cis-return-due')).toEqual([])
  })

  it('words each action with its one tap and how long it waited', async () => {
    const t = await todayOf(owner)
    expect(action(t, `enquiry-new:${ids.enquiry}`)).toMatchObject({ title: 'Answer Tamsin Quillane\'s enquiry', href: `/enquiries/${ids.enquiry}`, actionLabel: 'Answer', detail: 'Skim the back bedroom · 01632 960123' })
    expect(action(t, `invoice-overdue:${ids.overdueInvoice}`)).toMatchObject({ actionLabel: 'Chase', href: `/invoices/${ids.overdueInvoice}` })
    expect(action(t, `invoice-overdue:${ids.overdueInvoice}`)!.detail).toMatch(/· £740\.90 · 9 days overdue$/)
    const day = action(t, `day-no-set-logged:${ids.j1}:${addDays(today, -1)}`)!
    expect(day.detail).toBe('Tamsin Quillane · Kit Trevaskis, Lowen Bray')
  })

  it('lists a job on two people\'s days once: the day with no set, and on site today with both people', async () => {
    const t = await todayOf(owner)
    expect(t.actions.filter(a => a.kind === 'day-no-set-logged')).toHaveLength(1)
    expect(t.onSite.map(j => j.jobId)).toEqual([ids.j2])
    expect(t.onSite[0]!.people.map(p => p.name)).toEqual(['Kit Trevaskis', 'Lowen Bray'])
    // the visit to come is in the visits; the one gone by is not (it is an action)
    expect(t.visits.map(v => v.id)).toEqual([ids.visitToCome])
  })

  it('gives the office the same lists without the owner\'s set-up prompts, and a money summary', async () => {
    const t = await todayOf(office)
    expect(keysOf(t)).toEqual(inOrder(wants))
    expect(t.money).toMatchObject({ quotesWaiting: 2 })
    expect(t.money!.overduePence).toBe(Number(ids.overdueAmount))
  })

  it('gives crew only their own: the visit they were down for, the day they worked, their jobs today; no money', async () => {
    const a = await todayOf(crewA)
    expect(keysOf(a).sort()).toEqual([`day-no-set-logged:${ids.j1}:${addDays(today, -1)}`, `visit-not-marked:${ids.visitGoneBy}`].sort())
    expect(a.money).toBeNull()
    expect(a.onSite.map(j => j.jobId)).toEqual([ids.j2])
    const b = await todayOf(crewB)
    expect(keysOf(b)).toEqual([`day-no-set-logged:${ids.j1}:${addDays(today, -1)}`])
    expect(b.visits).toEqual([])
  })

  it('gives the accountant the firm\'s quarters and no VAT dates for a firm not registered; no actions', async () => {
    const t = await todayOf(accountant)
    expect(t.actions).toEqual([])
    expect(t.onSite).toEqual([])
    expect(t.firms).toHaveLength(1)
    expect(t.firms[0]).toMatchObject({ firmId, current: true, vatRegistered: false, lastQuarter: { returnDue: null, vat: null }, thisQuarter: { returnDue: null, vat: null } })
  })

  it('shows another firm none of it', async () => {
    const { client: other } = await signUpFirm(app.url, 'Elsewhere Plastering')
    const t = await todayOf(other)
    const seen = JSON.stringify(t)
    for (const w of wants) expect(seen).not.toContain(w.key.split(':')[1])
    expect(t.onSite).toEqual([])
  })

  it('is refused without a session', async () => {
    expect((await new Client(app.url).get('/api/today')).status).toBe(401)
  })
})

describe('a thing done drops off at once', () => {
  it('an invoice paid, an enquiry answered, a visit marked done (which then waits to be written up)', async () => {
    const pay = await owner.post(`/api/invoices/${ids.overdueInvoice}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: Number(ids.overdueAmount), receivedOn: today })
    expect(pay.status, JSON.stringify(pay.body)).toBe(201)
    expect((await owner.post(`/api/enquiries/${ids.enquiry}/status`, { to: 'visit-booked' })).status).toBe(200)
    expect((await crewA.post(`/api/visits/${ids.visitGoneBy}/done`, {})).status).toBe(200)
    const t = await todayOf(owner)
    expect(keysOf(t)).not.toContain(`invoice-overdue:${ids.overdueInvoice}`)
    expect(keysOf(t)).not.toContain(`enquiry-new:${ids.enquiry}`)
    expect(keysOf(t)).not.toContain(`visit-not-marked:${ids.visitGoneBy}`)
    expect(keysOf(t)).toContain(`visit-not-written-up:${ids.visitGoneBy}`)
    expect(t.money!.overduePence).toBe(0)
  })

  it('a day\'s set logged takes the day off the list', async () => {
    await sql('insert into set_logs (firm_id, job_id, kind, started_at) values ($1, $2, \'set\', ($3::date + time \'11:00\') at time zone \'Europe/London\')', [firmId, ids.j1, addDays(today, -1)])
    expect((await todayOf(owner)).actions.filter(a => a.kind === 'day-no-set-logged')).toEqual([])
  })
})

describe('the VAT return only for a VAT-registered firm', () => {
  it('none while not registered; once registered, last quarter\'s return while it is due', async () => {
    expect((await todayOf(owner)).actions.filter(a => a.kind === 'vat-return-due')).toEqual([])
    // the stagger whose quarter ended last month: its return is due within the next weeks, whatever today is
    const stagger = ([1, 2, 3] as const).find(s => vatReturnAction(vatQuarter(addDays(vatQuarter(today, s).start, -1), s), today))!
    const last = vatQuarter(addDays(vatQuarter(today, stagger).start, -1), stagger)
    await sql('update firms set vat_registered = true, vat_number = \'GB999999973\', vat_stagger = $2 where id = $1', [firmId, stagger])
    const t = await todayOf(owner)
    const vat = t.actions.filter((a: NextAction) => a.kind === 'vat-return-due')
    expect(vat.map(a => a.key)).toEqual([`vat-return-due:${last.start}`])
    expect(vat[0]!.detail).toContain('HMRC')
    const acct = await todayOf(accountant)
    expect(acct.firms[0]!.lastQuarter.returnDue).toBe(last.returnDue)
    expect(acct.firms[0]!.lastQuarter.vat).not.toBeNull()
  })
})

describe('the firm\'s own interval for following up a quote', () => {
  it('a quote sent ten days ago waits to be followed up after 7 days, not after 12; 0 days is refused on its field', async () => {
    const unanswered = wants.find(w => w.kind === 'quote-unanswered')!.key
    expect(keysOf(await todayOf(owner))).toContain(unanswered)
    const firm = (await owner.get('/api/firm')).body
    const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, referenceLetters: _l, ...settings } = firm
    expect(settings.quoteChaseDays).toBe(7)
    const bad = await owner.patch('/api/firm', { ...settings, quoteChaseDays: 0 })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.quoteChaseDays).toBeTruthy()
    expect((await owner.patch('/api/firm', { ...settings, quoteChaseDays: 12 })).status).toBe(200)
    expect(keysOf(await todayOf(owner))).not.toContain(unanswered)
  })
})

describe('an invoice chased once, and not before the day its customer promised', () => {
  it('a promise for later keeps the invoice off Today; a broken one lists it once, as the broken promise', async () => {
    const waiting = await issuedInvoice(310_00)
    const late = await issuedInvoice(420_00)
    await sql('update invoices set due_on = $1 where id = any($2)', [addDays(today, -12), [waiting.id, late.id]])
    const before = keysOf(await todayOf(owner))
    expect(before).toContain(`invoice-overdue:${waiting.id}`)
    expect(before).toContain(`invoice-overdue:${late.id}`)

    // the customer promised on the phone to pay in three days: left until that day has passed
    const promise = await office.post(`/api/invoices/${waiting.id}/chase-notes`, { kind: 'call', outcome: 'promised', promisedPence: 310_00, promisedOn: addDays(today, 3) })
    expect(promise.status, JSON.stringify(promise.body)).toBe(201)
    // a promise made a week ago for four days ago, not kept
    const broken = await one('insert into chase_notes (firm_id, invoice_id, kind, outcome, promised_on, at) values ($1, $2, \'call\', \'promised\', $3, now() - interval \'7 days\') returning id', [firmId, late.id, addDays(today, -4)])

    for (const who of [owner, office]) {
      const t = await todayOf(who)
      expect(keysOf(t)).not.toContain(`invoice-overdue:${waiting.id}`)
      expect(t.actions.filter(a => a.href === `/invoices/${late.id}`).map(a => a.key)).toEqual([`promise-broken:${broken.id}`])
      // above every invoice merely overdue
      expect(action(t, `promise-broken:${broken.id}`)!.urgency).toBeGreaterThan(KIND_URGENCY['invoice-overdue'] + 90)
    }
  })
})

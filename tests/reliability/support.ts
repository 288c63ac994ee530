// Shared by the reliability tests: every route file under server/api and server/routes turned
// into METHOD + path pattern, a firm with one row of each kind made through the API (the ids its
// routes need), known-good request bodies for the routes that read one, and row counts of a
// firm's tables read as the database owner.
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { join, relative, sep } from 'node:path'
import pg from 'pg'
import sharp from 'sharp'
import { expect } from 'vitest'
import { requiredEnv, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail, type ApiResponse } from '../support/client'
import { invitationToken, inviteAndJoin } from '../api/support'

// ---------------------------------------------------------------------------------------------
// Routes

export const METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const
export interface Route {
  /** `GET /api/customers/:id`: how the tables in the tests name a route. */
  key: string
  method: string
  pattern: string
  /** The route file, relative to the repository. */
  file: string
  params: string[]
}

function walk(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(e => e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)])
}

/** Every route file, as Nitro reads its name: `[id]` is a parameter, `index` is the folder, `.get` the method. */
export function listRoutes(root = process.cwd()): Route[] {
  const out: Route[] = []
  for (const [dir, prefix] of [['server/api', '/api'], ['server/routes', '']] as const) {
    for (const abs of walk(join(root, dir))) {
      if (!/\.[cm]?[jt]s$/.test(abs)) continue
      const rel = relative(join(root, dir), abs).split(sep).join('/').replace(/\.[cm]?[jt]s$/, '')
      const m = /^(.*?)(?:\.(get|post|put|patch|delete|head|options))?$/.exec(rel)!
      const method = (m[2] ?? 'any').toUpperCase()
      const segments = m[1]!.split('/')
      if (segments.at(-1) === 'index') segments.pop()
      const params: string[] = []
      const path = segments.map(s => s.replace(/\[(\.\.\.)?(\w+)\]/g, (_all, _rest, name: string) => {
        params.push(name)
        return `:${name}`
      })).join('/')
      const pattern = `${prefix}/${path}`.replace(/\/$/, '') || '/'
      out.push({ key: `${method} ${pattern}`, method, pattern, file: `${dir}/${relative(join(root, dir), abs).split(sep).join('/')}`, params })
    }
  }
  return out.sort((a, b) => a.key.localeCompare(b.key))
}

export function routeSource(route: Route, root = process.cwd()) {
  return readFileSync(join(root, route.file), 'utf8')
}

// ---------------------------------------------------------------------------------------------
// Row counts, as the database owner (row-level security is forced, so the firm is set first)

let firmTables: Promise<string[]> | undefined

export async function ownerDb<T>(fn: (db: pg.Client) => Promise<T>): Promise<T> {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    return await fn(db)
  }
  finally {
    await db.end()
  }
}

/** The tables with a firm_id column, read from the schema (so a new table is counted without a change here). */
export function listFirmTables(): Promise<string[]> {
  firmTables ??= ownerDb(async db => (await db.query(
    `select distinct table_name from information_schema.columns
      where table_schema = 'public' and column_name = 'firm_id' order by table_name`,
  )).rows.map(r => r.table_name as string))
  return firmTables
}

/** Rows of every firm table for this firm, plus the firm row itself. */
export async function firmRowCounts(firmId: string): Promise<Record<string, number>> {
  const tables = await listFirmTables()
  return ownerDb(async (db) => {
    await db.query('begin')
    try {
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      const select = [...tables.map(t => `(select count(*)::int from "${t}" where firm_id = $1) as "${t}"`), `(select count(*)::int from firms where id = $1) as "firms"`]
      const { rows } = await db.query(`select ${select.join(', ')}`, [firmId])
      return rows[0] as Record<string, number>
    }
    finally {
      await db.query('rollback')
    }
  })
}

/** Rows of the tables that belong to no firm (people and firms as a whole). */
export async function globalRowCounts(): Promise<Record<string, number>> {
  return ownerDb(async (db) => {
    const { rows } = await db.query(`select (select count(*)::int from users) as users`)
    return rows[0] as Record<string, number>
  })
}

/** Counts of several firms and the global tables, keyed `firm:table`, to compare before and after. */
export async function snapshot(firmIds: string[]) {
  const out: Record<string, number> = {}
  for (const [i, id] of firmIds.entries()) {
    for (const [t, n] of Object.entries(await firmRowCounts(id))) out[`firm${i}:${t}`] = n
  }
  for (const [t, n] of Object.entries(await globalRowCounts())) out[`global:${t}`] = n
  return out
}

/** The counts that differ, as `name: before -> after`, for a readable failure. */
export function changedCounts(before: Record<string, number>, after: Record<string, number>) {
  return Object.keys({ ...before, ...after }).filter(k => before[k] !== after[k]).map(k => `${k}: ${before[k]} -> ${after[k]}`)
}

// ---------------------------------------------------------------------------------------------
// Uploads (multipart), which the JSON client does not send

export async function jpeg(width = 32, height = 24) {
  return sharp({ create: { width, height, channels: 3, background: { r: 180, g: 170, b: 160 } } }).jpeg().toBuffer()
}

export const TINY_PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n', 'latin1')

export interface FilePart { data: Buffer, name: string, type: string }

export async function sendMultipart(base: string, who: Client | null, path: string, fields: Record<string, string>, file?: FilePart): Promise<ApiResponse> {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  if (file) form.append('file', new Blob([new Uint8Array(file.data)], { type: file.type }), file.name)
  const headers: Record<string, string> = who ? { cookie: who.cookieHeader() } : {}
  const res = await fetch(base + path, { method: 'POST', body: form, headers, redirect: 'manual' })
  const text = await res.text()
  let body: any = text
  try {
    body = text ? JSON.parse(text) : null
  }
  catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers }
}

// ---------------------------------------------------------------------------------------------
// A firm with a row of every kind

export interface Member { client: Client, email: string, userId: string, membershipId: string }

export interface Firm {
  name: string
  firmId: string
  owner: Member
  office?: Member
  crew?: Member
  accountant?: Member
  /** Named ids of the firm's rows (also the user and membership ids of its people). */
  ids: Record<string, string>
  tokens: { invitation: string, quote: string, invoice: string, calendar: string, formKey: string }
  /** VAT treatments the firm's drafts were given (the draft bodies must repeat them). */
  vat: { invoice: string, quote: string }
  /** A further row of a kind, for a call that deletes one. */
  fresh: {
    cisStatement(): Promise<string>
    purchase(): Promise<string>
    photo(): Promise<string>
    setLog(): Promise<string>
    chaseNote(): Promise<string>
    document(): Promise<string>
    invitation(): Promise<string>
    room(): Promise<string>
  }
}

export const TODAY = new Date().toISOString().slice(0, 10)
export const YESTERDAY = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10)
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10)
export const VISIT_AT = `${inDays(18)}T09:00:00.000Z`
export const JOB_DAY = inDays(19)

function ok(res: ApiResponse, what: string, status = [200, 201, 204]) {
  expect(status, `${what}: ${res.status} ${JSON.stringify(res.body)?.slice(0, 500)}`).toContain(res.status)
  return res.body
}

async function member(app: TestApp, owner: Client, role: string, name: string): Promise<Omit<Member, 'membershipId'>> {
  const email = uniqueEmail(role)
  const { client } = await inviteAndJoin(app, owner, email, role, name)
  const me = ok(await client.get('/api/me'), `${role} /api/me`)
  return { client, email, userId: me.user.id }
}

let cisMonths = 0

/** Sign up a firm and make, through the API as its owner, one row of each kind its routes take an id of. */
export async function makeFirm(app: TestApp, name: string, opts: { team?: boolean } = {}): Promise<Firm> {
  const signUp = await signUpFirm(app.url, name)
  const o = signUp.client
  const me = ok(await o.get('/api/me'), 'owner /api/me')
  const people: Partial<Record<'office' | 'crew' | 'accountant', Omit<Member, 'membershipId'>>> = {}
  if (opts.team) {
    people.office = await member(app, o, 'office', 'Orla Office')
    people.crew = await member(app, o, 'crew', 'Cal Crewe')
    people.accountant = await member(app, o, 'accountant', 'Ada Counts')
  }
  const team = ok(await o.get('/api/team'), 'team').people as { id: string, userId: string }[]
  const membershipOf = (userId: string) => team.find(p => p.userId === userId)!.id
  const withMembership = (m: Omit<Member, 'membershipId'>): Member => ({ ...m, membershipId: membershipOf(m.userId) })
  const owner = withMembership({ client: o, email: signUp.email, userId: me.user.id })
  const visitor = people.crew?.userId ?? owner.userId

  const customer = ok(await o.post('/api/customers', {
    customer: { kind: 'homeowner', name: 'Wren Ashdown', email: uniqueEmail('wren'), phone: '07700 900123', billingLine1: '4 Lime Kiln Row', billingTown: 'Kettlebury', billingPostcode: 'KB2 5RT' },
    site: { line1: '4 Lime Kiln Row', town: 'Kettlebury', postcode: 'KB2 5RT' },
  }), 'customer')
  const contractor = ok(await o.post('/api/customers', {
    customer: { kind: 'builder', name: 'Harrow Build Ltd', email: uniqueEmail('harrow'), paysUnderCis: true, cisRatePercent: 20 },
  }), 'contractor')
  const enquiry = ok(await o.post('/api/enquiries', { customerId: customer.id, siteId: customer.sites[0].id, source: 'phone', description: 'Skim the front bedroom and the landing ceiling' }), 'enquiry')
  const visit = ok(await o.post('/api/visits', { customerId: customer.id, siteId: customer.sites[0].id, enquiryId: enquiry.id, startsAt: VISIT_AT, visitorUserId: visitor }), 'visit')

  const roomBody = () => {
    const wall = randomUUID()
    return {
      ids: { wall },
      body: {
        revision: 0,
        name: 'Front bedroom',
        surfaces: [
          { id: wall, kind: 'wall', lengthMm: 4000, secondMm: 2400, conditions: [{ id: randomUUID(), kind: 'crack', lengthMm: 600 }] },
          { id: randomUUID(), kind: 'ceiling', lengthMm: 4000, secondMm: 3000 },
        ],
      },
    }
  }
  const roomId = randomUUID()
  const room = roomBody()
  const savedRoom = ok(await o.put(`/api/visits/${visit.id}/rooms/${roomId}`, room.body), 'room')
  const surfaceId = room.ids.wall
  const conditionId = savedRoom.surfaces.find((s: any) => s.id === surfaceId).conditions[0].id

  const material = ok(await o.post('/api/materials', { type: 'finish', name: 'Finish plaster', packLabel: '25 kg bag', coverageCm2PerPack: 100_000, atThicknessMm: 2, costPence: 1150 }), 'material')

  const draftQuote = ok(await o.post('/api/quotes', { customerId: customer.id }), 'draft quote')
  const draftQuoteDetail = ok(await o.get(`/api/quotes/${draftQuote.id}`), 'draft quote detail')
  const sentQuote = ok(await o.post('/api/quotes', { customerId: customer.id, siteId: customer.sites[0].id, visitId: visit.id }), 'quote from the visit')
  ok(await o.post(`/api/quotes/${sentQuote.id}/send`), 'send quote')
  const quoteMail = await app.waitForMail(customer.email, /Your quote/)
  const quoteToken = /\/q\/([\w-]+)/.exec(quoteMail.text ?? '')![1]!

  const job = ok(await o.post('/api/jobs', { customerId: customer.id, siteId: customer.sites[0].id, visitId: visit.id, title: 'Skim the front bedroom' }), 'job')
  const booked = ok(await o.put(`/api/jobs/${job.id}/days`, { days: [{ day: JOB_DAY, userId: visitor }] }), 'job days')
  const jobDayId = booked.days[0].id

  const draftInvoice = ok(await o.post('/api/invoices', { kind: 'blank', customerId: customer.id }), 'draft invoice')
  const toIssue = ok(await o.post('/api/invoices', { kind: 'blank', customerId: customer.id }), 'invoice to issue')
  ok(await o.put(`/api/invoices/${toIssue.id}/draft`, { vat: toIssue.vat, lines: [{ kind: 'labour', description: 'Skim the front bedroom', quantityX1000: 1000, unitPence: 450_00 }] }), 'invoice lines')
  ok(await o.post(`/api/invoices/${toIssue.id}/issue`), 'issue invoice')
  const invoiceMail = await app.waitForMail(customer.email, /Invoice /)
  const invoiceToken = /\/i\/([\w-]+)/.exec(invoiceMail.text ?? '')![1]!
  const paid = ok(await o.post(`/api/invoices/${toIssue.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 50_00, receivedOn: TODAY, reference: 'BACS 1' }), 'payment')
  const paymentId = paid.payments[0].id
  // an entry in the issued invoice's chase log (a call, written by the owner), for its removal
  const newChaseNote = async () => {
    const note = `Rang, no answer (${randomUUID().slice(0, 8)})`
    const chase = ok(await o.post(`/api/invoices/${toIssue.id}/chase-notes`, { kind: 'call', outcome: 'no-reply', note }), 'chase note').chase as { id: string, note: string }[]
    return chase.find(c => c.note === note)!.id
  }
  const chaseNoteId = await newChaseNote()

  const newPurchase = async () => ok(await o.post('/api/purchases', { supplier: 'Trowel & Hawk Supplies', boughtOn: TODAY, category: 'materials', netPence: 100_00, vatPence: 20_00, jobs: [{ jobId: job.id, netPence: 50_00 }] }), 'purchase').id as string
  const purchaseId = await newPurchase()
  const newCisStatement = async () => {
    const n = cisMonths++
    const month = `${2010 + Math.floor(n / 12)}-${String((n % 12) + 1).padStart(2, '0')}-06`
    return ok(await o.post('/api/cis-statements', { customerId: contractor.id, taxMonthStart: month, grossPence: 1000_00, deductionPence: 200_00 }), 'CIS statement').id as string
  }
  const cisStatementId = await newCisStatement()

  // an entry in the job's set log (a problem found: it leaves the job's status as it is), for its correction and removal
  const newSetLog = async () => ok(await o.post(`/api/jobs/${job.id}/logs`, { kind: 'problem', notes: 'Loose plaster by the door' }), 'set log').logId as string
  const setLogId = await newSetLog()

  const newPhoto = async () => ok(await sendMultipart(app.url, o, '/api/photos/uploads', { visitId: visit.id }, { data: await jpeg(), name: 'wall.jpg', type: 'image/jpeg' }), 'photo').id as string
  const photoId = await newPhoto()
  const newDocument = async () => ok(await sendMultipart(app.url, o, '/api/documents/uploads', { purchaseId }, { data: TINY_PDF, name: 'receipt.pdf', type: 'application/pdf' }), 'document').id as string
  const documentId = await newDocument()
  // a bank account, for statement imports (issue 20)
  const bankAccountId = ok(await o.post('/api/bank-accounts', { name: 'Business current account' }), 'bank account').id as string
  // and a line of money in on it, to match, note and undo
  ok(await sendMultipart(app.url, o, `/api/bank-accounts/${bankAccountId}/statements/uploads`, {}, { data: Buffer.from('Date,Description,Amount\n01/12/2026,STRIPE PAYOUT,12.00\n'), name: 'statement.csv', type: 'text/csv' }), 'statement')
  const bankLineId = ok(await o.get(`/api/bank-accounts/${bankAccountId}/lines`), 'bank lines').lines[0].id as string

  const invite = async () => {
    const email = uniqueEmail('invitee')
    const sent = ok(await o.post('/api/team/invitations', { email, role: 'crew' }), 'invitation')
    return { id: sent.id as string, email }
  }
  const openInvitation = await invite()
  const invitationTokenValue = await invitationToken(app, openInvitation.email)

  const feed = ok(await o.post('/api/me/calendar'), 'calendar feed')
  const calendarToken = /\/calendar\/([\w-]+)\.ics/.exec(feed.url)![1]!
  const firm = ok(await o.get('/api/firm'), 'firm')

  const m = (k: 'office' | 'crew' | 'accountant') => people[k] ? withMembership(people[k]!) : undefined
  const result: Firm = {
    name,
    firmId: signUp.firmId,
    owner,
    office: m('office'),
    crew: m('crew'),
    accountant: m('accountant'),
    ids: {
      bankAccountId,
      bankLineId,
      firmId: signUp.firmId,
      ownerUserId: owner.userId,
      ownerMembershipId: owner.membershipId,
      visitorUserId: visitor,
      customerId: customer.id,
      siteId: customer.sites[0].id,
      contractorId: contractor.id,
      enquiryId: enquiry.id,
      visitId: visit.id,
      roomId,
      surfaceId,
      conditionId,
      materialId: material.id,
      draftQuoteId: draftQuote.id,
      sentQuoteId: sentQuote.id,
      jobId: job.id,
      jobDayId,
      draftInvoiceId: draftInvoice.id,
      issuedInvoiceId: toIssue.id,
      paymentId,
      purchaseId,
      cisStatementId,
      photoId,
      documentId,
      invitationId: openInvitation.id,
      setLogId,
      chaseNoteId,
    },
    tokens: { invitation: invitationTokenValue, quote: quoteToken, invoice: invoiceToken, calendar: calendarToken, formKey: firm.enquiryFormKey },
    vat: { invoice: draftInvoice.vat, quote: draftQuoteDetail.current.vat },
    fresh: {
      cisStatement: newCisStatement,
      purchase: newPurchase,
      photo: newPhoto,
      setLog: newSetLog,
      chaseNote: newChaseNote,
      document: newDocument,
      invitation: async () => (await invite()).id,
      room: async () => {
        const id = randomUUID()
        ok(await o.put(`/api/visits/${visit.id}/rooms/${id}`, roomBody().body), 'fresh room')
        return id
      },
    },
  }
  for (const k of ['office', 'crew', 'accountant'] as const) {
    const p = result[k]
    if (p) Object.assign(result.ids, { [`${k}UserId`]: p.userId, [`${k}MembershipId`]: p.membershipId })
  }
  return result
}

/** A new session of the same person (its own cookie), for a call that ends one. */
export async function signIn(app: TestApp, email: string) {
  const c = new Client(app.url)
  ok(await c.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD }), `sign in ${email}`)
  return c
}

// ---------------------------------------------------------------------------------------------
// Known-good bodies: each is accepted by its route for the firm's rows (the bad-input test checks
// that, with an unknown field added); the tests change one thing at a time from here.

export type GoodBody = (f: Firm) => unknown

export const GOOD_BODIES: Record<string, GoodBody> = {
  'POST /api/auth/sign-in': f => ({ email: (f.office ?? f.owner).email, password: GOOD_PASSWORD }),
  'POST /api/auth/sign-up': () => ({ firmName: 'Lath & Float Plastering', name: 'Rhys Float', email: uniqueEmail('signup'), password: GOOD_PASSWORD }),
  'PUT /api/bank-rates': () => ({ rates: [{ fromDate: '2025-08-07', rateBp: 400 }, { fromDate: '2025-05-08', rateBp: 425 }] }),
  'POST /api/cis-statements': f => ({ customerId: f.ids.contractorId, taxMonthStart: '2026-09-06', grossPence: 2000_00, materialsPence: 300_00, deductionPence: 340_00, reference: 'HB-0926', notes: 'Posted' }),
  'PUT /api/cis-statements/:id': f => ({ customerId: f.ids.contractorId, taxMonthStart: '2009-06-06', grossPence: 1000_00, materialsPence: 0, deductionPence: 200_00, reference: 'HB-0609', notes: '' }),
  'PATCH /api/customers/:id': () => ({ kind: 'homeowner', name: 'Wren Ashdown', contactName: 'Wren', email: 'wren.ashdown@test.example', phone: '07700 900123', billingLine1: '4 Lime Kiln Row', billingLine2: '', billingTown: 'Kettlebury', billingPostcode: 'KB2 5RT', notes: 'Dog in the garden', vatRegistered: false, vatNumber: null, paysUnderCis: false, cisRatePercent: null, endUserNotified: false }),
  'POST /api/customers/:id/sites': () => ({ label: 'Rental', line1: '9 Cooper Yard', line2: 'Flat 2', town: 'Kettlebury', postcode: 'KB3 1AA', accessNotes: 'Key with neighbour' }),
  'POST /api/customers/import': () => ({ rows: [{ kind: 'landlord', name: 'Imported Lettings', email: uniqueEmail('import'), billingPostcode: 'KB9 9ZZ' }] }),
  'POST /api/customers': () => ({ customer: { kind: 'landlord', name: 'Marsh Lettings', email: uniqueEmail('marsh'), phone: '01632 960123', notes: 'Three flats' }, site: { line1: '12 Marsh Street', town: 'Kettlebury', postcode: 'KB6 2DD' } }),
  'PATCH /api/enquiries/:id': f => ({ siteId: f.ids.siteId, source: 'referral', description: 'Skim the front bedroom', preferredDates: 'Mornings', followUpOn: null }),
  'POST /api/enquiries/:id/status': () => ({ to: 'lost', reason: 'Went with a cheaper quote' }),
  'POST /api/enquiries': f => ({ customerId: f.ids.customerId, siteId: f.ids.siteId, source: 'message', description: 'Patch a ceiling after a leak', preferredDates: '', followUpOn: null }),
  'PATCH /api/firm': f => ({ tradingName: f.name, addressLine1: '1 Hawk Lane', addressLine2: '', town: 'Kettlebury', postcode: 'KB1 1AA', email: 'office@test.example', phone: '01632 960000', vatRegistered: false, vatNumber: null, cisStatus: 'not-registered', utr: null, dayRatePence: 220_00, paymentTermsDays: 14, invoicePrefix: 'INV-', takesTransfer: true, bankAccountName: f.name, bankSortCode: '00-00-00', bankAccountNumber: '00000000' }),
  'POST /api/invitations/:token/accept': () => ({ name: 'Ivo Newstart', password: GOOD_PASSWORD }),
  'POST /api/invoices/:id/chase-notes': () => ({ kind: 'call', outcome: 'promised', note: 'Will pay on Friday', promisedPence: 100_00, promisedOn: inDays(3) }),
  'PUT /api/invoices/:id/draft': f => ({ vat: f.vat.invoice, vatReason: '', cisRatePercent: null, notes: 'Thank you', lines: [{ kind: 'labour', description: 'Skim the landing ceiling', quantityX1000: 1500, unit: 'm²', unitPence: 12_00, vatRatePercent: 0 }] }),
  'POST /api/invoices/:id/payments': () => ({ requestId: randomUUID(), method: 'cheque', amountPence: 10_00, receivedOn: TODAY, reference: 'Cheque 100234' }),
  'POST /api/invoices/:id/refunds': f => ({ paymentId: f.ids.paymentId, amountPence: 1_00, reference: 'Overpaid' }),
  'POST /api/invoices': f => ({ kind: 'blank', jobId: null, customerId: f.ids.customerId, percent: null, amountPence: null }),
  'PATCH /api/job-days/:id': () => ({ worked: true, portion: 'day' }),
  'PATCH /api/jobs/:id': () => ({ title: 'Skim the front bedroom', notes: 'Bring dust sheets' }),
  'PUT /api/jobs/:id/days': f => ({ days: [{ day: JOB_DAY, userId: f.ids.visitorUserId, portion: 'day' }] }),
  // yesterday: a set's times may not be still to come
  'POST /api/jobs/:id/logs': f => ({ kind: 'set', setNumber: 1, startedAt: `${YESTERDAY}T08:00:00.000Z`, endedAt: `${YESTERDAY}T10:00:00.000Z`, coat: 'first', surfaceIds: [f.ids.surfaceId], userIds: [f.ids.visitorUserId], coldOrDamp: false, notes: 'Went on well', materials: [{ materialId: f.ids.materialId, packsX1000: 1500 }] }),
  'PATCH /api/jobs/:id/logs/:logId': f => ({ kind: 'set', setNumber: 1, startedAt: `${YESTERDAY}T08:00:00.000Z`, endedAt: `${YESTERDAY}T10:00:00.000Z`, coat: 'first', surfaceIds: [f.ids.surfaceId], userIds: [f.ids.visitorUserId], coldOrDamp: false, notes: 'Went on well', materials: [{ materialId: f.ids.materialId, packsX1000: 1500 }] }),
  'PUT /api/jobs/:id/plan': () => ({ people: 2, bagsPerPersonPerSet: 3, coverageM2PerBagX10: 100, moves: {}, resetMoves: false }),
  'POST /api/jobs/:id/status': () => ({ to: 'in-progress', reason: 'Started' }),
  'POST /api/jobs': f => ({ customerId: f.ids.customerId, siteId: f.ids.siteId, visitId: f.ids.visitId, title: 'Patch the hall ceiling', estimatedDaysX100: 150, notes: '' }),
  'PATCH /api/materials/:id': () => ({ type: 'finish', name: 'Finish plaster', packLabel: '25 kg bag', coverageCm2PerPack: 100_000, atThicknessMm: 2, coverageMmPerPack: null, costPence: 1200, supplier: 'Trowel & Hawk', active: true }),
  'POST /api/materials': () => ({ type: 'bead', name: 'Angle bead 2.4 m', packLabel: 'length', coverageCm2PerPack: null, atThicknessMm: null, coverageMmPerPack: 2400, costPence: 180, supplier: '', active: true }),
  'PUT /api/me/firm': f => ({ firmId: f.firmId }),
  'PUT /api/me/password': () => ({ currentPassword: GOOD_PASSWORD, newPassword: GOOD_PASSWORD }),
  'PUT /api/price-book': () => ({ skimWallsPerM2Pence: 9_00, skimCeilingsPerM2Pence: 11_00, undercoatPerM2Pence: 7_00, revealsPerLmPence: 6_00, beadsPerLmPence: 3_00, scrimPerLmPence: 1_00, materialsMarkupPercent: 15, minDeductCm2: 5000, narrowMaxMm: 300, beadStockLengthsMm: [2400, 3000], beadWastePercent: 10, materialsWastePercent: 10, m2PerDay: 40, drySkimDays: 5, dryUndercoatDays: 7, dryColdOrDampExtraDays: 3, cornerTrowelMm: 100, outOfTrueToleranceMm: 10, bagsPerPersonPerSet: 3 }),
  'POST /api/public/enquiry-forms/:key': () => ({ name: 'Pip Walker', email: uniqueEmail('pip'), phone: '07700 900456', addressLine1: '3 Tanners Row', town: 'Kettlebury', postcode: 'KB5 3PL', description: 'Two ceilings need overboarding and a skim', preferredDates: 'January', website: '' }),
  'POST /api/public/quotes/:token/accept': () => ({ name: 'Wren Ashdown' }),
  'POST /api/public/quotes/:token/decline': () => ({ reason: 'Too expensive for now' }),
  'PUT /api/purchases/:id': f => ({ supplier: 'Trowel & Hawk Supplies', boughtOn: TODAY, category: 'materials', netPence: 120_00, vatPence: 24_00, reference: 'TH-1', notes: '', jobs: [{ jobId: f.ids.jobId, netPence: 60_00 }] }),
  // a name of its own each time (the firm's account names are unique: a second one is a 409)
  'POST /api/bank-accounts': () => ({ name: `Savings ${randomUUID().slice(0, 8)}` }),
  'POST /api/bank-accounts/:id/confirmations': f => ({ lineIds: [f.ids.bankLineId] }),
  'PATCH /api/bank-lines/:id': () => ({ note: 'Ask the bank what this is' }),
  'POST /api/bank-lines/:id/match': () => ({ kind: 'payout' }),
  'POST /api/purchases': f => ({ supplier: 'Fuel Stop', boughtOn: TODAY, category: 'fuel', netPence: 40_00, vatPence: 8_00, reference: 'FS-9', notes: 'Van', jobs: [{ jobId: f.ids.jobId, netPence: 10_00 }] }),
  'PUT /api/quotes/:id/draft': f => ({ pricing: 'measure', estimatedDaysX100: 100, fixedPricePence: null, vat: f.vat.quote, cisRatePercent: null, validUntil: inDays(30), terms: 'Payment within 14 days', notes: '', cautions: ['Allow a week to dry'], lines: [{ kind: 'labour', description: 'Skim walls', quantityX1000: 9600, unit: 'm²', unitPence: 9_00, vatRatePercent: 0, derivation: '4.00 x 2.40' }] }),
  'POST /api/quotes': f => ({ customerId: f.ids.customerId, siteId: f.ids.siteId, enquiryId: f.ids.enquiryId, visitId: f.ids.visitId }),
  'PUT /api/reminders': () => ({ rules: [{ offsetDays: 7, subject: 'Invoice {reference} is due', body: 'Hello {customer}, a reminder.' }] }),
  'PATCH /api/sites/:id': () => ({ label: 'Home', line1: '4 Lime Kiln Row', line2: '', town: 'Kettlebury', postcode: 'KB2 5RT', accessNotes: 'Side gate' }),
  'PATCH /api/team/:id': () => ({ role: 'crew' }),
  'POST /api/team/invitations': () => ({ email: uniqueEmail('invited'), role: 'office' }),
  'PATCH /api/visits/:id': f => ({ startsAt: VISIT_AT, durationMinutes: 90, visitorUserId: f.ids.visitorUserId, notes: 'Ring first' }),
  'POST /api/visits/:id/cancel': () => ({ reason: 'The customer is away that week' }),
  'POST /api/visits/:id/done': () => ({ at: new Date(Date.now() - 60_000).toISOString(), clientId: randomUUID() }),
  'PUT /api/visits/:id/rooms/:roomId': () => {
    const wall = randomUUID()
    const other = randomUUID()
    return {
      revision: 0,
      name: 'Back bedroom',
      position: 1,
      notes: 'North facing',
      surfaces: [
        { id: wall, kind: 'wall', label: 'Window wall', lengthMm: 3600, secondMm: 2400, background: 'sound-plaster', notes: '', openings: [{ id: randomUUID(), kind: 'window', widthMm: 1200, heightMm: 1000 }], conditions: [{ id: randomUUID(), kind: 'patch-masonry', areaCm2: 2000, lengthMm: null, outOfTrueMm: null, scrimmed: false, notes: '' }] },
        { id: other, kind: 'wall', label: '', lengthMm: 3000, secondMm: 2400, background: 'sound-plaster', notes: '', openings: [], conditions: [] },
      ],
      corners: [{ id: randomUUID(), surfaceAId: wall, surfaceBId: other, kind: 'internal', lengthMm: 2400, returnWidthMm: null, needsBead: false, packedOut: false }],
    }
  },
  'POST /api/visits': f => ({ customerId: f.ids.customerId, siteId: f.ids.siteId, enquiryId: f.ids.enquiryId, startsAt: VISIT_AT, durationMinutes: 45, visitorUserId: f.ids.visitorUserId, notes: 'Measure up' }),
}

/**
 * Which of the firm's rows each `:param` names, by the resource before it (a route in
 * `ROW_FOR_ROUTE` names another row of that resource: an issued invoice, say, where a draft would
 * be changed by the call).
 */
const ROW_FOR_RESOURCE: Record<string, string> = {
  'bank-accounts': 'bankAccountId',
  'bank-lines': 'bankLineId',
  'cis-statements': 'cisStatementId',
  'customers': 'customerId',
  'documents': 'documentId',
  'enquiries': 'enquiryId',
  'invoices': 'draftInvoiceId',
  'job-days': 'jobDayId',
  'jobs': 'jobId',
  'materials': 'materialId',
  'photos': 'photoId',
  'purchases': 'purchaseId',
  'quotes': 'draftQuoteId',
  'sites': 'siteId',
  'team': 'crewMembershipId',
  'invitations': 'invitationId',
  'visits': 'visitId',
  'logs': 'setLogId',
  'chase-notes': 'chaseNoteId',
}

export const ROW_FOR_ROUTE: Record<string, Partial<Record<string, string>>> = {
  // issued: these act on an issued invoice (a draft would 409 before the body is read, or be issued)
  'DELETE /api/invoices/:id': { id: 'issuedInvoiceId' },
  'POST /api/invoices/:id/chase-notes': { id: 'issuedInvoiceId' },
  'DELETE /api/invoices/:id/chase-notes/:noteId': { id: 'issuedInvoiceId' },
  'POST /api/invoices/:id/issue': { id: 'issuedInvoiceId' },
  'POST /api/invoices/:id/payments': { id: 'issuedInvoiceId' },
  'POST /api/invoices/:id/refunds': { id: 'issuedInvoiceId' },
  'GET /api/invoices/:id': { id: 'issuedInvoiceId' },
  'GET /api/invoices/:id/claim': { id: 'issuedInvoiceId' },
  'GET /invoices/:id/pdf': { id: 'issuedInvoiceId' },
  'GET /invoices/:id/claim/pdf': { id: 'issuedInvoiceId' },
  // the owner's own membership: removing it is refused (the firm needs an owner), so nothing changes
  'DELETE /api/team/:id': { id: 'ownerMembershipId' },
  'GET /api/quotes/:id': { id: 'sentQuoteId' },
  'GET /quotes/:id/pdf': { id: 'sentQuoteId' },
}

/** A well-formed link token that names nothing. */
export const UNKNOWN_LINK_TOKEN = 'A'.repeat(43)

/** The path of `route` with its parameters filled from the firm's rows (`rows` overrides one). */
export function pathFor(route: Route, f: Firm, rows: Record<string, string> = {}): string {
  const segments = route.pattern.split('/')
  return segments.map((s, i) => {
    if (!s.startsWith(':')) return s
    const name = s.slice(1)
    if (rows[name]) return rows[name]
    const override = ROW_FOR_ROUTE[route.key]?.[name]
    if (override) return f.ids[override]!
    if (name === 'roomId') return f.ids.roomId!
    if (name === 'variant') return 'thumb'
    if (name === 'key') return f.tokens.formKey
    if (name === 'token') {
      const where = segments.slice(0, i).join('/')
      if (where.endsWith('/calendar')) return `${f.tokens.calendar}.ics`
      if (where.endsWith('/invitations')) return f.tokens.invitation
      if (where.endsWith('/public/invoices') || where === '/i') return f.tokens.invoice
      if (where.endsWith('/public/quotes') || where === '/q') return f.tokens.quote
      // a sign-up link is used once by the person who signed up: the table calls a link that names nothing
      if (where.endsWith('/auth/sign-up')) return UNKNOWN_LINK_TOKEN
    }
    const resource = segments[i - 1]!
    const key = ROW_FOR_RESOURCE[resource]
    if (!key || !f.ids[key]) throw new Error(`no row of this firm for ${name} in ${route.key}: add it to ROW_FOR_RESOURCE or ROW_FOR_ROUTE`)
    return f.ids[key]!
  }).join('/')
}

/** Queries some GET routes need to answer at all (a period, a target). */
export const QUERY_FOR_ROUTE: Record<string, (f: Firm) => string> = {
  'GET /api/cis-deductions': () => `?quarterOf=${TODAY}`,
  'GET /api/vat-return': () => `?quarterOf=${TODAY}`,
  'GET /api/profit': () => `?from=${TODAY.slice(0, 4)}-01-01&to=${TODAY}`,
  'GET /api/diary': () => `?from=${TODAY}&to=${JOB_DAY}`,
  'GET /api/photos': f => `?visitId=${f.ids.visitId}`,
  'GET /exports/profit.csv': () => `?from=${TODAY.slice(0, 4)}-01-01&to=${TODAY}`,
}
export const queryFor = (route: Route, f: Firm) => QUERY_FOR_ROUTE[route.key]?.(f) ?? (route.pattern.startsWith('/exports/') ? `?quarterOf=${TODAY}` : '')

/** Run `fn` over `items`, `n` at a time. */
export async function pool<T, R>(items: T[], n: number, fn: (item: T, i: number) => Promise<R>): Promise<R[]> {
  const out: R[] = Array.from({ length: items.length })
  let next = 0
  await Promise.all(Array.from({ length: Math.min(n, items.length) }, async () => {
    while (next < items.length) {
      const i = next++
      out[i] = await fn(items[i]!, i)
    }
  }))
  return out
}

// Every route that reads a public token or link, in one table (issue 13): the customer's quote
// and invoice links, a person's calendar feed, an invitation and the enquiry form. Each is called
// with a link that is unknown, expired, revoked or reset, a removed member's (calendar), and
// another firm's. Each answers 404 (the code uses 404 for every dead link, never 410, so a
// stranger cannot tell "never existed" from "no longer works"), and the body carries none of the
// firm's data: no names, addresses, amounts or ids.
//
// Not applicable, and why: invoice links and calendar feeds and enquiry form keys do not expire
// (they are reset instead, which is tested); a superseded quote version's link is issue 13 case 5
// (quotes), worked on elsewhere; these routes take no ids of their own, so "another firm's link
// with this firm's ids" is another firm's link, which must show only that firm.
import { createHash, randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, type ApiResponse } from '../support/client'
import { GOOD_BODIES, makeFirm, ownerDb, type Firm } from './support'

type Kind = 'quote' | 'invoice' | 'calendar' | 'invitation' | 'form'
interface LinkRoute { key: string, kind: Kind, method: 'GET' | 'POST', path: (token: string) => string }

const LINK_ROUTES: LinkRoute[] = [
  { key: 'GET /api/public/quotes/:token', kind: 'quote', method: 'GET', path: t => `/api/public/quotes/${t}` },
  { key: 'POST /api/public/quotes/:token/accept', kind: 'quote', method: 'POST', path: t => `/api/public/quotes/${t}/accept` },
  { key: 'POST /api/public/quotes/:token/decline', kind: 'quote', method: 'POST', path: t => `/api/public/quotes/${t}/decline` },
  { key: 'GET /q/:token/pdf', kind: 'quote', method: 'GET', path: t => `/q/${t}/pdf` },
  { key: 'GET /api/public/invoices/:token', kind: 'invoice', method: 'GET', path: t => `/api/public/invoices/${t}` },
  { key: 'POST /api/public/invoices/:token/checkout', kind: 'invoice', method: 'POST', path: t => `/api/public/invoices/${t}/checkout` },
  { key: 'GET /i/:token/pdf', kind: 'invoice', method: 'GET', path: t => `/i/${t}/pdf` },
  { key: 'GET /calendar/:token', kind: 'calendar', method: 'GET', path: t => `/calendar/${t}.ics` },
  { key: 'GET /api/invitations/:token', kind: 'invitation', method: 'GET', path: t => `/api/invitations/${t}` },
  { key: 'POST /api/invitations/:token/accept', kind: 'invitation', method: 'POST', path: t => `/api/invitations/${t}/accept` },
  { key: 'GET /api/public/enquiry-forms/:key', kind: 'form', method: 'GET', path: t => `/api/public/enquiry-forms/${t}` },
  { key: 'POST /api/public/enquiry-forms/:key', kind: 'form', method: 'POST', path: t => `/api/public/enquiry-forms/${t}` },
]

let app: TestApp
let a: Firm
let b: Firm

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  a = await makeFirm(app, 'Linkwise Plastering', { team: true })
  b = await makeFirm(app, 'Other Links Plastering')
})
afterAll(async () => {
  await app?.stop()
})

// the hash kept is of the secret: the link's last 43 characters, after the firm's part (22)
const sha = (token: string) => createHash('sha256').update(token.slice(-43)).digest('hex')
const unknownToken = (kind: Kind) => kind === 'form' ? randomBytes(16).toString('hex') : randomBytes(32).toString('base64url')

async function call(route: LinkRoute, token: string, firm: Firm): Promise<ApiResponse> {
  const c = new Client(app.url)
  if (route.method === 'GET') return c.get(route.path(token))
  const body = GOOD_BODIES[route.key]?.(firm) ?? {}
  return c.post(route.path(token), body)
}

/** The firm's data that no dead link may show. */
function leaks(res: ApiResponse, firm: Firm): string[] {
  const text = typeof res.body === 'string' ? res.body : JSON.stringify(res.body ?? '')
  const words = [firm.name, 'Wren Ashdown', 'Lime Kiln Row', 'KB2 5RT', 'Skim the front bedroom', '45000', '450.00', ...Object.values(firm.ids)]
  return words.filter(w => text.includes(w))
}

/** As the database owner, with the firm set (row-level security is forced for the owner too). */
function asOwner(firmId: string, sql: string, params: unknown[]) {
  return ownerDb(async (db) => {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const res = await db.query(sql, params)
    await db.query('commit')
    return res.rowCount
  })
}

describe('every public link, dead in every way, answers 404 with none of the firm\'s data', () => {
  it('unknown, revoked or reset, a removed member\'s, expired', async () => {
    const owner = a.owner.client
    const dead: Record<string, Partial<Record<Kind, string>>> = {}
    dead.unknown = Object.fromEntries((['quote', 'invoice', 'calendar', 'invitation', 'form'] as Kind[]).map(k => [k, unknownToken(k)]))

    // revoked or reset: the old link of each kind that can be made anew
    const oldCalendar = a.tokens.calendar
    expect((await owner.post('/api/me/calendar')).status).toBe(200)
    const oldKey = a.tokens.formKey
    expect((await owner.post('/api/firm/enquiry-form-key')).status).toBe(200)
    const oldInvoice = a.tokens.invoice
    expect((await owner.post(`/api/invoices/${a.ids.issuedInvoiceId}/resend`)).status).toBe(200)
    const oldInvitation = a.tokens.invitation
    expect((await owner.delete(`/api/team/invitations/${a.ids.invitationId}`)).status).toBe(204)
    dead.revoked = { calendar: oldCalendar, form: oldKey, invoice: oldInvoice, invitation: oldInvitation }

    // a removed member's calendar feed
    const crew = a.crew!
    const feed = await crew.client.post('/api/me/calendar')
    expect(feed.status).toBe(200)
    const crewToken = /\/calendar\/([\w-]+)\.ics/.exec(feed.body.url)![1]!
    expect((await new Client(app.url).get(`/calendar/${crewToken}.ics`)).status).toBe(200)
    expect((await owner.delete(`/api/team/${crew.membershipId}`)).status).toBe(204)
    dead.removed = { calendar: crewToken }

    // expired: the expiry set in the past, as the database owner
    const lateEmail = `late-${randomBytes(4).toString('hex')}@test.example`
    expect((await owner.post('/api/team/invitations', { email: lateEmail, role: 'crew' })).status).toBe(201)
    const lateInvitation = /\/invite\/([\w-]+)/.exec((await app.waitForMail(lateEmail, /invited you/)).text ?? '')![1]!
    expect(await asOwner(a.firmId, `update quote_versions set token_expires_at = now() - interval '1 minute' where firm_id = $1 and token_hash = $2`, [a.firmId, sha(a.tokens.quote)])).toBe(1)
    expect(await asOwner(a.firmId, `update invitations set expires_at = now() - interval '1 minute' where firm_id = $1 and token_hash = $2`, [a.firmId, sha(lateInvitation)])).toBe(1)
    dead.expired = { quote: a.tokens.quote, invitation: lateInvitation }

    const wrong: string[] = []
    let calls = 0
    for (const [why, tokens] of Object.entries(dead)) {
      for (const route of LINK_ROUTES) {
        const token = tokens[route.kind]
        if (!token) continue
        const res = await call(route, token, a)
        calls++
        if (res.status !== 404) wrong.push(`${route.key} ${why}: ${res.status} ${JSON.stringify(res.body)?.slice(0, 200)}`)
        const leaked = leaks(res, a)
        if (leaked.length) wrong.push(`${route.key} ${why}: shows ${leaked.join(', ')}`)
      }
    }
    expect(wrong).toEqual([])
    expect(calls).toBeGreaterThanOrEqual(LINK_ROUTES.length * 2)
    console.info(`[public-links] ${calls} calls with dead links, each 404 with none of the firm's data`)
  })

  it('another firm\'s live links show only that firm', async () => {
    const wrong: string[] = []
    const tokens: Record<Kind, string> = { quote: b.tokens.quote, invoice: b.tokens.invoice, calendar: b.tokens.calendar, invitation: b.tokens.invitation, form: b.tokens.formKey }
    for (const route of LINK_ROUTES.filter(r => r.method === 'GET')) {
      const res = await call(route, tokens[route.kind], b)
      if (res.status !== 200) wrong.push(`${route.key}: ${res.status}`)
      const text = typeof res.body === 'string' ? res.body : JSON.stringify(res.body ?? '')
      const leaked = [a.name, ...Object.values(a.ids)].filter(w => text.includes(w))
      if (leaked.length) wrong.push(`${route.key}: shows the first firm's ${leaked.join(', ')}`)
    }
    expect(wrong).toEqual([])
  })

  it('a link sent before links carried their firm (the secret alone) still opens; a secret under another firm\'s part does not', async () => {
    const live: Record<Kind, string> = { quote: b.tokens.quote, invoice: b.tokens.invoice, calendar: b.tokens.calendar, invitation: b.tokens.invitation, form: b.tokens.formKey }
    const firmPartOf = (firm: Firm) => Buffer.from(firm.firmId.replace(/-/g, ''), 'hex').toString('base64url')
    const wrong: string[] = []
    for (const route of LINK_ROUTES.filter(r => r.method === 'GET')) {
      const link = live[route.kind]
      // the new form: the firm's part, then the secret
      if (!link.startsWith(firmPartOf(b))) wrong.push(`${route.key}: the link does not start with its firm's part: ${link}`)
      const secret = link.slice(22)
      // the old form, as sent before: the secret alone (the hash kept is the same)
      const old = await call(route, secret, b)
      if (old.status !== 200) wrong.push(`${route.key} old form: ${old.status}`)
      // the same secret under another firm's part, or a firm that does not exist: nothing
      for (const [why, part] of [['another firm', firmPartOf(a)], ['no firm', Buffer.from(randomBytes(16)).toString('base64url')]] as const) {
        const res = await call(route, part + secret, b)
        if (res.status !== 404) wrong.push(`${route.key} under ${why}'s part: ${res.status}`)
        const leaked = leaks(res, b)
        if (leaked.length) wrong.push(`${route.key} under ${why}'s part: shows ${leaked.join(', ')}`)
      }
    }
    expect(wrong).toEqual([])
  })
})

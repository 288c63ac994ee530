import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { can, type Permission, type Role } from '#shared/utils/roles'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, type ApiResponse } from '../support/client'
import {
  changedCounts, GOOD_BODIES, jpeg, listRoutes, makeFirm, pathFor, pool, queryFor, routeSource, sendMultipart,
  signIn, snapshot, TINY_PDF, type Firm, type Route,
} from './support'

// Access (issue 8): every route file under server/api and server/routes, called as each role of
// one firm, signed out, and as the owner of another firm using the first firm's ids, against the
// table below. A route file missing from the table fails the test with its name. Refused calls
// carry a body the route would accept, so a missing check would write: the firm's rows are
// counted before and after them.

type Need = Permission | 'member' | 'public' | `${Permission}|${Permission}`
type Outcome = 'ok' | '400' | '401' | '403' | '404'
const CALLERS = ['out', 'owner', 'office', 'crew', 'accountant', 'other'] as const
type Caller = (typeof CALLERS)[number]

/**
 * What each route needs (the permission its requireAuth names; `member`: any signed-in member;
 * `a|b`: either; `public`: no sign-in), and the outcome for each caller, in this order:
 *
 *   signed out | owner | office | crew | accountant | owner of another firm (this firm's ids)
 *
 * ok: the checks let the call through (2xx, or 400/409/415/422 on the body or the row's state).
 * 400 (another firm): an id of this firm in the body is refused as a field. 404: no such row for
 * this caller (another firm's, or a row the role only sees when it is theirs). The crew member
 * is the visitor of the visit and booked on the job; the accountant is not.
 */
const TABLE: Record<string, [Need, string]> = {
  'GET /api/audit': ['audit:read', '401 ok 403 403 ok ok'],
  'POST /api/auth/sign-in': ['public', 'ok ok ok ok ok ok'],
  'POST /api/auth/sign-out': ['public', 'ok ok ok ok ok ok'],
  'POST /api/auth/sign-up': ['public', 'ok ok ok ok ok ok'],
  // called with a link that names nothing (a sign-up link is single use): 404 for everyone
  'POST /api/auth/sign-up/:token': ['public', '404 404 404 404 404 404'],
  'GET /api/bank-accounts': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/bank-accounts': ['money:write', '401 ok ok 403 403 ok'],
  'POST /api/bank-accounts/:id/confirmations': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/bank-accounts/:id/lines': ['money:read', '401 ok ok 403 ok 404'],
  'POST /api/bank-accounts/:id/statements/uploads': ['money:write', '401 ok ok 403 403 404'],
  'PATCH /api/bank-lines/:id': ['money:write', '401 ok ok 403 403 404'],
  'DELETE /api/bank-lines/:id/match': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/bank-lines/:id/match': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/bank-rates': ['money:read', '401 ok ok 403 ok ok'],
  'PUT /api/bank-rates': ['firm:manage', '401 ok 403 403 403 ok'],
  'GET /api/cis-deductions': ['money:read', '401 ok ok 403 ok ok'],
  'DELETE /api/cis-statements/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/cis-statements/:id': ['money:read', '401 ok ok 403 ok 404'],
  'PUT /api/cis-statements/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/cis-statements': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/cis-statements': ['money:write', '401 ok ok 403 403 400'],
  'DELETE /api/customers/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'GET /api/customers/:id': ['customers:read', '401 ok ok 403 ok 404'],
  'PATCH /api/customers/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/customers/:id/sites': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/customers/import': ['ledger:write', '401 ok ok 403 403 ok'],
  'GET /api/customers': ['customers:read', '401 ok ok 403 ok ok'],
  'POST /api/customers': ['ledger:write', '401 ok ok 403 403 ok'],
  'GET /api/diary': ['jobs:read-assigned', '401 ok ok ok 403 ok'],
  'DELETE /api/documents/:id': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/documents/uploads': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/enquiries/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'PATCH /api/enquiries/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/enquiries/:id/status': ['ledger:write', '401 ok ok 403 403 404'],
  'GET /api/enquiries': ['ledger:write', '401 ok ok 403 403 ok'],
  'POST /api/enquiries': ['ledger:write', '401 ok ok 403 403 400'],
  'POST /api/firm/enquiry-form-key': ['firm:manage', '401 ok 403 403 403 ok'],
  'GET /api/firm': ['firm:read', '401 ok ok ok ok ok'],
  'PATCH /api/firm': ['firm:manage', '401 ok 403 403 403 ok'],
  'GET /api/health': ['public', 'ok ok ok ok ok ok'],
  'GET /api/invitations/:token': ['public', 'ok ok ok ok ok ok'],
  'POST /api/invitations/:token/accept': ['public', 'ok ok ok ok ok ok'],
  'DELETE /api/invoices/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/invoices/:id': ['money:read', '401 ok ok 403 ok 404'],
  'POST /api/invoices/:id/chase-notes': ['money:write', '401 ok ok 403 403 404'],
  // the table's entry was written by the owner: the office (another writer) is refused it in words
  'DELETE /api/invoices/:id/chase-notes/:noteId': ['money:write', '401 ok 403 403 403 404'],
  'GET /api/invoices/:id/claim': ['money:read', '401 ok ok 403 ok 404'],
  'POST /api/invoices/:id/credit-note': ['money:write', '401 ok ok 403 403 404'],
  'PUT /api/invoices/:id/draft': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/invoices/:id/issue': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/invoices/:id/payments': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/invoices/:id/refunds': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/invoices/:id/reminders': ['money:write', '401 ok ok 403 403 404'],
  'POST /api/invoices/:id/resend': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/invoices': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/invoices': ['money:write', '401 ok ok 403 403 400'],
  'PATCH /api/job-days/:id': ['work:log', '401 ok ok ok 403 404'],
  'GET /api/jobs/:id': ['jobs:read-assigned', '401 ok ok ok 403 404'],
  'PATCH /api/jobs/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'PUT /api/jobs/:id/days': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/jobs/:id/logs': ['work:log', '401 ok ok ok 403 404'],
  // the owner logged it: only they (or its logger, that day) may change it, so office and crew are refused
  'DELETE /api/jobs/:id/logs/:logId': ['work:log', '401 ok 403 403 403 404'],
  'PATCH /api/jobs/:id/logs/:logId': ['work:log', '401 ok 403 403 403 404'],
  'PUT /api/jobs/:id/plan': ['work:log', '401 ok ok ok 403 404'],
  'POST /api/jobs/:id/status': ['work:log', '401 ok ok ok 403 404'],
  'GET /api/jobs': ['jobs:read-assigned', '401 ok ok ok 403 ok'],
  'POST /api/jobs': ['ledger:write', '401 ok ok 403 403 400'],
  'PATCH /api/materials/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/materials': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/materials': ['money:write', '401 ok ok 403 403 ok'],
  'GET /api/me/calendar': ['jobs:read-assigned', '401 ok ok ok 403 ok'],
  'POST /api/me/calendar': ['jobs:read-assigned', '401 ok ok ok 403 ok'],
  'PUT /api/me/firm': ['member', '401 ok ok ok ok 404'],
  'GET /api/me': ['member', '401 ok ok ok ok ok'],
  'PUT /api/me/password': ['member', '401 ok ok ok ok ok'],
  'GET /api/members': ['ledger:write', '401 ok ok 403 403 ok'],
  'GET /api/owed': ['money:read', '401 ok ok 403 ok ok'],
  'DELETE /api/photos/:id': ['work:log', '401 ok ok ok 403 404'],
  'GET /api/photos/:id': ['member', '401 ok ok ok 404 404'],
  'GET /api/photos': ['member', '401 ok ok ok 404 404'],
  'POST /api/photos/uploads': ['ledger:write|work:log', '401 ok ok ok 403 404'],
  'GET /api/price-book': ['money:read', '401 ok ok 403 ok ok'],
  'PUT /api/price-book': ['firm:manage', '401 ok 403 403 403 ok'],
  'GET /api/profit': ['money:read', '401 ok ok 403 ok ok'],
  // Today: every role has one (each its own lists); another firm's owner gets their own firm's
  'GET /api/today': ['firm:read', '401 ok ok ok ok ok'],
  'GET /api/promises/broken': ['money:read', '401 ok ok 403 ok ok'],
  'GET /api/public/enquiry-forms/:key': ['public', 'ok ok ok ok ok ok'],
  'POST /api/public/enquiry-forms/:key': ['public', 'ok ok ok ok ok ok'],
  'GET /api/public/invoices/:token': ['public', 'ok ok ok ok ok ok'],
  'POST /api/public/invoices/:token/checkout': ['public', 'ok ok ok ok ok ok'],
  'GET /api/public/quotes/:token': ['public', 'ok ok ok ok ok ok'],
  'POST /api/public/quotes/:token/accept': ['public', 'ok ok ok ok ok ok'],
  'POST /api/public/quotes/:token/decline': ['public', 'ok ok ok ok ok ok'],
  'DELETE /api/purchases/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/purchases/:id': ['money:read', '401 ok ok 403 ok 404'],
  'PUT /api/purchases/:id': ['money:write', '401 ok ok 403 403 404'],
  'GET /api/purchases': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/purchases': ['money:write', '401 ok ok 403 403 400'],
  'GET /api/quotes/:id': ['money:read', '401 ok ok 403 ok 404'],
  'PUT /api/quotes/:id/draft': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/quotes/:id/job': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/quotes/:id/revise': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/quotes/:id/send': ['ledger:write', '401 ok ok 403 403 404'],
  'GET /api/quotes': ['money:read', '401 ok ok 403 ok ok'],
  'POST /api/quotes': ['ledger:write', '401 ok ok 403 403 400'],
  'GET /api/reminders': ['money:read', '401 ok ok 403 ok ok'],
  'PUT /api/reminders': ['money:write', '401 ok ok 403 403 ok'],
  'POST /api/reminders/run': ['money:write', '401 ok ok 403 403 ok'],
  'DELETE /api/sites/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'PATCH /api/sites/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'DELETE /api/team/:id': ['team:manage', '401 ok 403 403 403 404'],
  'PATCH /api/team/:id': ['team:manage', '401 ok 403 403 403 404'],
  'GET /api/team': ['team:manage', '401 ok 403 403 403 ok'],
  'DELETE /api/team/invitations/:id': ['team:manage', '401 ok 403 403 403 404'],
  'POST /api/team/invitations': ['team:manage', '401 ok 403 403 403 ok'],
  'GET /api/vat-return': ['money:read', '401 ok ok 403 ok ok'],
  'GET /api/visits/:id': ['member', '401 ok ok ok 404 404'],
  'PATCH /api/visits/:id': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/visits/:id/cancel': ['ledger:write', '401 ok ok 403 403 404'],
  'POST /api/visits/:id/done': ['ledger:write|work:log', '401 ok ok ok 403 404'],
  'DELETE /api/visits/:id/rooms/:roomId': ['ledger:write|work:log', '401 ok ok ok 403 404'],
  'PUT /api/visits/:id/rooms/:roomId': ['ledger:write|work:log', '401 ok ok ok 403 404'],
  'GET /api/visits/:id/rooms': ['member', '401 ok ok ok 404 404'],
  'GET /api/visits': ['jobs:read-assigned|ledger:write', '401 ok ok ok 403 ok'],
  'POST /api/visits': ['ledger:write', '401 ok ok 403 403 400'],
  'POST /api/webhooks/stripe': ['public', 'ok ok ok ok ok ok'],
  'GET /calendar/:token': ['public', 'ok ok ok ok ok ok'],
  'GET /documents/:id': ['money:read', '401 ok ok 403 ok 404'],
  'GET /exports/cis-deductions.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/invoice-lines.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/invoices.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/payments.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/profit.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/purchases.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/quarter.zip': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/vat-breakdown.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /exports/vat-summary.csv': ['exports:download', '401 ok ok 403 ok ok'],
  'GET /i/:token/pdf': ['public', 'ok ok ok ok ok ok'],
  'GET /invoices/:id/claim/pdf': ['money:read', '401 ok ok 403 ok 404'],
  'GET /invoices/:id/pdf': ['money:read', '401 ok ok 403 ok 404'],
  'GET /photos/:id/:variant': ['member', '401 ok ok ok 404 404'],
  'GET /q/:token/pdf': ['public', 'ok ok ok ok ok ok'],
  'GET /quotes/:id/pdf': ['money:read', '401 ok ok 403 ok 404'],
}

/** Routes that delete a row: each caller let through gets a row of its own (refused callers share one made for them). */
const FRESH: Record<string, { param: string, make: (f: Firm) => Promise<string> }> = {
  'DELETE /api/cis-statements/:id': { param: 'id', make: f => f.fresh.cisStatement() },
  'DELETE /api/documents/:id': { param: 'id', make: f => f.fresh.document() },
  'DELETE /api/invoices/:id/chase-notes/:noteId': { param: 'noteId', make: f => f.fresh.chaseNote() },
  'DELETE /api/jobs/:id/logs/:logId': { param: 'logId', make: f => f.fresh.setLog() },
  'DELETE /api/photos/:id': { param: 'id', make: f => f.fresh.photo() },
  'DELETE /api/purchases/:id': { param: 'id', make: f => f.fresh.purchase() },
  'DELETE /api/team/invitations/:id': { param: 'id', make: f => f.fresh.invitation() },
  'DELETE /api/visits/:id/rooms/:roomId': { param: 'roomId', make: f => f.fresh.room() },
}

/** Calls that change what other routes read (a link, a session): made last, after everything else. */
const LAST = new Set(['POST /api/auth/sign-out', 'POST /api/firm/enquiry-form-key', 'POST /api/me/calendar'])

const UPLOADS: Record<string, { target?: 'visitId' | 'purchaseId', file: () => Promise<{ data: Buffer, name: string, type: string }> }> = {
  'POST /api/photos/uploads': { target: 'visitId', file: async () => ({ data: await jpeg(), name: 'wall.jpg', type: 'image/jpeg' }) },
  'POST /api/documents/uploads': { target: 'purchaseId', file: async () => ({ data: TINY_PDF, name: 'receipt.pdf', type: 'application/pdf' }) },
  // the account is in the path; a file that is no statement is refused (400) and nothing kept
  'POST /api/bank-accounts/:id/statements/uploads': { file: async () => ({ data: Buffer.from('Date,Description,Amount\n01/12/2026,FP ACCESS TEST,1.00\n'), name: 'statement.csv', type: 'text/csv' }) },
}

const ROLES_OF_FIRM = ['owner', 'office', 'crew', 'accountant'] as const

/**
 * Routes on a row that is someone's own: a role with the permission is still refused (403, in
 * words) a row that is not theirs. A set log entry is changed by the person who logged it (that
 * day) or the owner; the table's entry was logged by the owner. A chase log entry likewise (its
 * writer that day, or the owner); the table's was written by the owner.
 */
const OWN_ROWS = new Set(['PATCH /api/jobs/:id/logs/:logId', 'DELETE /api/jobs/:id/logs/:logId', 'DELETE /api/invoices/:id/chase-notes/:noteId'])

function expected(key: string): Record<Caller, Outcome> {
  const tokens = TABLE[key]![1].split(/\s+/)
  return Object.fromEntries(CALLERS.map((c, i) => [c, tokens[i] as Outcome])) as Record<Caller, Outcome>
}

const ALLOWED_STATUSES = new Set([400, 409, 415, 422])
/** Public routes the table calls with a link that names nothing (404 for every caller). */
const LINK_ONLY = new Set(['POST /api/auth/sign-up/:token'])
function matches(outcome: Outcome, status: number) {
  if (outcome === 'ok') return (status >= 200 && status < 300) || ALLOWED_STATUSES.has(status)
  return status === Number(outcome)
}

let app: TestApp
let a: Firm
let b: { client: Client, email: string, firmId: string }
let routes: Route[]
const anonymous = () => new Client(app.url)

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  routes = listRoutes()
  a = await makeFirm(app, 'Access Plastering', { team: true })
  b = await signUpFirm(app.url, 'Elsewhere Plastering')
})
afterAll(async () => {
  await app?.stop()
})

function clientOf(caller: Caller): Client {
  if (caller === 'out') return anonymous()
  if (caller === 'other') return b.client
  return a[caller]!.client
}

/** One call of `route` as `caller`; `refused` callers send a body the route would accept. */
async function call(route: Route, caller: Caller, opts: { refused: boolean, rows?: Record<string, string> }): Promise<ApiResponse> {
  const who = clientOf(caller)
  const path = pathFor(route, a, opts.rows) + queryFor(route, a)
  const upload = UPLOADS[route.key]
  if (upload) {
    // the target in the query is checked before the body is read; let through, a file that is no picture is refused (415) and nothing kept
    const file = opts.refused ? await upload.file() : { data: Buffer.from('not a picture, not a receipt'), name: 'note.txt', type: 'text/plain' }
    return sendMultipart(app.url, caller === 'out' ? null : who, upload.target ? `${path}?${upload.target}=${a.ids[upload.target]}` : path, {}, file)
  }
  const good = GOOD_BODIES[route.key]
  const body = ['POST', 'PUT', 'PATCH'].includes(route.method) ? (opts.refused && good ? good(a) : {}) : undefined
  return who.request(route.method, path, body)
}

const describeResponse = (r: ApiResponse) => `${r.status} ${typeof r.body === 'string' ? r.body.slice(0, 200) : JSON.stringify(r.body)?.slice(0, 300)}`

describe('the access table', () => {
  it('has a row for every route file, and a route file for every row', () => {
    const keys = routes.map(r => r.key)
    expect(keys.length).toBeGreaterThan(100)
    expect(keys.filter(k => !(k in TABLE)), 'route files missing from the access table').toEqual([])
    expect(Object.keys(TABLE).filter(k => !keys.includes(k)), 'rows of the access table with no route file').toEqual([])
    for (const [key, [, row]] of Object.entries(TABLE)) {
      expect(row.split(/\s+/).every(t => ['ok', '400', '401', '403', '404'].includes(t)) && row.split(/\s+/).length === 6, `${key}: "${row}"`).toBe(true)
    }
  })

  it('names, for each route, the permission its route file checks', () => {
    const fromSource = (src: string): string => {
      const named = /requireAuth\(event, '([^']+)'\)/.exec(src)
      if (named) return named[1]!
      if (/exportDownload\(event/.test(src)) return 'exports:download'
      if (/requireAuth\(event\)/.test(src)) {
        if (/canMeasure\(auth\)/.test(src)) return 'ledger:write|work:log'
        const gate = /if \(((?:!can\(auth\.role, '[^']+'\)(?: && )?)+)\)\s*\{?\s*throw createError\(\{ statusCode: 403/.exec(src)
        if (gate) return [...gate[1]!.matchAll(/'([^']+)'/g)].map(m => m[1]!).sort().join('|')
        return 'member'
      }
      return 'public'
    }
    const wrong = routes.filter(r => r.key in TABLE)
      .map(r => ({ key: r.key, table: TABLE[r.key]![0].split('|').sort().join('|'), source: fromSource(routeSource(r)) }))
      .filter(x => x.table !== x.source)
    expect(wrong).toEqual([])
  })

  it('agrees with the roles: a role without the permission is refused, one with it gets through (or sees no such row)', () => {
    const problems: string[] = []
    for (const route of routes.filter(r => r.key in TABLE)) {
      const [need] = TABLE[route.key]!
      const want = expected(route.key)
      const allowed = (role: Role) => need === 'public' || need === 'member' || need.split('|').some(p => can(role, p as Permission))
      if (LINK_ONLY.has(route.key)) continue
      if (want.out !== (need === 'public' ? 'ok' : '401')) problems.push(`${route.key}: signed out should be ${need === 'public' ? 'ok' : '401'}`)
      for (const role of ROLES_OF_FIRM) {
        const ok = allowed(role) ? ['ok', '404', ...(OWN_ROWS.has(route.key) && role !== 'owner' ? ['403'] : [])].includes(want[role]) : want[role] === '403'
        if (!ok) problems.push(`${route.key}: ${role} is ${want[role]} but ${allowed(role) ? 'has' : 'lacks'} ${need}`)
      }
      const other = need === 'public' ? ['ok'] : route.params.length ? ['404'] : ['ok', '400', '404']
      if (!other.includes(want.other)) problems.push(`${route.key}: another firm's owner should be ${other.join(' or ')}`)
    }
    expect(problems).toEqual([])
  })
})

describe('every route, as every caller', () => {
  it('answers as the table says; refused calls write nothing and another firm sees none of this firm\'s rows', async () => {
    const table = routes.filter(r => r.key in TABLE)
    const mismatches: string[] = []
    const firmIds = Object.values(a.ids)
    const check = (route: Route, caller: Caller, res: ApiResponse) => {
      const want = expected(route.key)[caller]
      if (res.status >= 500 || !matches(want, res.status)) mismatches.push(`${route.key} as ${caller}: expected ${want}, got ${describeResponse(res)}`)
      if (caller === 'other' && res.status < 300) {
        const text = typeof res.body === 'string' ? res.body : JSON.stringify(res.body ?? '')
        const leaked = firmIds.filter(id => text.includes(id))
        if (leaked.length) mismatches.push(`${route.key} as other: answered ${leaked.length} of the first firm's ids`)
      }
    }

    // victims for the refused calls of the routes that delete
    const victims: Record<string, string> = {}
    for (const [key, fresh] of Object.entries(FRESH)) victims[key] = await fresh.make(a)

    // 1. every call the table refuses (401, 403, 404, or 400 for another firm's ids), counted
    const refused = table.flatMap(route => CALLERS.filter(c => expected(route.key)[c] !== 'ok').map(caller => ({ route, caller })))
    const before = await snapshot([a.firmId, b.firmId])
    await pool(refused, 6, async ({ route, caller }) => {
      const fresh = FRESH[route.key]
      check(route, caller, await call(route, caller, { refused: true, rows: fresh ? { [fresh.param]: victims[route.key]! } : {} }))
    })
    const after = await snapshot([a.firmId, b.firmId])
    expect(refused.length).toBeGreaterThan(300)
    expect(changedCounts(before, after), 'rows written by refused calls').toEqual([])

    // 2. every call the table lets through, except those that change what others read
    const allowed = table.filter(r => !LAST.has(r.key)).flatMap(route => CALLERS.filter(c => expected(route.key)[c] === 'ok').map(caller => ({ route, caller })))
    await pool(allowed, 6, async ({ route, caller }) => {
      const fresh = FRESH[route.key]
      const rows = fresh && caller !== 'other' ? { [fresh.param]: await fresh.make(a) } : {}
      check(route, caller, await call(route, caller, { refused: false, rows }))
    })

    // 3. last: new links, and signing out (each caller in a session of its own, which ends)
    for (const key of LAST) {
      const route = table.find(r => r.key === key)!
      for (const caller of CALLERS.filter(c => expected(key)[c] === 'ok')) {
        if (key !== 'POST /api/auth/sign-out') {
          check(route, caller, await call(route, caller, { refused: false }))
          continue
        }
        const email = caller === 'out' ? null : caller === 'other' ? b.email : a[caller]!.email
        const session = email ? await signIn(app, email) : anonymous()
        const res = await session.post('/api/auth/sign-out')
        check(route, caller, res)
        if (email && (await session.get('/api/me')).status !== 401) mismatches.push(`sign-out as ${caller}: the session still works`)
      }
    }

    expect(mismatches).toEqual([])
    // and the people of the firm are still signed in and in their roles
    for (const role of ROLES_OF_FIRM) expect((await a[role]!.client.get('/api/me')).body.role).toBe(role)
  })
})

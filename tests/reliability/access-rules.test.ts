// Access and limit rules that must hold when requests arrive at the same moment (issue 13: 1, 2,
// 3, 11 and the cross-site guard). Each concurrent case releases its requests together (a barrier,
// then Promise.all) and reads the database afterwards as the owner role.
//
// The limits are per address. The requests of the limit tests come from their own loopback
// addresses (127.0.0.2 and up: Linux routes all of 127/8 to the loopback device), so using up a
// limit here never holds up the other test files, which all come from 127.0.0.1.
import { request as httpRequest } from 'node:http'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail, type ApiResponse } from '../support/client'
import { invitationToken, inviteAndJoin } from '../api/support'
import { firmRowCounts, ownerDb } from './support'
import { statuses, together } from './race'

let app: TestApp

beforeAll(async () => {
  // the production figure for the cap per address (tests/support/app.ts raises it for the other files)
  app = await startApp({ NUXT_SIGN_IN_ADDRESS_MAX: '30' })
})
afterAll(async () => {
  await app?.stop()
})

/** A JSON request sent from a given local address (the server sees it as the client's address). */
function sendFrom(localAddress: string, method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<ApiResponse> {
  const url = new URL(app.url + path)
  const payload = body === undefined ? undefined : JSON.stringify(body)
  return new Promise((resolve, reject) => {
    const req = httpRequest({
      host: url.hostname,
      port: url.port,
      path: url.pathname + url.search,
      method,
      localAddress,
      agent: false,
      headers: { ...(payload ? { 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(payload)) } : {}), ...headers },
    }, (res) => {
      let text = ''
      res.setEncoding('utf8')
      res.on('data', (d) => {
        text += d
      })
      res.on('end', () => {
        let parsed: any = text
        try {
          parsed = text ? JSON.parse(text) : null
        }
        catch { /* not JSON */ }
        const h = new Headers()
        for (const [k, v] of Object.entries(res.headers)) if (v !== undefined) h.set(k, Array.isArray(v) ? v.join(', ') : v)
        resolve({ status: res.statusCode ?? 0, body: parsed, headers: h })
      })
    })
    req.on('error', reject)
    if (payload) req.write(payload)
    req.end()
  })
}

/** The newest mail to `to` whose subject matches (waitForMail gives the first). */
async function latestMail(to: string, subject: RegExp, after: number) {
  const until = Date.now() + 10_000
  for (;;) {
    const found = app.mails.slice(after).filter(m => [m.to].flat().some(a => a?.text.toLowerCase().includes(to.toLowerCase())) && subject.test(m.subject ?? ''))
    if (found.length) return found.at(-1)!
    if (Date.now() > until) throw new Error(`no new mail to ${to}`)
    await new Promise(r => setTimeout(r, 100))
  }
}

async function limitHits(key: string): Promise<number> {
  return ownerDb(async db => (await db.query('select count(*)::int as n from limit_hits where key = $1', [key])).rows[0].n as number)
}

describe('removing a member ends every way in (issue 13, case 1)', () => {
  it('ends the sessions and the calendar feeds; the old feed stays dead after they are invited back; a new feed works', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Feed Firm')
    const email = uniqueEmail('crew')
    const { client: crew } = await inviteAndJoin(app, owner, email, 'crew', 'Colm Hawk')
    const feed = await crew.post('/api/me/calendar')
    expect(feed.status).toBe(200)
    const oldPath = new URL(feed.body.url).pathname
    expect((await new Client(app.url).get(oldPath)).status).toBe(200)

    const team = (await owner.get('/api/team')).body.people as { id: string, userId: string, email: string }[]
    const member = team.find(p => p.email === email)!
    expect((await owner.delete(`/api/team/${member.id}`)).status).toBe(204)

    const afterRemoval = await new Client(app.url).get(oldPath)
    expect(afterRemoval.status).toBe(404)
    expect(JSON.stringify(afterRemoval.body)).not.toMatch(/Feed Firm|BEGIN:VCALENDAR/)
    // nothing of the feed is left for a forgotten path to find
    const feeds = await ownerDb(async (db) => {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      const { rows } = await db.query('select count(*)::int as n from calendar_feeds where firm_id = $1 and user_id = (select id from users where lower(email) = $2)', [firmId, email])
      await db.query('rollback')
      return rows[0].n as number
    })
    expect(feeds).toBe(0)
    // and their sessions in the firm were revoked by the removal itself, not on their next request
    const live = await ownerDb(async db => (await db.query('select count(*)::int as n from sessions where current_firm_id = $1 and revoked_at is null and user_id = (select id from users where lower(email) = $2)', [firmId, email])).rows[0].n as number)
    expect(live).toBe(0)
    expect((await crew.get('/api/me')).status).toBe(401)

    // invited back: the old link stays dead until they make a new one
    const mailsBefore = app.mails.length
    expect((await owner.post('/api/team/invitations', { email, role: 'crew' })).status).toBe(201)
    const mail = await latestMail(email, /invited you/, mailsBefore)
    const token = /\/invite\/([\w-]+)/.exec(mail.text ?? '')![1]!
    const back = new Client(app.url)
    expect((await back.post(`/api/invitations/${token}/accept`, { password: GOOD_PASSWORD })).status).toBe(200)
    expect((await back.get('/api/me')).status).toBe(200)
    expect((await new Client(app.url).get(oldPath)).status).toBe(404)
    const fresh = await back.post('/api/me/calendar')
    expect(fresh.status).toBe(200)
    expect(fresh.body.url).not.toBe(feed.body.url)
    expect((await new Client(app.url).get(new URL(fresh.body.url).pathname)).status).toBe(200)
  })
})

describe('limits are one atomic step (issue 13, case 2)', () => {
  it('100 wrong sign-ins at once for one account: exactly 5 passwords checked, the rest 429 with Retry-After', async () => {
    const { email } = await signUpFirm(app.url, 'Limit Firm')
    const from = '127.0.0.2'
    const res = await together(100, i => sendFrom(from, 'POST', '/api/auth/sign-in', { email, password: `wrong-password-${i}` }))
    const seen = statuses(res)
    expect(seen, JSON.stringify(seen)).toEqual({ 401: 5, 429: 95 })
    for (const r of res.filter(r => r.status === 429)) {
      expect(Number(r.headers.get('retry-after'))).toBeGreaterThan(0)
      expect(r.body.data.message).toMatch(/Try again in/)
    }
    expect(await limitHits(`sign-in:${email}:${from}`)).toBeLessThanOrEqual(5)
    // the right password is refused too until the window passes (it is counted before it is checked)
    expect((await sendFrom(from, 'POST', '/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(429)
    // from another address the account still works
    expect((await sendFrom('127.0.0.3', 'POST', '/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
  })

  it('spraying many accounts from one address is capped at 30 failures in 15 minutes', async () => {
    const from = '127.0.0.4'
    const res = await together(45, i => sendFrom(from, 'POST', '/api/auth/sign-in', { email: uniqueEmail(`spray${i}`), password: 'wet-edge-trowel-41' }))
    const seen = statuses(res)
    expect(seen, JSON.stringify(seen)).toEqual({ 401: 30, 429: 15 })
    expect(await limitHits(`sign-in-address:${from}`)).toBe(30)
    // a real account from that address now waits too
    const { email } = await signUpFirm(app.url, 'Sprayed Firm')
    expect((await sendFrom(from, 'POST', '/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(429)
  })

  it('25 enquiries at once from an address with 2 left: exactly 2 stored, the rest 429 (five rounds, five addresses)', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Form Firm')
    const key = (await owner.get('/api/firm')).body.enquiryFormKey as string
    const form = (i: number) => ({ name: `Pip Walker ${i}`, email: uniqueEmail('pip'), phone: '07700 900456', addressLine1: '3 Tanners Row', town: 'Kettlebury', postcode: 'KB5 3PL', description: 'Two ceilings need overboarding and a skim', preferredDates: 'January', website: '' })
    const seenByRound: Record<number, number>[] = []
    for (const [round, from] of ['127.0.0.5', '127.0.0.15', '127.0.0.25', '127.0.0.35', '127.0.0.45'].entries()) {
      for (let i = 0; i < 3; i++) expect((await sendFrom(from, 'POST', `/api/public/enquiry-forms/${key}`, form(i))).status).toBe(201)
      const res = await together(25, i => sendFrom(from, 'POST', `/api/public/enquiry-forms/${key}`, form(10 + i)))
      seenByRound.push(statuses(res))
      for (const r of res.filter(r => r.status === 429)) expect(Number(r.headers.get('retry-after'))).toBeGreaterThan(59 * 60)
      // stored, read from the database: 5 from each address so far
      expect((await firmRowCounts(firmId)).enquiries, `round ${round}: ${JSON.stringify(seenByRound)}`).toBe(5 * (round + 1))
    }
    expect(seenByRound, JSON.stringify(seenByRound)).toEqual(Array.from({ length: 5 }, () => ({ 201: 2, 429: 23 })))
  })

  it('password checks when accepting an invitation for an existing account are capped like sign-in', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Invite Firm')
    const other = await signUpFirm(app.url, 'Home Firm')
    expect((await owner.post('/api/team/invitations', { email: other.email, role: 'accountant' })).status).toBe(201)
    const token = await invitationToken(app, other.email)
    const from = '127.0.0.6'
    const res = await together(20, i => sendFrom(from, 'POST', `/api/invitations/${token}/accept`, { password: `wrong-password-${i}` }))
    const seen = statuses(res)
    expect(seen, JSON.stringify(seen)).toEqual({ 400: 5, 429: 15 })
    expect(res.filter(r => r.status === 400).every(r => Object.keys(r.body.data.fields).join() === 'password')).toBe(true)
    expect((await sendFrom(from, 'POST', `/api/invitations/${token}/accept`, { password: GOOD_PASSWORD })).status).toBe(429)
    // the invitation is still open: from another address the right password joins
    expect((await sendFrom('127.0.0.7', 'POST', `/api/invitations/${token}/accept`, { password: GOOD_PASSWORD })).status).toBe(200)
  })
})

describe('the last owner cannot vanish (issue 13, case 3)', () => {
  it('two owners demoting or removing each other at once: one always refused, the firm keeps an owner', async () => {
    const first = await signUpFirm(app.url, 'Two Owner Firm')
    let a = first.client
    const { firmId, email: aEmail } = first
    const bEmail = uniqueEmail('second-owner')
    let { client: b } = await inviteAndJoin(app, a, bEmail, 'owner', 'Bea Second')
    const owners = () => ownerDb(async (db) => {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      const { rows } = await db.query(`select count(*)::int as n from memberships where firm_id = $1 and role = 'owner'`, [firmId])
      await db.query('rollback')
      return rows[0].n as number
    })
    const refused: number[] = []
    for (let round = 0; round < 12; round++) {
      const people = (await a.get('/api/team')).body.people as { id: string, email: string, role: string }[]
      const aId = people.find(p => p.email !== bEmail)!.id
      const bId = people.find(p => p.email === bEmail)!.id
      const removing = round % 3 === 2
      const act = (who: Client, target: string) => removing ? who.delete(`/api/team/${target}`) : who.patch(`/api/team/${target}`, { role: 'office' })
      // each round the other owner's request is sent first
      const acts = [() => act(a, bId), () => act(b, aId)]
      if (round % 2) acts.reverse()
      const sent = await together(2, i => acts[i]!())
      const [ra, rb] = round % 2 ? [sent[1], sent[0]] : [sent[0], sent[1]]
      const pair = [ra!, rb!]
      const done = pair.filter(r => r.status === 200 || r.status === 204)
      // refused: 409 (the last owner), or 403 when the loser was demoted first, or 401 when the loser
      // was removed first (their session ended with their membership) — on a busy machine either
      // can come first
      const no = pair.filter(r => r.status === 409 || r.status === 403 || (removing && r.status === 401))
      expect(await owners(), `round ${round}: ${pair.map(r => r.status)}`).toBeGreaterThanOrEqual(1)
      expect(done.length, `round ${round}: ${pair.map(r => r.status)}`).toBe(1)
      expect(no.length).toBe(1)
      if (no[0]!.status === 409) expect(no[0]!.body.data.message).toMatch(/at least one owner/)
      refused.push(no[0]!.status)
      // put things back: whoever is still an owner makes the other an owner again
      const aWon = done[0] === ra
      const winner = aWon ? a : b
      const loserEmail = aWon ? bEmail : aEmail
      const now = (await winner.get('/api/team')).body.people as { id: string, email: string }[]
      if (removing) {
        const loser = loserEmail
        const before = app.mails.length
        expect((await winner.post('/api/team/invitations', { email: loser, role: 'owner' })).status).toBe(201)
        const mail = await latestMail(loser, /invited you/, before)
        const token = /\/invite\/([\w-]+)/.exec(mail.text ?? '')![1]!
        const back = new Client(app.url)
        expect((await back.post(`/api/invitations/${token}/accept`, { password: GOOD_PASSWORD })).status).toBe(200)
        if (aWon) b = back
        else a = back
      }
      else {
        const loser = now.find(p => p.email === loserEmail)!
        expect((await winner.patch(`/api/team/${loser.id}`, { role: 'owner' })).status).toBe(200)
      }
      expect(await owners()).toBe(2)
    }
    console.log(`[owners] refused answers over 12 rounds: ${JSON.stringify(statuses(refused.map(status => ({ status }) as ApiResponse)))}`)
  })
})

describe('sign-up tells no one which e-mails have accounts (issue 13, case 11)', () => {
  const body = (email: string) => ({ firmName: 'Quiet Walls', name: 'Ada Quill', email, password: GOOD_PASSWORD })

  it('answers a new and an existing address alike, with no session; mails each the right thing', async () => {
    const existing = await signUpFirm(app.url, 'Already Here')
    const fresh = uniqueEmail('fresh')
    const a = new Client(app.url)
    const b = new Client(app.url)
    const ra = await a.post('/api/auth/sign-up', body(fresh))
    const rb = await b.post('/api/auth/sign-up', body(existing.email))
    expect(ra.status).toBe(202)
    expect(rb.status).toBe(ra.status)
    expect(JSON.stringify(rb.body)).toBe(JSON.stringify(ra.body))
    expect(ra.headers.get('set-cookie')).toBeNull()
    expect(rb.headers.get('set-cookie')).toBeNull()
    expect((await a.get('/api/me')).status).toBe(401)
    const warning = await app.waitForMail(existing.email, /sign up/i)
    expect(warning.text).toMatch(/already has a Setwell account/)
    expect(warning.text).toMatch(/\/sign-in/)
    const welcome = await app.waitForMail(fresh, /Confirm/)
    expect(welcome.text).toMatch(/\/sign-up\/[\w-]{40,}/)
  })

  it('a confirmation link works once; an expired one is 404; many at once make one firm', async () => {
    const email = uniqueEmail('confirm')
    expect((await new Client(app.url).post('/api/auth/sign-up', body(email))).status).toBe(202)
    const token = /\/sign-up\/([\w-]+)/.exec((await app.waitForMail(email, /Confirm/)).text ?? '')![1]!
    const res = await together(10, () => new Client(app.url).post(`/api/auth/sign-up/${token}`))
    expect(statuses(res)).toEqual({ 200: 1, 404: 9 })
    const users = await ownerDb(async db => (await db.query('select count(*)::int as n from users where lower(email) = $1', [email])).rows[0].n)
    expect(users).toBe(1)
    expect((await new Client(app.url).post(`/api/auth/sign-up/${token}`)).status).toBe(404)

    const late = uniqueEmail('late')
    expect((await new Client(app.url).post('/api/auth/sign-up', body(late))).status).toBe(202)
    const lateToken = /\/sign-up\/([\w-]+)/.exec((await app.waitForMail(late, /Confirm/)).text ?? '')![1]!
    await ownerDb(db => db.query(`update pending_sign_ups set expires_at = now() - interval '1 minute' where lower(email) = $1`, [late]))
    const expired = await new Client(app.url).post(`/api/auth/sign-up/${lateToken}`)
    expect(expired.status).toBe(404)
    expect(JSON.stringify(expired.body)).not.toMatch(/Quiet Walls|Ada Quill/)
  })
})

describe('the cross-site guard compares the whole origin', () => {
  it('refuses another port and another scheme on the same host; accepts our own origin', async () => {
    const port = Number(new URL(app.url).port)
    const body = { email: uniqueEmail('origin'), password: 'wet-edge-trowel-40' }
    for (const origin of [`http://127.0.0.1:${port + 1}`, `https://127.0.0.1:${port}`, `http://localhost:${port}`]) {
      const res = await new Client(app.url).post('/api/auth/sign-in', body, { origin })
      expect(res.status, origin).toBe(403)
    }
    expect((await new Client(app.url).post('/api/auth/sign-in', body, { origin: app.url })).status).toBe(401)
  })
})

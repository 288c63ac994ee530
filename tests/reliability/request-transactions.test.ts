import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from '../api/support'
import { ownerDb } from './support'
import { statuses, together } from './race'

// One transaction a request (issue 19): a GET's session check leaves its transaction open, scoped
// to the firm, for the route's work to carry on (server/utils/db.ts RequestTx); whatever the
// route does instead (refuses the role, fails on its query, answers with nothing from the firm),
// the transaction is ended and the connection given back. Many requests at once, more than the
// pool's ten connections, then the database: no request's transaction is left open, and a person
// removed while their requests were in flight has every session ended.

let app: TestApp

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
})
afterAll(async () => {
  await app?.stop()
})

/** Transactions of the server's role left open and idle, once what is in flight has ended (read a few times: an ending may still be on its way). */
async function idleInTransaction() {
  let n = -1
  for (let i = 0; i < 50 && n !== 0; i++) {
    if (i) await new Promise(r => setTimeout(r, 100))
    n = await ownerDb(async db => Number((await db.query(`select count(*) as n from pg_stat_activity where usename = 'setwell_app' and state like 'idle in transaction%'`)).rows[0].n))
  }
  return n
}

describe('one transaction a request', () => {
  it('ends every GET\'s transaction, whatever the route does, with 60 at once on ten connections', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Open Ends Plastering')
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew', 'Perrin Slate')
    const signedOut = new Client(app.url)
    const calls: [Client, string, number][] = [
      [owner, '/api/customers?pageSize=5', 200],
      [owner, '/api/invoices', 200],
      [owner, '/api/owed', 200],
      [owner, '/api/today', 200],
      [owner, '/api/me', 200],
      // refused after the check, before any work
      [crew, '/api/invoices', 403],
      // refused by the query's own check, inside the route
      [owner, '/api/customers?pageSize=0', 400],
      // a malformed id: 404 before the work
      [owner, '/api/invoices/not-an-id', 404],
      [signedOut, '/api/today', 401],
      // a page rendered on the server: its API calls share one check
      [owner, '/invoices', 200],
    ]
    const answers = await together(60, i => calls[i % calls.length]![0].get(calls[i % calls.length]![1]))
    const wrong = answers.flatMap((a, i) => (a.status === calls[i % calls.length]![2] ? [] : [`${calls[i % calls.length]![1]}: ${a.status}`]))
    expect(wrong).toEqual([])
    expect(await idleInTransaction()).toBe(0)
  })

  it('signs out on their next request a person removed while 30 of their requests are in flight, and leaves nothing open', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Removed Midway Plastering')
    const { client: office } = await inviteAndJoin(app, owner, uniqueEmail('office'), 'office', 'Maren Tull')
    const me = (await office.get('/api/me')).body
    const team = (await owner.get('/api/team')).body
    const membership = team.people.find((m: { userId: string }) => m.userId === me.user.id)
    expect(membership, JSON.stringify(team)).toBeTruthy()
    const answers = await together(31, i => (i === 15 ? owner.delete(`/api/team/${membership.id}`) : office.get(i % 2 ? '/api/customers' : '/api/today')))
    const removal = answers[15]!
    expect([200, 204]).toContain(removal.status)
    // before the removal landed: 200; after: 401 (and the session ended)
    const got = statuses(answers.filter((_, i) => i !== 15))
    expect(Object.keys(got).filter(s => s !== '200' && s !== '401')).toEqual([])
    expect((await office.get('/api/today')).status).toBe(401)
    const open = await ownerDb(async db => (await db.query(`select count(*)::int as n from sessions where user_id = $1 and revoked_at is null and expires_at > now()`, [me.user.id])).rows[0].n)
    expect(open).toBe(0)
    expect(await idleInTransaction()).toBe(0)
  })
})

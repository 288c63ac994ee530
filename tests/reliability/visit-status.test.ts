import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { type Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { statuses, together } from './race'

// A visit's status under requests that arrive together (issue 15, part 3), each case released
// behind one gate and then read from the database:
// - "done" and "cancel" sent at once on one visit: exactly one of them happens (one audit entry,
//   the row either done with its time or cancelled with its reason, never a mix); the losers of
//   the other kind get 409, repeats of the winner's kind a 200 that changed nothing;
// - two visits of one enquiry cancelled at once: the enquiry goes back to "new" (the second
//   cancel sees the first), not left at "visit booked" with nothing booked.

const AT_ONCE = 10
const ROUNDS = 6
let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Visit Race Plastering'))
})
afterAll(async () => {
  await app?.stop()
})

const db = <T = Record<string, any>>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
const show = (r: { status: number, body: unknown }) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 300)}`
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString()

async function enquiryWithVisits(n: number) {
  const c = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Vell', email: uniqueEmail('tamsin') }, site: { line1: '2 Cinder Path', town: 'Kettlebury', postcode: 'KB7 2CP' } })
  expect(c.status, show(c)).toBe(201)
  const e = await owner.post('/api/enquiries', { customerId: c.body.id, siteId: c.body.sites[0].id, source: 'phone', description: 'Skim the kitchen ceiling' })
  expect(e.status, show(e)).toBe(201)
  const visitIds: string[] = []
  for (let i = 0; i < n; i++) {
    const v = await owner.post('/api/visits', { customerId: c.body.id, siteId: c.body.sites[0].id, enquiryId: e.body.id, startsAt: inDays(3 + i) })
    expect(v.status, show(v)).toBe(201)
    visitIds.push(v.body.id)
  }
  return { enquiryId: e.body.id as string, visitIds }
}

describe('a visit marked done and cancelled at once', () => {
  it('ends done or cancelled, once, never both', async () => {
    const seen: Record<string, number> = {}
    for (let round = 0; round < ROUNDS; round++) {
      const { enquiryId, visitIds: [visitId] } = await enquiryWithVisits(1)
      const answers = await together(AT_ONCE, i => i % 2
        ? owner.post(`/api/visits/${visitId}/cancel`, { reason: `Customer rang off, ${i}` })
        : owner.post(`/api/visits/${visitId}/done`, { at: new Date(Date.now() - 60_000).toISOString(), clientId: randomUUID() }))
      const tally = statuses(answers)
      for (const [k, n] of Object.entries(tally)) seen[k] = (seen[k] ?? 0) + n

      const [row] = await db(`select status, done_at, cancel_reason from visits where id = $1`, [visitId])
      const audit = await db(`select action from audit_log where entity = 'visit' and entity_id = $1 and action in ('visit.done', 'visit.cancelled')`, [visitId])
      const [enquiry] = await db(`select status from enquiries where id = $1`, [enquiryId])
      const backToNew = await db(`select 1 from enquiry_events where enquiry_id = $1 and from_status = 'visit-booked' and to_status = 'new'`, [enquiryId])

      expect(audit, `round ${round}: ${answers.map(show).join('\n')}`).toHaveLength(1)
      expect(['done', 'cancelled']).toContain(row!.status)
      if (row!.status === 'done') {
        expect(row!.done_at).not.toBeNull()
        expect(row!.cancel_reason).toBe('')
        expect(audit[0]!.action).toBe('visit.done')
        expect(enquiry!.status).toBe('visit-booked')
        expect(backToNew).toHaveLength(0)
      }
      else {
        expect(row!.done_at).toBeNull()
        expect(row!.cancel_reason).toMatch(/^Customer rang off, \d+$/)
        expect(audit[0]!.action).toBe('visit.cancelled')
        expect(enquiry!.status).toBe('new')
        expect(backToNew).toHaveLength(1)
      }
      // every 200 says what the row now is; the other kind was refused
      for (const a of answers) {
        if (a.status === 200) expect(a.body.status, show(a)).toBe(row!.status)
        else expect(a.status, show(a)).toBe(409)
      }
      expect(tally[200]! + (tally[409] ?? 0)).toBe(AT_ONCE)
    }
    console.info(`[visit-race] ${ROUNDS} rounds of ${AT_ONCE} at once (half done, half cancel): ${JSON.stringify(seen)}`)
  })
})

describe('the visits of one enquiry cancelled at once', () => {
  it('puts the enquiry back to new when none is left booked', async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const { enquiryId, visitIds } = await enquiryWithVisits(2)
      const answers = await together(visitIds.length * 3, i => owner.post(`/api/visits/${visitIds[i % visitIds.length]}/cancel`, { reason: 'Customer is selling the house' }))
      expect(statuses(answers), answers.map(show).join('\n')).toEqual({ 200: visitIds.length * 3 })
      const [enquiry] = await db(`select status from enquiries where id = $1`, [enquiryId])
      const moves = await db(`select from_status, to_status from enquiry_events where enquiry_id = $1 order by at, to_status`, [enquiryId])
      expect(enquiry!.status, `round ${round}: ${JSON.stringify(moves)}`).toBe('new')
      expect(moves.filter(m => m.from_status === 'visit-booked')).toEqual([{ from_status: 'visit-booked', to_status: 'new' }])
      const audit = await db(`select count(*)::int as n from audit_log where action = 'visit.cancelled' and entity_id = any($1::text[])`, [visitIds])
      expect(audit[0]!.n).toBe(visitIds.length)
    }
  })
})

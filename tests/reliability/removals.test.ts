import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type ApiResponse, type Client } from '../support/client'
import { queryAsFirm } from '../support/db'
import { together } from './race'

// Removing a customer or a site while someone records work for it (issue 13, item 9). Each round
// releases, together, the removal and requests that name the customer (enquiries, a job, an
// invoice). Whatever the order the database takes them in: never a 5xx; either the customer stays
// (the removal answered 409) with every piece of work that was acknowledged, or the customer and
// their work are gone (204) and no request that names them was acknowledged; and nothing
// acknowledged is lost (the enquiries cascade with the customer, so a removal that counted before
// an enquiry landed would take the enquiry with it).

const ROUNDS = 40

let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Race Removals Firm'))
})
afterAll(async () => {
  await app?.stop()
})

const db = <T>(text: string, values: unknown[]) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
const short = (r: ApiResponse) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 200)}`

async function customer(i: number) {
  const res = await owner.post('/api/customers', {
    customer: { kind: 'homeowner', name: `Racing Customer ${i}`, email: uniqueEmail('race') },
    site: { line1: `${i} Hurry Lane`, town: 'Kettlebury', postcode: 'KB7 7RR' },
  })
  expect(res.status, short(res)).toBe(201)
  return res.body as { id: string, sites: { id: string }[] }
}

/** Every request built first, then all released at once. */
const togetherAll = (requests: (() => Promise<ApiResponse>)[]) => together(requests.length, i => requests[i]!())

describe('removing a customer while work is recorded for them', () => {
  it(`never answers 5xx and never loses acknowledged work, over ${ROUNDS} rounds`, async () => {
    const wrong: string[] = []
    const outcomes = { kept: 0, removed: 0 }
    for (let round = 0; round < ROUNDS; round++) {
      const c = await customer(round)
      const siteId = c.sites[0]!.id
      const [removal, ...creations] = await togetherAll([
        () => owner.delete(`/api/customers/${c.id}`),
        () => owner.post('/api/enquiries', { customerId: c.id, siteId, source: 'phone', description: `Round ${round}: skim the hall` }),
        () => owner.post('/api/enquiries', { customerId: c.id, source: 'message', description: `Round ${round}: patch a ceiling` }),
        () => owner.post('/api/jobs', { customerId: c.id, siteId, title: `Round ${round}: skim the landing` }),
        () => owner.post('/api/invoices', { kind: 'blank', customerId: c.id }),
      ])
      const all = [removal!, ...creations]
      for (const r of all) if (r.status >= 500) wrong.push(`round ${round}: ${short(r)}`)

      const [row] = await db<{ n: number }>('select count(*)::int as n from customers where id = $1', [c.id])
      const exists = row!.n === 1
      const acknowledged = creations.filter(r => r.status === 201).map(r => r.body.id as string)
      const [held] = await db<{ n: number }>(
        `select ((select count(*) from enquiries where customer_id = $1) + (select count(*) from jobs where customer_id = $1)
               + (select count(*) from invoices where customer_id = $1))::int as n`,
        [c.id],
      )
      const found = await db<{ id: string }>(
        'select id from enquiries where id = any($1::uuid[]) union all select id from jobs where id = any($1::uuid[]) union all select id from invoices where id = any($1::uuid[])',
        [acknowledged],
      )
      if (removal!.status === 204) {
        outcomes.removed++
        if (exists) wrong.push(`round ${round}: removal answered 204 but the customer is there`)
        if (acknowledged.length) wrong.push(`round ${round}: removal answered 204 after ${acknowledged.length} request(s) naming the customer were acknowledged (${found.length} of them still in the database)`)
      }
      else if (removal!.status === 409) {
        outcomes.kept++
        if (!exists) wrong.push(`round ${round}: removal answered 409 but the customer is gone`)
        if (!/\d+ (enquir|job|invoice)/.test(removal!.body?.data?.message ?? '')) wrong.push(`round ${round}: 409 without saying what holds the customer: ${short(removal!)}`)
      }
      else if (removal!.status < 500) {
        wrong.push(`round ${round}: removal answered ${short(removal!)}`)
      }
      if (found.length !== acknowledged.length) wrong.push(`round ${round}: ${acknowledged.length} acknowledged, ${found.length} in the database`)
      if (exists && held!.n !== acknowledged.length) wrong.push(`round ${round}: the customer has ${held!.n} pieces of work, ${acknowledged.length} were acknowledged`)
      if (!exists && held!.n !== 0) wrong.push(`round ${round}: the customer is gone but ${held!.n} pieces of work name them`)
    }
    console.info(`[removals] ${ROUNDS} rounds of 1 removal and 4 creations at once: customer kept ${outcomes.kept}, removed ${outcomes.removed}; ${wrong.length} wrong`)
    expect(wrong).toEqual([])
  })

  it(`removing a site while a job is booked at it: never a 5xx, over ${ROUNDS} rounds`, async () => {
    const wrong: string[] = []
    for (let round = 0; round < ROUNDS; round++) {
      const c = await customer(1000 + round)
      const spare = await owner.post(`/api/customers/${c.id}/sites`, { line1: `${round} Spare Row`, town: 'Kettlebury', postcode: 'KB7 7SS' })
      expect(spare.status, short(spare)).toBe(201)
      const siteId = spare.body.id as string
      const [removal, job] = await togetherAll([
        () => owner.delete(`/api/sites/${siteId}`),
        () => owner.post('/api/jobs', { customerId: c.id, siteId, title: `Round ${round}: skim the box room` }),
      ])
      for (const r of [removal!, job!]) if (r.status >= 500) wrong.push(`round ${round}: ${short(r)}`)
      const [row] = await db<{ n: number }>('select count(*)::int as n from sites where id = $1', [siteId])
      if (removal!.status === 204 && row!.n !== 0) wrong.push(`round ${round}: 204 but the site is there`)
      if (job!.status === 201 && row!.n !== 1) wrong.push(`round ${round}: job acknowledged at a site that is gone`)
      if (removal!.status === 204 && job!.status === 201) wrong.push(`round ${round}: both the removal and the job were acknowledged`)
    }
    expect(wrong).toEqual([])
  })
})

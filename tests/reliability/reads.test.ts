import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from '../api/support'
import { changedCounts, listRoutes, snapshot } from './support'

// A read writes nothing (issue 13): the defaults a firm works from (price book, materials,
// reminder schedule, Bank Rate table) are made with the firm, not on the first GET, so the
// accountant opening a screen leaves no row and no audit entry behind.

let app: TestApp

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
})
afterAll(async () => {
  await app?.stop()
})

describe('reads', () => {
  it('a new firm has its defaults from the start, and no GET by any role writes a row', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Quiet Reads Plastering')
    const made = await snapshot([firmId])
    expect(made['firm0:price_books']).toBe(1)
    expect(made['firm0:materials']).toBeGreaterThan(3)
    expect(made['firm0:reminder_rules']).toBeGreaterThan(0)
    // the Bank Rate history back to 2009, so any claim's reference day has a rate
    expect(made['firm0:bank_rates']).toBeGreaterThan(20)

    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')
    const { client: office } = await inviteAndJoin(app, owner, uniqueEmail('office'), 'office')
    const gets = listRoutes().filter(r => r.method === 'GET' && r.pattern.startsWith('/api/') && !r.params.length)
    expect(gets.map(r => r.pattern)).toEqual(expect.arrayContaining(['/api/price-book', '/api/reminders', '/api/bank-rates', '/api/materials']))
    const before = await snapshot([firmId])
    const wrong: string[] = []
    for (const who of [accountant, office, owner]) {
      for (const r of gets) {
        const res = await who.get(r.pattern)
        if (res.status >= 500) wrong.push(`${r.pattern}: ${res.status}`)
      }
    }
    expect(wrong).toEqual([])
    expect(changedCounts(before, await snapshot([firmId])), 'rows written by GETs').toEqual([])
  })
})

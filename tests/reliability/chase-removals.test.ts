import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import type { ApiResponse, Client } from '../support/client'
import { queryAsFirm } from '../support/db'
import { together, statuses } from './race'
import { makeFirm, type Firm } from './support'

// Removing an entry of an invoice's chase log under requests released at once (issue 18, part 2):
// the entry is read FOR UPDATE, so one removal takes it and writes the audit log, and every other
// finds it gone (404) and writes nothing. Each round reads the database as the owner role.

const AT_ONCE = 10
const ROUNDS = 3

let app: TestApp
let f: Firm

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  f = await makeFirm(app, 'Racing Chase Log Plastering', { team: true })
})
afterAll(async () => {
  await app?.stop()
})

const db = <T>(text: string, values: unknown[]) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), f.firmId, text, values)
const short = (r: ApiResponse) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 300)}`
const invoiceId = () => f.ids.issuedInvoiceId!

async function write(who: Client, note: string) {
  const res = await who.post(`/api/invoices/${invoiceId()}/chase-notes`, { kind: 'call', outcome: 'no-reply', note })
  expect(res.status, short(res)).toBe(201)
  return res.body.chase.find((c: { note: string }) => c.note === note).id as string
}

async function stored(noteId: string) {
  const rows = await db<{ n: number }>('select count(*)::int as n from chase_notes where firm_id = $1 and id = $2', [f.firmId, noteId])
  const audit = await db<{ action: string, actor: string }>(`select action, actor_user_id as actor from audit_log where firm_id = $1 and entity = 'chase_note' and entity_id = $2`, [f.firmId, noteId])
  return { rows: rows[0]!.n, audit }
}

describe('removals of one chase entry at once', () => {
  it(`${AT_ONCE} removals by the owner at once: one removes it (204), the rest find it gone (404), one audit row`, async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const noteId = await write(f.owner.client, `owner's call ${round}`)
      const answers = await together(AT_ONCE, () => f.owner.client.request('DELETE', `/api/invoices/${invoiceId()}/chase-notes/${noteId}`))
      for (const a of answers) expect([204, 404], short(a)).toContain(a.status)
      expect(statuses(answers), JSON.stringify(statuses(answers))).toEqual({ 204: 1, 404: AT_ONCE - 1 })
      const after = await stored(noteId)
      expect(after.rows).toBe(0)
      expect(after.audit).toEqual([{ action: 'invoice.chase-removed', actor: f.owner.userId }])
    }
  })

  it(`its writer (the office, that day) and the owner removing it at once, ${AT_ONCE} in all: one removal, one audit row`, async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const noteId = await write(f.office!.client, `office's call ${round}`)
      const answers = await together(AT_ONCE, i => (i % 2 ? f.owner : f.office!).client.request('DELETE', `/api/invoices/${invoiceId()}/chase-notes/${noteId}`))
      for (const a of answers) expect([204, 404], short(a)).toContain(a.status)
      expect(statuses(answers)[204], JSON.stringify(statuses(answers))).toBe(1)
      const after = await stored(noteId)
      expect(after.rows).toBe(0)
      expect(after.audit).toHaveLength(1)
      expect([f.owner.userId, f.office!.userId]).toContain(after.audit[0]!.actor)
    }
  })
})

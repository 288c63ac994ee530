import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import type { ApiResponse } from '../support/client'
import { queryAsFirm } from '../support/db'
import { together, statuses } from './race'
import { makeFirm, YESTERDAY, type Firm } from './support'

// The set log under requests released at once (issue 15, part 2). A phone resending one entry
// (its answer lost, or its offline queue sending again) stores it once; corrections and removals
// of one entry racing each other leave one consistent result. Each round reads the database.

const AT_ONCE = 12
const ROUNDS = 5

let app: TestApp
let f: Firm

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  f = await makeFirm(app, 'Racing Set Log Plastering')
})
afterAll(async () => {
  await app?.stop()
})

const db = <T>(text: string, values: unknown[]) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), f.firmId, text, values)
const short = (r: ApiResponse) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 300)}`
const setBody = (packsX1000: number, notes: string) => ({
  kind: 'set', setNumber: 1, coat: 'first', surfaceIds: [f.ids.surfaceId], startedAt: `${YESTERDAY}T08:00:00.000Z`, endedAt: `${YESTERDAY}T10:00:00.000Z`,
  notes, materials: [{ materialId: f.ids.materialId, packsX1000 }],
})

describe('one entry per phone-made id', () => {
  it(`${AT_ONCE} sends of one entry at once store it once, and every send is answered with it`, async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const clientId = randomUUID()
      const body = { ...setBody(1500 + round, `resent ${round}`), clientId }
      const answers = await together(AT_ONCE, () => f.owner.client.post(`/api/jobs/${f.ids.jobId}/logs`, body))
      for (const a of answers) expect([200, 201], short(a)).toContain(a.status)
      expect(statuses(answers)[201], JSON.stringify(statuses(answers))).toBe(1)
      const logIds = new Set(answers.map(a => a.body.logId))
      expect(logIds.size).toBe(1)
      const [logId] = [...logIds]
      const logs = await db<{ id: string }>('select id from set_logs where firm_id = $1 and client_id = $2', [f.firmId, clientId])
      expect(logs.map(l => l.id)).toEqual([logId])
      const uses = await db<{ packs: number }>('select packs_x_1000 as packs from material_uses where firm_id = $1 and log_id = $2', [f.firmId, logId])
      expect(uses).toEqual([{ packs: 1500 + round }])
      // every answer is the job with that entry in it
      for (const a of answers) expect(a.body.logs.filter((l: { notes: string }) => l.notes === `resent ${round}`)).toHaveLength(1)
    }
  })
})

describe('corrections and removals of one entry at once', () => {
  async function entry(n: number) {
    const made = await f.owner.client.post(`/api/jobs/${f.ids.jobId}/logs`, setBody(1000, `entry ${n}`))
    expect(made.status, short(made)).toBe(201)
    return made.body.logId as string
  }
  const usesOf = (logId: string) => db<{ packs: number }>('select packs_x_1000 as packs from material_uses where firm_id = $1 and log_id = $2', [f.firmId, logId])

  it(`${AT_ONCE} corrections at once leave the entry with exactly one set of bags mixed`, async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const logId = await entry(round)
      const answers = await together(AT_ONCE, i => f.owner.client.patch(`/api/jobs/${f.ids.jobId}/logs/${logId}`, setBody(2000 + i, `corrected ${i}`)))
      for (const a of answers) expect(a.status, short(a)).toBe(200)
      const uses = await usesOf(logId)
      expect(uses, `round ${round}`).toHaveLength(1)
      // the bags and the notes are those of one and the same correction
      const [row] = await db<{ notes: string }>('select notes from set_logs where firm_id = $1 and id = $2', [f.firmId, logId])
      expect(row!.notes).toBe(`corrected ${uses[0]!.packs - 2000}`)
      // the audit log holds one chain: each correction was made to what the one before left, so no
      // state was corrected twice (every "before" differs), and the last "after" is what is stored
      const audit = await db<{ detail: { before: { notes: string }, after: { notes: string } } }>(`select detail from audit_log where firm_id = $1 and action = 'job.log-corrected' and entity_id = $2`, [f.firmId, logId])
      expect(audit).toHaveLength(AT_ONCE)
      const befores = audit.map(a => a.detail.before.notes)
      expect(new Set(befores).size, JSON.stringify(befores)).toBe(AT_ONCE)
      const afters = audit.map(a => a.detail.after.notes)
      expect(afters.filter(n => !befores.includes(n))).toEqual([row!.notes])
    }
  })

  it('corrections and removals at once: the entry is gone with its bags, or there with one set of them', async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const logId = await entry(100 + round)
      const answers = await together(AT_ONCE, i => (i % 3 === 1
        ? f.owner.client.delete(`/api/jobs/${f.ids.jobId}/logs/${logId}`)
        : f.owner.client.patch(`/api/jobs/${f.ids.jobId}/logs/${logId}`, setBody(3000 + i, `raced ${i}`))))
      const seen = statuses(answers)
      expect(Object.keys(seen).every(s => ['200', '204', '404', '409'].includes(s)), JSON.stringify(seen)).toBe(true)
      expect(seen[204], JSON.stringify(seen)).toBe(1)
      const logs = await db('select id from set_logs where firm_id = $1 and id = $2', [f.firmId, logId])
      const uses = await usesOf(logId)
      expect(logs).toHaveLength(0)
      expect(uses).toHaveLength(0)
      // the removal is in the audit log once, with what was removed
      const audit = await db<{ detail: { removed: { materials: unknown[] } } }>(`select detail from audit_log where firm_id = $1 and action = 'job.log-removed' and entity_id = $2`, [f.firmId, logId])
      expect(audit).toHaveLength(1)
      expect(audit[0]!.detail.removed.materials).toHaveLength(1)
    }
  })
})

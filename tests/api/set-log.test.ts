import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type Client } from '../support/client'
import { queryAsFirm } from '../support/db'
import { setProgress } from '../../shared/utils/set-log'
import { inviteAndJoin } from './support'

// The set log from the plan (issue 15, part 2): the plan's tasks ticked and checked against the
// set, times not still to come, a phone's resend stored once, and corrections and removals by the
// person who logged the entry (that London day) or the owner, each in the audit log, with the
// materials used following.

let app: TestApp
let owner: Client
let firmId: string
let crew: Client
let crewId: string
let crew2: Client
let office: Client
let accountant: Client
let otherFirm: Client

const db = <T = any>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
const ago = (hours: number) => new Date(Date.now() - hours * 3600_000).toISOString()

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Set Log Firm'))
  const a = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew', 'Kit Crewe')
  crew = a.client
  crewId = (await crew.get('/api/me')).body.user.id
  crew2 = (await inviteAndJoin(app, owner, uniqueEmail('crew2'), 'crew', 'Lou Other')).client
  office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office', 'Ola Office')).client
  accountant = (await inviteAndJoin(app, owner, uniqueEmail('acc'), 'accountant', 'Ari Sums')).client
  ;({ client: otherFirm } = await signUpFirm(app.url, 'Other Set Log Firm'))
})
afterAll(async () => {
  await app?.stop()
})

/** A job planned from a measured room (a patch to fill before its skim), booked for both crew members. */
async function plannedJob() {
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Rowan Pellow', email: uniqueEmail('rp') }, site: { line1: '3 Tanner Row', town: 'Kettlebury', postcode: 'KB2 9LP' } })).body
  const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: ago(48) })).body
  const wallA = crypto.randomUUID()
  const room = await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, {
    revision: 0,
    name: 'Front room',
    surfaces: [
      { id: wallA, kind: 'wall', lengthMm: 4000, secondMm: 2400, conditions: [{ id: crypto.randomUUID(), kind: 'patch-masonry', areaCm2: 5000 }] },
      { id: crypto.randomUUID(), kind: 'wall', lengthMm: 3000, secondMm: 2400 },
      { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 4000, secondMm: 3000 },
    ],
    corners: [],
  })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  const job = await owner.post('/api/jobs', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id, title: 'Skim the front room' })
  expect(job.status, JSON.stringify(job.body)).toBe(201)
  const members = (await owner.get('/api/members')).body
  const day = new Date().toISOString().slice(0, 10)
  const booked = await owner.put(`/api/jobs/${job.body.id}/days`, { days: members.filter((m: any) => m.role === 'crew').map((m: any) => ({ day, userId: m.userId })) })
  expect(booked.status, JSON.stringify(booked.body)).toBe(200)
  const detail = (await owner.get(`/api/jobs/${job.body.id}`)).body
  const finish = (await owner.get('/api/materials')).body.find((m: any) => m.type === 'finish')
  return { id: job.body.id as string, sets: detail.plan.plan.sets as { number: number, tasks: { surfaceId: string, action: 'fill' | 'tight-coat' | 'skim', bags: number }[] }[], finish }
}

const task = (t: { surfaceId: string, action: string }) => ({ surfaceId: t.surfaceId, action: t.action })
const bodyFor = (set: { number: number, tasks: { surfaceId: string, action: string }[] }, extra: Record<string, unknown> = {}) => ({
  kind: 'set', setNumber: set.number, tasks: set.tasks.map(task), surfaceIds: [...new Set(set.tasks.map(t => t.surfaceId))],
  coat: set.tasks.some(t => t.action === 'skim') ? 'second' : 'fill', startedAt: ago(3), endedAt: ago(1), ...extra,
})

describe('logging a set from the plan', () => {
  it('checks the times, the bags and the tasks, each beside its field', async () => {
    const { id, sets, finish } = await plannedJob()
    const [set1, set2] = sets
    expect(set1!.tasks.length).toBeGreaterThan(0)
    // a finish still to come (an hour ahead, beyond the 5 minutes a phone's clock may be out)
    const later = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { startedAt: ago(1), endedAt: ago(-1) }))
    expect(later.status).toBe(400)
    expect(later.body.data.fields.endedAt).toMatch(/still to come/)
    const both = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { startedAt: ago(-2), endedAt: ago(-3) }))
    expect(Object.keys(both.body.data.fields).sort()).toEqual(['endedAt', 'startedAt'])
    // two minutes ahead: a phone's clock, accepted below with the rest
    // a finish before the start
    const backwards = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { startedAt: ago(1), endedAt: ago(2) }))
    expect(backwards.body.data.fields.endedAt).toBe('The end is before the start.')
    // 150 bags of one material
    const heap = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { materials: [{ materialId: finish.id, packsX1000: 150_000 }] }))
    expect(heap.body.data.fields['materials.0.packsX1000']).toMatch(/Check the figure/)
    // a task of set 2 sent as set 1's, a task on no set, the same task twice, tasks with no set
    if (set2) {
      const wrong = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { tasks: [task(set1!.tasks[0]!), task(set2.tasks[0]!)] }))
      expect(wrong.status).toBe(400)
      expect(wrong.body.data.fields['tasks.1']).toBe('That task is not on set 1 of the plan.')
    }
    const made = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { tasks: [{ surfaceId: crypto.randomUUID(), action: 'skim' }] }))
    expect(made.body.data.fields['tasks.0']).toBe('That task is not on set 1 of the plan.')
    const twice = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { tasks: [task(set1!.tasks[0]!), task(set1!.tasks[0]!)] }))
    expect(twice.body.data.fields.tasks).toBe('Each task once.')
    const noSet = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1!, { setNumber: null }))
    expect(noSet.body.data.fields['tasks.0']).toMatch(/choose the set/)
    expect((await owner.get(`/api/jobs/${id}`)).body.logs).toHaveLength(0)
    expect(await db('select 1 from set_logs where job_id = $1', [id])).toHaveLength(0)

    // set 1 in two parts: its first task now (a finish two minutes ahead is a phone's clock), the rest later
    const [first, ...rest] = set1!.tasks
    const part = await crew.post(`/api/jobs/${id}/logs`, bodyFor({ number: 1, tasks: [first!] }, { endedAt: ago(-2 / 60) }))
    expect(part.status, JSON.stringify(part.body)).toBe(201)
    expect(part.body.logs[0].tasks).toEqual([task(first!)])
    expect(part.body.logId).toBe(part.body.logs[0].id)
    expect(setProgress(set1!, part.body.logs)).toBe(rest.length ? 'partly' : 'done')
    if (rest.length) {
      const done = await crew.post(`/api/jobs/${id}/logs`, bodyFor({ number: 1, tasks: rest }))
      expect(done.status, JSON.stringify(done.body)).toBe(201)
      expect(setProgress(set1!, done.body.logs)).toBe('done')
    }
    const stored = await db<{ tasks: unknown[] }>('select tasks from set_logs where job_id = $1 order by created_at', [id])
    expect(stored.flatMap(r => r.tasks)).toEqual(set1!.tasks.map(task))
  })

  it('stores an entry sent twice with the same phone-made id once, and answers both with it', async () => {
    const { id, sets } = await plannedJob()
    const clientId = crypto.randomUUID()
    const first = await crew.post(`/api/jobs/${id}/logs`, bodyFor(sets[0]!, { clientId }))
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    const again = await crew.post(`/api/jobs/${id}/logs`, bodyFor(sets[0]!, { clientId, notes: 'sent again' }))
    expect(again.status).toBe(200)
    expect(again.body.logId).toBe(first.body.logId)
    expect(again.body.logs).toHaveLength(1)
    expect(await db('select id from set_logs where firm_id = $1 and client_id = $2', [firmId, clientId])).toEqual([{ id: first.body.logId }])
    expect((await crew.post(`/api/jobs/${id}/logs`, bodyFor(sets[0]!, { clientId: 'not-an-id' }))).body.data.fields.clientId).toBeTruthy()
    // the same id on another job: not stored there
    const other = await plannedJob()
    const elsewhere = await crew.post(`/api/jobs/${other.id}/logs`, bodyFor(other.sets[0]!, { clientId }))
    expect(elsewhere.status).toBe(409)
    expect((await owner.get(`/api/jobs/${other.id}`)).body.logs).toHaveLength(0)
  })
})

describe('correcting and removing an entry', () => {
  it('lets the person who logged it change it that day, the owner any time, and nobody else; each change audited, the materials following', async () => {
    const { id, sets, finish } = await plannedJob()
    const set1 = sets[0]!
    const logged = await crew.post(`/api/jobs/${id}/logs`, bodyFor(set1, { materials: [{ materialId: finish.id, packsX1000: 1500 }], notes: 'First go' }))
    expect(logged.status, JSON.stringify(logged.body)).toBe(201)
    const logId = logged.body.logId as string
    const path = `/api/jobs/${id}/logs/${logId}`
    // the job says who may change the entry
    expect((await crew.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(true)
    expect((await crew2.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(false)
    expect((await owner.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(true)
    expect((await office.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(false)

    // the logger, the same day: the bags go from 1.5 to 2, the job's materials used follow
    const fixed = await crew.patch(path, bodyFor(set1, { materials: [{ materialId: finish.id, packsX1000: 2000 }], notes: 'Two bags in the end' }))
    expect(fixed.status, JSON.stringify(fixed.body)).toBe(200)
    expect(fixed.body.logId).toBe(logId)
    expect(fixed.body.logs).toHaveLength(1)
    expect(fixed.body.logs[0]).toMatchObject({ notes: 'Two bags in the end', loggedBy: crewId })
    expect(fixed.body.materials.find((m: any) => m.materialId === finish.id).usedPacksX1000).toBe(2000)
    // same validation as logging it
    const bad = await crew.patch(path, bodyFor(set1, { startedAt: ago(1), endedAt: ago(-1) }))
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.endedAt).toMatch(/still to come/)

    // others: another crew member, the office, the accountant 403 in words; another firm 404; no such entry 404
    for (const who of [crew2, office]) {
      const refused = await who.patch(path, bodyFor(set1))
      expect(refused.status).toBe(403)
      expect(refused.body.data.message).toMatch(/person who logged this entry/)
      expect((await who.delete(path)).status).toBe(403)
    }
    expect((await accountant.patch(path, bodyFor(set1))).status).toBe(403)
    expect((await accountant.delete(path)).status).toBe(403)
    expect((await otherFirm.patch(path, bodyFor(set1))).status).toBe(404)
    expect((await otherFirm.delete(path)).status).toBe(404)
    expect((await crew.patch(`/api/jobs/${id}/logs/${crypto.randomUUID()}`, bodyFor(set1))).status).toBe(404)

    // the next day: logged yesterday (set back in the database), the logger may no longer change it
    await db('update set_logs set created_at = created_at - interval \'1 day\' where id = $1', [logId])
    const late = await crew.patch(path, bodyFor(set1))
    expect(late.status).toBe(403)
    expect(late.body.data.message).toMatch(/ask the owner/)
    expect((await crew.delete(path)).status).toBe(403)
    expect((await crew.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(false)

    // the owner, any time: the material already on the entry keeps its cost per pack as logged, a
    // material new to it takes today's price
    const [{ cost: logCost }] = await db<{ cost: number }>('select cost_pence_per_pack as cost from material_uses where log_id = $1', [logId])
    await db('update materials set cost_pence = cost_pence + 250 where id = $1', [finish.id])
    const other = (await owner.get('/api/materials')).body.find((m: any) => m.id !== finish.id && m.type !== 'finish')
    const byOwner = await owner.patch(path, bodyFor(set1, { materials: [{ materialId: finish.id, packsX1000: 2500 }, { materialId: other.id, packsX1000: 1000 }] }))
    expect(byOwner.status, JSON.stringify(byOwner.body)).toBe(200)
    const costs = byOwner.body.logs[0].materials.map((m: any) => [m.materialId, m.packsX1000, m.costPencePerPack])
    expect(costs).toEqual(expect.arrayContaining([[finish.id, 2500, logCost], [other.id, 1000, other.costPence]]))
    expect(await db('select 1 from material_uses where log_id = $1', [logId])).toHaveLength(2)

    // each change in the audit log, with what it was before and after
    const audit = await db<{ action: string, detail: any }>(`select action, detail from audit_log where entity_id = $1 order by at`, [logId])
    expect(audit.map(a => a.action)).toEqual(['job.log-corrected', 'job.log-corrected'])
    expect(audit[0]!.detail.before).toMatchObject({ notes: 'First go', materials: [{ materialId: finish.id, packsX1000: 1500 }] })
    expect(audit[0]!.detail.after).toMatchObject({ notes: 'Two bags in the end', materials: [{ materialId: finish.id, packsX1000: 2000 }] })
    expect(audit[1]!.detail.after.materials).toHaveLength(2)

    // removed by the owner: gone with its bags, the materials used back to nothing, audited with what was removed
    expect((await owner.delete(path)).status).toBe(204)
    const after = (await owner.get(`/api/jobs/${id}`)).body
    expect(after.logs).toHaveLength(0)
    expect(after.materials.every((m: any) => m.usedPacksX1000 === 0)).toBe(true)
    expect(await db('select 1 from material_uses where log_id = $1', [logId])).toHaveLength(0)
    const removed = await db<{ detail: any }>(`select detail from audit_log where entity_id = $1 and action = 'job.log-removed'`, [logId])
    expect(removed).toHaveLength(1)
    expect(removed[0]!.detail.removed.materials).toHaveLength(2)
    expect((await owner.delete(path)).status).toBe(404)
  })

  it('lets the logger remove their entry the same day, and nobody change one on a closed job', async () => {
    const { id, sets } = await plannedJob()
    const mine = await crew.post(`/api/jobs/${id}/logs`, bodyFor(sets[0]!))
    expect((await crew.delete(`/api/jobs/${id}/logs/${mine.body.logId}`)).status).toBe(204)
    const kept = await crew.post(`/api/jobs/${id}/logs`, bodyFor(sets[0]!))
    expect((await owner.post(`/api/jobs/${id}/status`, { to: 'cancelled', reason: 'Customer moved out' })).status).toBe(200)
    const path = `/api/jobs/${id}/logs/${kept.body.logId}`
    const closed = await owner.patch(path, bodyFor(sets[0]!))
    expect(closed.status).toBe(409)
    expect(closed.body.data.message).toMatch(/cancelled/)
    expect((await owner.delete(path)).status).toBe(409)
    expect((await crew.delete(path)).status).toBe(409)
    expect((await owner.get(`/api/jobs/${id}`)).body.logs[0].canChange).toBe(false)
  })
})

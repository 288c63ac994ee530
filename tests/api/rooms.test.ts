// Rooms measured on a site visit: saved whole with ids the phone made, with a revision so an old
// draft cannot overwrite newer work, and never able to reach into another room or another firm.
// Areas are whole cm² (1 m² = 10,000 cm²). All names, addresses and figures are invented.
import { randomUUID } from 'node:crypto'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp

beforeAll(async () => {
  app = await startApp()
})
afterAll(async () => {
  await app?.stop()
})

/** Run `fn` as the owner role inside one transaction scoped to `firmId` (RLS is forced, even for the owner). */
async function asFirm<T>(firmId: string, fn: (db: pg.Client) => Promise<T>): Promise<T> {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const out = await fn(db)
    await db.query('commit')
    return out
  }
  catch (err) {
    await db.query('rollback')
    throw err
  }
  finally {
    await db.end()
  }
}

/** A customer, their site and a visit there, written straight into the database (the booking screens are another piece of work). */
async function makeVisit(firmId: string, visitorUserId: string | null = null): Promise<string> {
  return asFirm(firmId, async (db) => {
    const c = await db.query(`insert into customers (firm_id, kind, name) values ($1, 'homeowner', 'Orla Penhallow') returning id`, [firmId])
    const s = await db.query(`insert into sites (firm_id, customer_id, line1, town, postcode) values ($1, $2, '7 Flintcombe Lane', 'Kettlebury', 'KB3 8WW') returning id`, [firmId, c.rows[0].id])
    const v = await db.query(
      `insert into visits (firm_id, customer_id, site_id, starts_at, visitor_user_id) values ($1, $2, $3, now() + interval '1 day', $4) returning id`,
      [firmId, c.rows[0].id, s.rows[0].id, visitorUserId],
    )
    return v.rows[0].id as string
  })
}

async function count(firmId: string, table: 'surfaces' | 'openings' | 'conditions' | 'corners' | 'rooms', where = 'true', params: unknown[] = []) {
  return asFirm(firmId, async db => (await db.query(`select count(*)::int as n from ${table} where ${where}`, params)).rows[0].n as number)
}

/**
 * The back bedroom: two walls (one with a window), a ceiling, a patch back to masonry, and the
 * internal corner between the walls.
 *   wall 1   4.00 x 2.40 = 9.60 m², less the window 1.20 x 1.00 = 1.20 m²  -> 8.40 m² =  84,000 cm²
 *   wall 2   3.00 x 2.40                                                   -> 7.20 m² =  72,000 cm²
 *   ceiling  4.00 x 3.00                                                   -> 12.00 m² = 120,000 cm²
 *   walls 15.60 m², ceilings 12.00 m², room 27.60 m² = 276,000 cm²
 */
function backBedroom() {
  const ids = { wall1: randomUUID(), wall2: randomUUID(), ceiling: randomUUID(), window: randomUUID(), patch: randomUUID(), corner: randomUUID() }
  const body = {
    revision: 0,
    name: 'Back bedroom',
    position: 0,
    notes: '',
    surfaces: [
      {
        id: ids.wall1,
        kind: 'wall',
        label: 'Window wall',
        lengthMm: 4000,
        secondMm: 2400,
        background: 'paper-stripped',
        notes: '',
        openings: [{ id: ids.window, kind: 'window', widthMm: 1200, heightMm: 1000 }],
        conditions: [{ id: ids.patch, kind: 'patch-masonry', areaCm2: 5000, lengthMm: null, outOfTrueMm: null, scrimmed: false, notes: 'Blown under the sill' }],
      },
      { id: ids.wall2, kind: 'wall', label: '', lengthMm: 3000, secondMm: 2400, background: 'sound-plaster', notes: '', openings: [], conditions: [] },
      { id: ids.ceiling, kind: 'ceiling', label: '', lengthMm: 4000, secondMm: 3000, background: 'sound-plaster', notes: '', openings: [], conditions: [] },
    ],
    corners: [{ id: ids.corner, surfaceAId: ids.wall1, surfaceBId: ids.wall2, kind: 'internal', lengthMm: 2400, returnWidthMm: null, needsBead: false, packedOut: false }],
  }
  return { ids, body }
}

const roomPath = (visitId: string, roomId: string) => `/api/visits/${visitId}/rooms/${roomId}`

describe('saving a room', () => {
  it('saves a room whole with its running totals, and lists it whole', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Flintcombe Plastering')
    const visitId = await makeVisit(firmId)
    const roomId = randomUUID()
    const { ids, body } = backBedroom()

    const res = await owner.put(roomPath(visitId, roomId), body)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body).toMatchObject({ id: roomId, visitId, name: 'Back bedroom', revision: 1 })
    // 84,000 + 72,000 walls; 120,000 ceiling; 276,000 in all (see backBedroom)
    expect(res.body.totals).toEqual({ wallsCm2: 156_000, ceilingsCm2: 120_000, revealsAndStripsCm2: 0, totalCm2: 276_000 })
    const { revision: _r, ...sent } = body
    expect(res.body).toMatchObject(sent)
    expect(res.body.surfaces.map((s: any) => s.id)).toEqual([ids.wall1, ids.wall2, ids.ceiling])

    const list = await owner.get(`/api/visits/${visitId}/rooms`)
    expect(list.status).toBe(200)
    expect(list.body.rooms).toHaveLength(1)
    expect(list.body.rooms[0]).toEqual(res.body)

    const audit = (await owner.get('/api/audit')).body
    expect(audit.find((a: any) => a.action === 'room.saved' && a.entityId === roomId)).toMatchObject({ detail: { visitId, revision: 1, created: true, totalCm2: 276_000 } })
  })

  it('saves again from the returned revision: a changed length is updated and what was removed is deleted', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const roomId = randomUUID()
    const { ids, body } = backBedroom()
    const first = await owner.put(roomPath(visitId, roomId), body)
    expect(first.status).toBe(200)

    // wall 2 becomes 3.50 x 2.40 = 8.40 m²; the ceiling, the patch and the corner go; a frame gap bridged with scrim is found
    const gap = randomUUID()
    const wall1 = { ...body.surfaces[0]!, conditions: [{ id: gap, kind: 'frame-gap', areaCm2: null, lengthMm: 4400, outOfTrueMm: null, scrimmed: true, notes: '' }] }
    const wall2 = { ...body.surfaces[1]!, lengthMm: 3500 }
    const second = await owner.put(roomPath(visitId, roomId), { ...body, revision: first.body.revision, surfaces: [wall1, wall2], corners: [] })
    expect(second.status, JSON.stringify(second.body)).toBe(200)
    expect(second.body.revision).toBe(2)
    // 84,000 (wall 1, unchanged) + 84,000 (wall 2) = 168,000 cm²; no ceiling
    expect(second.body.totals).toEqual({ wallsCm2: 168_000, ceilingsCm2: 0, revealsAndStripsCm2: 0, totalCm2: 168_000 })
    expect(second.body.surfaces.map((s: any) => [s.id, s.lengthMm])).toEqual([[ids.wall1, 4000], [ids.wall2, 3500]])
    expect(second.body.surfaces[0].openings.map((o: any) => o.id)).toEqual([ids.window])
    expect(second.body.surfaces[0].conditions).toEqual([{ id: gap, kind: 'frame-gap', areaCm2: null, lengthMm: 4400, outOfTrueMm: null, scrimmed: true, notes: '' }])
    expect(second.body.corners).toEqual([])

    // gone from the database, not only from the answer
    expect(await count(firmId, 'surfaces', 'id = $1', [ids.ceiling])).toBe(0)
    expect(await count(firmId, 'conditions', 'id = $1', [ids.patch])).toBe(0)
    expect(await count(firmId, 'corners', 'id = $1', [ids.corner])).toBe(0)
    expect(await count(firmId, 'surfaces', 'room_id = $1', [roomId])).toBe(2)
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms[0]).toEqual(second.body)
  })

  it('refuses a stale revision with 409 and the room as saved, and changes nothing', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const roomId = randomUUID()
    const { body } = backBedroom()
    await owner.put(roomPath(visitId, roomId), body)
    const newer = await owner.put(roomPath(visitId, roomId), { ...body, revision: 1, name: 'Back bedroom (from the van)' })
    expect(newer.status).toBe(200)

    // a phone still holding revision 1
    const stale = await owner.put(roomPath(visitId, roomId), { ...body, revision: 1, name: 'Back bedroom (old phone)' })
    expect(stale.status).toBe(409)
    expect(stale.body.data.message).toMatch(/changed/i)
    expect(stale.body.data.current).toEqual(JSON.parse(JSON.stringify(newer.body)))
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms[0]).toMatchObject({ name: 'Back bedroom (from the van)', revision: 2 })

    // a draft of a room that is not saved (deleted elsewhere) must start again from revision 0
    const gone = await owner.put(roomPath(visitId, randomUUID()), { ...backBedroom().body, revision: 3 })
    expect(gone.status).toBe(409)
    expect(gone.body.data.current).toBeNull()
  })

  it.each([
    ['a length of 0', (b: any) => { b.surfaces[0].lengthMm = 0 }, 'surfaces.0.lengthMm'],
    ['a patch with no area', (b: any) => { b.surfaces[0].conditions[0].areaCm2 = null }, 'surfaces.0.conditions.0.areaCm2'],
    ['a corner to a surface not in the room', (b: any) => { b.corners[0].surfaceBId = randomUUID() }, 'corners.0'],
    ['a missing room name', (b: any) => { b.name = '  ' }, 'name'],
    ['an out of true with no figure', (b: any) => { b.surfaces[1].conditions = [{ id: randomUUID(), kind: 'out-of-true' }] }, 'surfaces.1.conditions.0.outOfTrueMm'],
    // a 5.00 x 2.40 opening (12.00 m²) in a 4.00 x 2.40 wall (9.60 m²)
    ['openings bigger than the wall', (b: any) => { Object.assign(b.surfaces[0].openings[0], { widthMm: 5000, heightMm: 2400 }) }, 'surfaces.0.openings'],
    ['the same opening id twice', (b: any) => { b.surfaces[1].openings = [{ ...b.surfaces[0].openings[0] }] }, 'surfaces.1.openings.0.id'],
  ])('answers 400 naming the field for %s, and saves nothing', async (_what, spoil, path) => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const { body } = backBedroom()
    spoil(body)
    const res = await owner.put(roomPath(visitId, randomUUID()), body)
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(Object.keys(res.body.data.fields)).toContain(path)
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms).toEqual([])
    expect(await count(firmId, 'rooms')).toBe(0)
  })

  it('deletes a room and everything in it; a second delete is 404', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const roomId = randomUUID()
    await owner.put(roomPath(visitId, roomId), backBedroom().body)
    expect((await owner.delete(roomPath(visitId, roomId))).status).toBe(204)
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms).toEqual([])
    expect(await count(firmId, 'surfaces')).toBe(0)
    expect(await count(firmId, 'openings')).toBe(0)
    expect((await owner.delete(roomPath(visitId, roomId))).status).toBe(404)
    expect((await owner.delete(roomPath(visitId, 'not-an-id'))).status).toBe(404)
  })

  it('lists rooms by position', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const landing = randomUUID()
    const kitchen = randomUUID()
    await owner.put(roomPath(visitId, landing), { ...backBedroom().body, name: 'Landing', position: 2 })
    await owner.put(roomPath(visitId, kitchen), { ...backBedroom().body, name: 'Kitchen', position: 1 })
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms.map((r: any) => r.name)).toEqual(['Kitchen', 'Landing'])
  })
})

describe('who may see and change rooms', () => {
  it('answers 401 when signed out', async () => {
    const { firmId } = await signUpFirm(app.url)
    const visitId = await makeVisit(firmId)
    const nobody = new Client(app.url)
    expect((await nobody.get(`/api/visits/${visitId}/rooms`)).status).toBe(401)
    expect((await nobody.put(roomPath(visitId, randomUUID()), backBedroom().body)).status).toBe(401)
    expect((await nobody.delete(roomPath(visitId, randomUUID()))).status).toBe(401)
  })

  it('answers another firm\'s visit exactly as a missing one: 404, and its room is untouched', async () => {
    const a = await signUpFirm(app.url, 'Alder Row Plastering')
    const b = await signUpFirm(app.url, 'Birchgate Render')
    const aVisit = await makeVisit(a.firmId)
    const aRoom = randomUUID()
    const saved = await a.client.put(roomPath(aVisit, aRoom), backBedroom().body)
    expect(saved.status).toBe(200)

    const cross = await b.client.get(`/api/visits/${aVisit}/rooms`)
    const missing = await b.client.get(`/api/visits/${randomUUID()}/rooms`)
    expect(cross.status).toBe(404)
    expect(cross.body).toEqual({ ...missing.body, url: cross.body.url })
    expect((await b.client.put(roomPath(aVisit, aRoom), { ...backBedroom().body, revision: 1, name: 'Taken over' })).status).toBe(404)
    expect((await b.client.delete(roomPath(aVisit, aRoom))).status).toBe(404)
    expect((await a.client.get(`/api/visits/${aVisit}/rooms`)).body.rooms).toEqual([saved.body])
  })

  it('never moves another firm\'s room or surfaces: the same ids make rows of the saving firm only', async () => {
    const a = await signUpFirm(app.url, 'Copperfold Plaster')
    const b = await signUpFirm(app.url, 'Dunmere Walls')
    const aVisit = await makeVisit(a.firmId)
    const bVisit = await makeVisit(b.firmId)
    const roomId = randomUUID()
    const { body } = backBedroom()
    const aSaved = await a.client.put(roomPath(aVisit, roomId), body)
    expect(aSaved.status).toBe(200)

    // firm B somehow holds A's ids and saves them into its own visit. Rows are keyed by
    // (firm_id, id) and B cannot see A's, so this is a room of B's with the same ids, not A's room.
    const bSaved = await b.client.put(roomPath(bVisit, roomId), { ...body, name: 'Front room', surfaces: body.surfaces.map(s => ({ ...s, lengthMm: 1000 })) })
    expect(bSaved.status, JSON.stringify(bSaved.body)).toBe(200)
    expect(bSaved.body).toMatchObject({ visitId: bVisit, revision: 1, name: 'Front room' })

    // A's room, surfaces and revision are exactly as they were
    expect((await a.client.get(`/api/visits/${aVisit}/rooms`)).body.rooms).toEqual([aSaved.body])
    expect(await count(a.firmId, 'surfaces', 'length_mm = 1000')).toBe(0)
    expect(await count(b.firmId, 'surfaces', 'room_id = $1', [roomId])).toBe(3)
  })

  it('within a firm, refuses to move a room to another visit or a surface, opening or corner to another room', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const visit1 = await makeVisit(firmId)
    const visit2 = await makeVisit(firmId)
    const room1 = randomUUID()
    const { ids, body } = backBedroom()
    const saved = await owner.put(roomPath(visit1, room1), body)
    expect(saved.status).toBe(200)

    // the room's id under another visit
    expect((await owner.put(roomPath(visit2, room1), { ...body, revision: 1 })).status).toBe(404)
    expect((await owner.delete(roomPath(visit2, room1))).status).toBe(404)

    // a new room reusing room 1's surface id
    const room2 = randomUUID()
    const stolenSurface = await owner.put(roomPath(visit1, room2), { ...backBedroom().body, name: 'Landing', surfaces: [{ ...backBedroom().body.surfaces[1]!, id: ids.wall2 }], corners: [] })
    expect(stolenSurface.status).toBe(400)
    expect(Object.keys(stolenSurface.body.data.fields)).toEqual(['surfaces.0.id'])

    // ... or its window's id, or its corner's id
    const fresh = backBedroom().body
    fresh.surfaces[0]!.openings[0]!.id = ids.window
    fresh.corners[0]!.id = ids.corner
    const stolenChildren = await owner.put(roomPath(visit1, room2), fresh)
    expect(stolenChildren.status).toBe(400)
    expect(Object.keys(stolenChildren.body.data.fields).sort()).toEqual(['corners.0.id', 'surfaces.0.openings.0.id'])

    // room 1 is untouched, and there is no room 2
    expect((await owner.get(`/api/visits/${visit1}/rooms`)).body.rooms).toEqual([saved.body])
    expect((await owner.get(`/api/visits/${visit2}/rooms`)).body.rooms).toEqual([])
  })

  it('lets crew measure the visits they are down to do, and only those', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew', 'Kit Lorrimer')).client
    const crewUserId = (await crew.get('/api/me')).body.user.id as string
    const theirs = await makeVisit(firmId, crewUserId)
    const notTheirs = await makeVisit(firmId)
    const ownerRoom = randomUUID()
    await owner.put(roomPath(notTheirs, ownerRoom), backBedroom().body)

    expect((await crew.get(`/api/visits/${notTheirs}/rooms`)).status).toBe(404)
    expect((await crew.put(roomPath(notTheirs, randomUUID()), backBedroom().body)).status).toBe(404)
    expect((await crew.put(roomPath(notTheirs, ownerRoom), { ...backBedroom().body, revision: 1 })).status).toBe(404)
    expect((await crew.delete(roomPath(notTheirs, ownerRoom))).status).toBe(404)

    const roomId = randomUUID()
    const saved = await crew.put(roomPath(theirs, roomId), backBedroom().body)
    expect(saved.status, JSON.stringify(saved.body)).toBe(200)
    const listed = await crew.get(`/api/visits/${theirs}/rooms`)
    expect(listed.status).toBe(200)
    expect(listed.body.rooms.map((r: any) => r.id)).toEqual([roomId])
    // and the owner sees what the crew measured
    expect((await owner.get(`/api/visits/${theirs}/rooms`)).body.rooms).toEqual([saved.body])
  })

  it('refuses the accountant any change with 403, before reading the body', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant', 'Priya Test')).client
    const visitId = await makeVisit(firmId)
    const roomId = randomUUID()
    await owner.put(roomPath(visitId, roomId), backBedroom().body)

    expect((await accountant.put(roomPath(visitId, roomId), { ...backBedroom().body, revision: 1 })).status).toBe(403)
    expect((await accountant.put(roomPath(visitId, randomUUID()), { nonsense: true })).status).toBe(403)
    expect((await accountant.delete(roomPath(visitId, roomId))).status).toBe(403)
    expect((await owner.get(`/api/visits/${visitId}/rooms`)).body.rooms[0].revision).toBe(1)

    // Reading follows findVisit (server/utils/visits.ts), which shows a role without
    // jobs:read-all only the visits they are the visitor on, so today the accountant gets 404,
    // the same as on GET /api/visits/:id. The brief expected 200: see the report to the lead.
    expect((await accountant.get(`/api/visits/${visitId}/rooms`)).status).toBe(404)
  })
})

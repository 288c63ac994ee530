// Journey: the demo owner measures a room on a site visit on a phone. The running total follows
// what is typed; a reload before saving loses nothing; the saved room stays after a reload; a
// change saved with no signal waits on the phone and is sent by itself when the signal is back.
// The customer, site and visit are written straight into the database (invented data).
import { randomUUID } from 'node:crypto'
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import pg from 'pg'
import { describe, expect, it } from 'vitest'
import { ASBESTOS_CAUTION } from '../../shared/utils/ledger'
import { requiredEnv } from '../support/app'
import { Client } from '../support/client'
import sharp from 'sharp'
import { expectCleanRun, expectText, expectVisible, phoneKeys, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

function artefacts() {
  const dir = process.env.SETWELL_ARTEFACTS ?? join(process.cwd(), 'tests/artefacts')
  mkdirSync(dir, { recursive: true })
  return dir
}

/** A visit for the demo firm, booked for tomorrow, written as the owner role scoped to the firm (RLS is forced). */
async function demoVisit(appUrl: string) {
  const api = new Client(appUrl)
  const signIn = await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
  expect(signIn.status, JSON.stringify(signIn.body)).toBe(200)
  const firmId = (await api.get('/api/me')).body.firm.id as string

  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const c = await db.query(`insert into customers (firm_id, kind, name) values ($1, 'homeowner', 'Tegan Ashdown') returning id`, [firmId])
    const s = await db.query(`insert into sites (firm_id, customer_id, line1, town, postcode) values ($1, $2, '22 Rookery Close', 'Kettlebury', 'KB5 1RT') returning id`, [firmId, c.rows[0].id])
    const v = await db.query(`insert into visits (firm_id, customer_id, site_id, starts_at) values ($1, $2, $3, now() + interval '1 day') returning id`, [firmId, c.rows[0].id, s.rows[0].id])
    await db.query('commit')
    return { api, visitId: v.rows[0].id as string }
  }
  catch (err) {
    await db.query('rollback')
    throw err
  }
  finally {
    await db.end()
  }
}

describe('measuring a room on a site visit', () => {
  it('records walls, a window, a ceiling and a patch with a running total, keeps it, and sends a change made offline once back online', async () => {
    const { api, visitId } = await demoVisit(e2e.url)
    const savedRooms = async () => (await api.get(`/api/visits/${visitId}/rooms`)).body.rooms as any[]

    const jess = await e2e.open()
    const { page, context } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/visits/${visitId}`)
    await expectText(page.getByTestId('visit-header'), 'Tegan Ashdown')
    await expectText(page.getByRole('main'), 'No rooms measured yet.')

    await page.getByRole('button', { name: 'Add a room' }).click()
    const editor = page.getByTestId('room-editor')
    const total = page.getByTestId('room-total')
    await expectText(total, 'Room 0.00 m²')
    await editor.getByLabel('Room name').fill('Back bedroom')

    // wall 1: 4.00 x 2.40 = 9.60 m²; less a window 1.20 x 1.00 = 1.20 m², 8.40 m²
    const cards = editor.getByTestId('surface-card')
    await editor.getByRole('button', { name: 'Add wall' }).click()
    const wall1 = cards.nth(0)
    await wall1.getByLabel('Length (m)').fill('4.00')
    // saving without the height: the check names the field, beside it, and nothing is sent
    await page.getByRole('button', { name: 'Save room' }).click()
    const height1 = wall1.getByLabel('Height (m)')
    await expectText(wall1.getByRole('alert').filter({ hasText: 'height' }), 'Enter the height in metres.')
    expect(await height1.getAttribute('aria-invalid')).toBe('true')
    expect(await page.evaluate(() => document.activeElement?.getAttribute('name'))).toBe('surfaces.0.secondMm')
    expect(await savedRooms()).toEqual([])
    await height1.fill('2.40')
    await expectText(total, 'Room 9.60 m²')
    await wall1.getByRole('button', { name: /Add an opening/ }).click()
    const window1 = wall1.getByTestId('opening').nth(0)
    await window1.getByLabel('Kind of opening').selectOption('window')
    await window1.getByLabel('Width (m)').fill('1.20')
    await window1.getByLabel('Height (m)').fill('1.00')
    await expectText(total, 'Room 8.40 m²')

    // wall 2: 3.00 x 2.40 = 7.20 m², typed key by key: 8.40 + 7.20 = 15.60 m²
    await editor.getByRole('button', { name: 'Add wall' }).click()
    const wall2 = cards.nth(1)
    await wall2.getByLabel('Length (m)').pressSequentially('3.00')
    await wall2.getByLabel('Height (m)').pressSequentially('2.4')
    await expectText(total, 'Room 15.60 m²')

    // the ceiling: 4.00 x 3.00 = 12.00 m²: 8.40 + 7.20 + 12.00 = 27.60 m²
    await editor.getByRole('button', { name: 'Add ceiling' }).click()
    const ceiling = cards.nth(2)
    await ceiling.getByLabel('Length (m)').fill('4.00')
    await ceiling.getByLabel('Width (m)').fill('3.00')
    await expectText(total, 'Room 27.60 m²')
    await expectText(page.getByTestId('room-split'), 'Walls 15.60 · Ceilings 12.00 · Reveals and strips 0.00')

    // a patch back to masonry of 0.50 m² on the first wall (a finding: the area is unchanged)
    await wall1.getByRole('button', { name: /Add a finding/ }).click()
    const patch = wall1.getByTestId('condition').nth(0)
    await patch.getByLabel('What you found').selectOption('patch-masonry')
    await patch.getByLabel('Area (m²)').fill('0.50')
    // a textured coating on the ceiling brings up the asbestos caution
    await ceiling.getByRole('button', { name: /Add a finding/ }).click()
    await ceiling.getByTestId('condition').nth(0).getByLabel('What you found').selectOption('textured-coating')
    await expectText(ceiling.getByTestId('asbestos-caution'), ASBESTOS_CAUTION)
    await expectText(total, 'Room 27.60 m²')
    // the total stays in view at the top while the ceiling is filled in
    expect((await total.boundingBox())!.y).toBeLessThan(100)
    await page.screenshot({ path: join(artefacts(), 'visit-room-editor-sticky-total-phone.png') })
    await screenshot(page, 'visit-room-editor-phone')

    // the phone keeps the draft: a reload before saving loses nothing
    await reload(page)
    await expectText(page.getByTestId('room-total'), 'Room 27.60 m²')
    expect(await page.getByTestId('room-editor').getByLabel('Room name').inputValue()).toBe('Back bedroom')
    await expectText(page.getByTestId('room-editor').getByTestId('draft-status'), 'Not sent yet')
    await expectVisible(page.getByTestId('asbestos-caution'))
    expect(await savedRooms()).toEqual([])

    // where the window is, when known: 3.00 m from the left end runs the 1.20 m window past the
    // 4.00 m wall, and the check says so beside the field; 0.50 m is kept
    const placed = page.getByTestId('room-editor').getByTestId('surface-card').nth(0).getByTestId('opening').nth(0)
    await placed.getByLabel('From the left end (m)').fill('3.00')
    await placed.getByLabel('From the floor (m)').fill('0.90')
    await page.getByRole('button', { name: 'Save room' }).click()
    await expectText(placed.getByRole('alert'), 'The opening runs past the end of the surface.')
    expect(await placed.getByLabel('From the left end (m)').getAttribute('aria-invalid')).toBe('true')
    expect(await savedRooms()).toEqual([])
    await placed.getByLabel('From the left end (m)').fill('0.50')

    await page.getByRole('button', { name: 'Save room' }).click()
    await expectText(page.getByRole('status').filter({ hasText: 'saved:' }), 'Back bedroom saved: 27.60 m².')
    const card = page.getByTestId('room-card').filter({ hasText: 'Back bedroom' })
    await expectText(card.getByTestId('room-card-total'), '27.60 m²')
    await expectText(card.getByTestId('draft-status'), 'Saved')
    await expectVisible(card.getByTestId('asbestos-caution'))

    const [saved] = await savedRooms()
    expect(saved).toMatchObject({ name: 'Back bedroom', revision: 1, totals: { wallsCm2: 156_000, ceilingsCm2: 120_000, totalCm2: 276_000 } })
    expect(saved.surfaces.map((s: any) => [s.kind, s.lengthMm, s.secondMm])).toEqual([['wall', 4000, 2400], ['wall', 3000, 2400], ['ceiling', 4000, 3000]])
    expect(saved.surfaces[0].openings).toMatchObject([{ kind: 'window', widthMm: 1200, heightMm: 1000, fromLeftMm: 500, fromFloorMm: 900 }])
    expect(saved.surfaces[0].conditions).toMatchObject([{ kind: 'patch-masonry', areaCm2: 5000 }])
    expect(saved.surfaces[2].conditions).toMatchObject([{ kind: 'textured-coating', areaCm2: null }])

    // kept after a reload, from the server this time
    await reload(page)
    await expectText(page.getByTestId('room-card').filter({ hasText: 'Back bedroom' }).getByTestId('room-card-total'), '27.60 m²')
    await expect.poll(() => phoneKeys(page, 'setwell-rooms', 'drafts')).toEqual([])
    await screenshot(page, 'visit-rooms-saved-phone')

    // a photo of the visit, from the phone's saved pictures: it is stored and shown as a thumbnail
    const picker = page.getByTestId('photo-picker').first()
    const before = (await api.get(`/api/photos?visitId=${visitId}`)).body.photos.length
    const picture = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#b5654f' } }).jpeg().toBuffer()
    await picker.getByTestId('photo-file-input').setInputFiles({ name: 'blown-plaster.jpg', mimeType: 'image/jpeg', buffer: picture })
    await expect.poll(async () => (await api.get(`/api/photos?visitId=${visitId}`)).body.photos.length, { timeout: 15_000 }).toBe(before + 1)
    await expect.poll(() => picker.locator('img').count(), { timeout: 15_000 }).toBeGreaterThan(before)
    await screenshot(page, 'visit-photo-added-phone')

    // no signal: wall 2 is really 3.50 long. 3.50 x 2.40 = 8.40: 8.40 + 8.40 + 12.00 = 28.80 m²
    await page.getByTestId('room-card').filter({ hasText: 'Back bedroom' }).getByRole('button', { name: /Open/ }).click()
    await expectText(page.getByTestId('room-total'), 'Room 27.60 m²')
    await context.setOffline(true)
    await expectText(page.getByRole('main'), 'No signal.')
    await page.getByTestId('surface-card').nth(1).getByLabel('Length (m)').fill('3.50')
    await expectText(page.getByTestId('room-total'), 'Room 28.80 m²')
    await page.getByRole('button', { name: 'Save room' }).click()
    await expectText(page.getByTestId('room-editor').getByTestId('draft-status'), 'Waiting to send')
    await screenshot(page, 'visit-room-waiting-to-send-phone')
    // the office does not have it yet
    expect((await savedRooms())[0]).toMatchObject({ revision: 1, totals: { totalCm2: 276_000 } })

    // back online: it goes by itself
    await context.setOffline(false)
    await expect.poll(async () => (await savedRooms())[0].revision, { timeout: 15_000 }).toBe(2)
    const [sent] = await savedRooms()
    expect(sent.surfaces[1].lengthMm).toBe(3500)
    expect(sent.totals.totalCm2).toBe(288_000)
    await expectText(page.getByRole('status').filter({ hasText: 'saved:' }), 'Back bedroom saved: 28.80 m².')
    await expectText(page.getByTestId('room-card').filter({ hasText: 'Back bedroom' }).getByTestId('draft-status'), 'Saved')
    await expect.poll(() => phoneKeys(page, 'setwell-rooms', 'drafts')).toEqual([])
    await screenshot(page, 'visit-room-sent-phone')

    expectCleanRun(jess)
  })

  it('shows "Changed elsewhere" when the room was saved from another screen, and keeps mine or takes theirs', async () => {
    const { api, visitId } = await demoVisit(e2e.url)
    const roomId = randomUUID()
    const wallId = randomUUID()
    const kitchen = (lengthMm: number, name = 'Kitchen', revision = 0) => ({
      revision,
      name,
      surfaces: [{ id: wallId, kind: 'wall', lengthMm, secondMm: 2400 }],
    })
    const rooms = async () => (await api.get(`/api/visits/${visitId}/rooms`)).body.rooms as any[]
    // 3.00 x 2.40 = 7.20 m²
    expect((await api.put(`/api/visits/${visitId}/rooms/${roomId}`, kitchen(3000))).status).toBe(200)

    const jess = await e2e.open()
    const { page } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/visits/${visitId}`)
    const card = page.getByTestId('room-card').filter({ hasText: 'Kitchen' })
    await card.getByRole('button', { name: /Open/ }).click()
    await expectText(page.getByTestId('room-total'), 'Room 7.20 m²')

    // this phone makes the wall 3.20 (7.68 m²) while the office renames the room (revision 2)
    await page.getByTestId('surface-card').nth(0).getByLabel('Length (m)').fill('3.20')
    await expectText(page.getByTestId('room-total'), 'Room 7.68 m²')
    expect((await api.put(`/api/visits/${visitId}/rooms/${roomId}`, kitchen(3000, 'Kitchen (office)', 1))).status).toBe(200)
    await page.getByRole('button', { name: 'Save room' }).click()
    const conflict = page.getByTestId('room-conflict')
    await expectText(conflict, 'Changed elsewhere')
    await expectText(conflict, 'Kitchen (office) was changed on another phone or screen')
    await expectText(page.getByTestId('room-editor').getByTestId('draft-status'), 'Changed elsewhere')
    // what was typed is still there
    expect(await page.getByTestId('surface-card').nth(0).getByLabel('Length (m)').inputValue()).toBe('3.20')
    await screenshot(page, 'visit-room-changed-elsewhere-phone')

    // keep mine: sent over revision 2, so it is revision 3 with this phone's figures and name
    await conflict.getByRole('button', { name: 'Keep mine and send it' }).click()
    await expectText(page.getByRole('status').filter({ hasText: 'saved:' }), 'Kitchen saved: 7.68 m².')
    expect((await rooms())[0]).toMatchObject({ revision: 3, name: 'Kitchen', surfaces: [{ lengthMm: 3200 }] })

    // again, and this time take theirs: the editor shows the saved room
    await page.getByTestId('room-card').filter({ hasText: 'Kitchen' }).getByRole('button', { name: /Open/ }).click()
    await page.getByTestId('surface-card').nth(0).getByLabel('Length (m)').fill('9.99')
    expect((await api.put(`/api/visits/${visitId}/rooms/${roomId}`, kitchen(3500, 'Kitchen', 3))).status).toBe(200)
    await page.getByRole('button', { name: 'Save room' }).click()
    await page.getByTestId('room-conflict').getByRole('button', { name: 'Take the saved one' }).click()
    // 3.50 x 2.40 = 8.40 m²
    await expectText(page.getByTestId('room-total'), 'Room 8.40 m²')
    expect(await page.getByTestId('surface-card').nth(0).getByLabel('Length (m)').inputValue()).toBe('3.50')
    expect((await rooms())[0]).toMatchObject({ revision: 4, surfaces: [{ lengthMm: 3500 }] })
    expectCleanRun(jess)
  })
})

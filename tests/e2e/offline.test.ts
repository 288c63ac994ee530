// On site with no signal, on a phone (390 x 844). Opened once with a signal, Setwell opens again
// with none: Today, the person's job with its plan and day sheet, the visit booked for them. What
// is saved meanwhile waits on the phone (through a reload), goes once the signal is back, and
// arrives once. A room the office changed meanwhile shows both versions. Signing out leaves
// nothing of the firm's on the phone.
import { describe, expect, it, onTestFinished } from 'vitest'
import sharp from 'sharp'
import type { Page } from 'playwright-core'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, phoneKeys, screenshot, signInToDashboard, useE2E, type Person } from './browser'
import { CREW, OFFICE, OWNER } from './demo'
import { jobBookedToday, visitBookedFor } from './work'

const e2e = useE2E()

async function ownerApi() {
  const api = new Client(e2e.url)
  expect((await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })).status).toBe(200)
  return api
}

/** Signed in with a signal, and the phone has kept this person's work (the service worker is in charge of the page). */
async function signedInAndKept(person: Person, who: { email: string, password: string }) {
  const { page } = person
  await signInToDashboard(page, e2e.url, who.email, who.password)
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 30_000 })
  await page.waitForFunction(() => Object.keys(localStorage).some(k => k.startsWith('setwell:kept:')), undefined, { timeout: 30_000 })
}

/** The set logs waiting in the phone's outbox (app/stores/outbox.ts): their phone-made id and body. */
async function waitingLogs(page: Page): Promise<{ id: string, url: string, body: Record<string, unknown> }[]> {
  return page.evaluate(() => new Promise((resolve, reject) => {
    const req = indexedDB.open('setwell-outbox')
    req.onupgradeneeded = () => req.result.createObjectStore('items')
    req.onerror = () => reject(req.error)
    req.onsuccess = () => {
      const d = req.result
      const all = d.transaction('items', 'readonly').objectStore('items').getAll()
      all.onsuccess = () => {
        d.close()
        resolve(all.result.filter((i: any) => i?.kind === 'set-log').map((i: any) => ({ id: i.id, url: i.url, body: i.body })))
      }
    }
  }))
}

/** Visits left booked would crowd the next journeys' Today: cancelled once a test is done with them. */
async function tidy(api: Client, visitIds: string[]) {
  for (const id of visitIds) await api.post(`/api/visits/${id}/cancel`, { reason: 'Test journey over' })
}

/** The plasterer's phone at a visit booked for them, opened once with a signal, now with none. */
async function atVisitWithNoSignal(customer: string) {
  const api = await ownerApi()
  const { visitId } = await visitBookedFor(api, OWNER.name, customer)
  onTestFinished(() => tidy(api, [visitId]))
  const jess = await e2e.open()
  await signedInAndKept(jess, OWNER)
  await openWithNoSignal(jess, `/visits/${visitId}`)
  return { api, visitId, jess, page: jess.page }
}

/** Switch the signal off and open a page (a full load: it comes from the phone). */
async function openWithNoSignal(person: Person, path: string) {
  await person.context.setOffline(true)
  await person.page.goto(`${e2e.url}${path}`)
  await person.page.waitForSelector('html[data-hydrated="true"]', { state: 'attached' })
}

/** The office, signed in through the API. */
async function officeApi() {
  const office = new Client(e2e.url)
  expect((await office.post('/api/auth/sign-in', { email: OFFICE.email, password: OFFICE.password })).status).toBe(200)
  return office
}

/** A full reload with no signal: the page comes from the phone. */
async function reloadOffline(page: Page) {
  await page.reload()
  await page.waitForSelector('html[data-hydrated="true"]', { state: 'attached' })
}

describe('working with no signal', () => {
  it('the crew open Today and their job with no signal and log set 1 with a photo; the plasterer measures a room and marks the visit done; all of it arrives once', async () => {
    const api = await ownerApi()
    const { jobId, reference } = await jobBookedToday(api, e2e.app, e2e.url, CREW.name, 'Oona Farrant')
    const { visitId } = await visitBookedFor(api, OWNER.name, 'Tegan Ashdown')
    try {
      // the crew member: one visit with a signal, then none
      const kieran = await e2e.open()
      const page = kieran.page
      await signedInAndKept(kieran, CREW)
      await kieran.context.setOffline(true)
      await reloadOffline(page)
      const today = page.getByTestId('dashboard-jobs')
      await expectVisible(today.getByText('Oona Farrant'))
      await expectText(page.getByTestId('signal'), /No signal\..*Showing this page as it was at \d\d:\d\d today\./s)
      await screenshot(page, 'offline-today-crew')

      // the job (never opened with a signal: kept for them), its plan, its day sheet
      await today.getByRole('link', { name: /Oona Farrant/ }).click()
      await page.waitForURL(u => u.pathname === `/jobs/${jobId}`)
      await expectText(page.getByText(`Job ${reference}`), new RegExp(`job ${reference}`, 'i'))
      await expectVisible(page.getByTestId('set-plan').getByTestId('set-1'))
      await expectText(page.getByTestId('kept-at'), /Showing this page as it was at \d\d:\d\d today\./)
      await reloadOffline(page)
      await expectVisible(page.getByTestId('set-plan').getByTestId('set-1'))
      await screenshot(page, 'offline-job-plan-crew')

      // set 1 logged from the plan, with a photo, with no signal
      await page.getByTestId('set-1').getByRole('link', { name: 'Log set 1' }).click()
      await page.waitForURL(u => u.pathname === `/jobs/${jobId}/log`)
      await expect.poll(() => page.locator('input[type=checkbox]:checked').count()).toBeGreaterThan(1)
      const picture = await sharp({ create: { width: 4032, height: 3024, channels: 3, background: '#c9b8a4' } }).jpeg({ quality: 90 }).toBuffer()
      await page.getByTestId('log-photos').getByTestId('photo-file-input').setInputFiles({ name: 'IMG_2231.jpg', mimeType: 'image/jpeg', buffer: picture })
      await expectVisible(page.getByTestId('log-photo'))
      await screenshot(page, 'offline-set-log-photo-crew')
      await page.getByRole('button', { name: 'Save the set' }).click()
      await page.waitForURL(u => u.pathname === `/jobs/${jobId}`)
      await expectText(page.getByTestId('job-waiting'), /Set 1 on .*1 photo/s)
      await expectText(page.getByTestId('waiting-count'), '2 waiting to send')
      await screenshot(page, 'offline-set-log-waiting-crew')

      // the phone is switched off and on: still there
      await reloadOffline(page)
      await expectText(page.getByTestId('waiting-count'), '2 waiting to send')
      const [queued] = await waitingLogs(page)
      expect(queued).toBeTruthy()
      expect((await api.get(`/api/jobs/${jobId}`)).body.logs).toEqual([])

      // the day sheet opens too
      await page.goto(`${e2e.url}/jobs/${jobId}/sheet`)
      await expectVisible(page.getByTestId('sheet-cautions'))
      await expectText(page.getByTestId('kept-at'), /Showing this page as it was/)
      await screenshot(page, 'offline-day-sheet-crew')

      // the signal is back: the entry, then its photo, once
      await kieran.context.setOffline(false)
      await page.evaluate(() => window.dispatchEvent(new Event('online')))
      await expect.poll(async () => (await api.get(`/api/jobs/${jobId}`)).body.logs.length, { timeout: 30_000 }).toBe(1)
      const [log] = (await api.get(`/api/jobs/${jobId}`)).body.logs
      expect(log).toMatchObject({ setNumber: 1, kind: 'set' })
      await expect.poll(async () => (await api.get(`/api/photos?setLogId=${log.id}`)).body.photos?.length ?? 0, { timeout: 30_000 }).toBe(1)
      const [photo] = (await api.get(`/api/photos?setLogId=${log.id}`)).body.photos
      // shrunk on the phone to what Setwell keeps: 2560 px on the long edge
      expect([photo.width, photo.height]).toEqual([2560, 1920])
      await expect.poll(() => phoneKeys(page, 'setwell-outbox', 'items').then(k => k.filter(x => x.startsWith('item:')))).toEqual([])

      // the same write sent twice more (a lost answer, a second phone's copy) is stored once
      const crew = new Client(e2e.url)
      expect((await crew.post('/api/auth/sign-in', { email: CREW.email, password: CREW.password })).status).toBe(200)
      for (let i = 0; i < 2; i++) {
        const again = await crew.post(queued!.url, { ...queued!.body, clientId: queued!.id })
        expect(again.status).toBe(200)
        expect(again.body.logId).toBe(log.id)
      }
      expect((await api.get(`/api/jobs/${jobId}`)).body.logs).toHaveLength(1)
      expectCleanRunOffline(kieran)

      // the plasterer, at the visit booked for them: a room measured and the visit marked done, with no signal
      const jess = await e2e.open()
      const owner = jess.page
      await signedInAndKept(jess, OWNER)
      await openWithNoSignal(jess, `/visits/${visitId}`)
      await expectText(owner.getByTestId('visit-header'), 'Tegan Ashdown')
      // a photo of the house first: kept on the phone, shrunk
      const visitPhotos = owner.getByRole('region', { name: 'Photos of the visit' })
      await visitPhotos.getByTestId('photo-file-input').setInputFiles({ name: 'IMG_2240.jpg', mimeType: 'image/jpeg', buffer: picture })
      await expectText(visitPhotos, '1 photo is kept on this phone: sent when the signal is back.')
      await expectText(owner.getByTestId('waiting-count'), '1 waiting to send')
      await owner.getByRole('button', { name: 'Add a room' }).click()
      const editor = owner.getByTestId('room-editor')
      await editor.getByLabel('Room name').fill('Front room')
      await editor.getByRole('button', { name: 'Add wall' }).click()
      const wall = editor.getByTestId('surface-card').nth(0)
      // 4.00 x 2.40 = 9.60 m²
      await wall.getByLabel('Length (m)').fill('4.00')
      await wall.getByLabel('Height (m)').fill('2.40')
      await expectText(owner.getByTestId('room-total'), 'Room 9.60 m²')
      await owner.getByRole('button', { name: 'Save room' }).click()
      await expectText(editor.getByTestId('draft-status'), 'Waiting to send')
      await expectText(owner.getByTestId('waiting-count'), '2 waiting to send')
      await screenshot(owner, 'offline-room-waiting-owner')
      await owner.getByTestId('visit-status').getByRole('button', { name: 'Mark done' }).click()
      await owner.getByTestId('visit-done-form').getByRole('button', { name: 'Save: visit done' }).click()
      await expectText(owner.getByTestId('visit-done-waiting'), 'Marked done on this phone')
      await expectText(owner.getByTestId('waiting-count'), '3 waiting to send')

      // the phone is switched off and on: still waiting, still counted
      await reloadOffline(owner)
      await expectText(owner.getByTestId('waiting-count'), '3 waiting to send')
      expect(await phoneKeys(owner, 'setwell-rooms', 'drafts')).toHaveLength(1)
      expect((await api.get(`/api/visits/${visitId}/rooms`)).body.rooms).toEqual([])
      expect((await api.get(`/api/visits/${visitId}`)).body.status).toBe('booked')

      // the signal is back: both go by themselves, once
      await jess.context.setOffline(false)
      await owner.evaluate(() => window.dispatchEvent(new Event('online')))
      await expect.poll(async () => (await api.get(`/api/visits/${visitId}/rooms`)).body.rooms.length, { timeout: 30_000 }).toBe(1)
      await expect.poll(async () => (await api.get(`/api/visits/${visitId}`)).body.status, { timeout: 30_000 }).toBe('done')
      await expect.poll(async () => (await api.get(`/api/photos?visitId=${visitId}`)).body.photos.length, { timeout: 30_000 }).toBe(1)
      const [room] = (await api.get(`/api/visits/${visitId}/rooms`)).body.rooms
      expect(room).toMatchObject({ name: 'Front room', revision: 1, totals: { totalCm2: 96_000 } })
      await expect.poll(() => phoneKeys(owner, 'setwell-rooms', 'drafts')).toEqual([])
      await expectVisible(owner.getByTestId('room-card').filter({ hasText: 'Front room' }))
      expectCleanRunOffline(jess)
    }
    finally {
      await tidy(api, [visitId])
    }
  }, 150_000)

  it('a room the office changed while the phone had no signal shows both versions; keep mine saves mine over theirs', async () => {
    const api = await ownerApi()
    const { visitId } = await visitBookedFor(api, OWNER.name, 'Morwenna Quill')
    onTestFinished(() => tidy(api, [visitId]))
    const roomId = crypto.randomUUID()
    const wallId = crypto.randomUUID()
    // 3.00 x 2.40 = 7.20 m²
    expect((await api.put(`/api/visits/${visitId}/rooms/${roomId}`, { revision: 0, name: 'Kitchen', surfaces: [{ id: wallId, kind: 'wall', lengthMm: 3000, secondMm: 2400 }] })).status).toBe(200)

    const jess = await e2e.open()
    const page = jess.page
    await signedInAndKept(jess, OWNER)
    await openWithNoSignal(jess, `/visits/${visitId}`)
    await page.getByTestId('room-card').filter({ hasText: 'Kitchen' }).getByRole('button', { name: /Open/ }).click()
    // the phone makes the wall 3.20 (7.68 m²) with no signal
    await page.getByTestId('surface-card').nth(0).getByLabel('Length (m)').fill('3.20')
    await page.getByRole('button', { name: 'Save room' }).click()
    await expectText(page.getByTestId('room-editor').getByTestId('draft-status'), 'Waiting to send')

    // meanwhile the office makes it 3.50 (8.40 m²) and renames it
    const office = await officeApi()
    expect((await office.put(`/api/visits/${visitId}/rooms/${roomId}`, { revision: 1, name: 'Kitchen (office)', surfaces: [{ id: wallId, kind: 'wall', lengthMm: 3500, secondMm: 2400 }] })).status).toBe(200)

    // the signal is back: neither is lost; both are shown
    await jess.context.setOffline(false)
    await page.evaluate(() => window.dispatchEvent(new Event('online')))
    const conflict = page.getByTestId('room-conflict')
    await expectText(conflict, 'Changed elsewhere')
    await expectText(conflict, '7.68 m²')
    await expectText(conflict, '8.40 m²')
    await expectText(page.getByTestId('waiting-count'), '1 needs you')
    expect((await api.get(`/api/visits/${visitId}/rooms`)).body.rooms[0]).toMatchObject({ revision: 2, name: 'Kitchen (office)' })
    await screenshot(page, 'offline-room-conflict-owner')

    await conflict.getByRole('button', { name: 'Keep mine and send it' }).click()
    await expectText(page.getByRole('status').filter({ hasText: 'saved:' }), 'Kitchen saved: 7.68 m².')
    expect((await api.get(`/api/visits/${visitId}/rooms`)).body.rooms[0]).toMatchObject({ revision: 3, name: 'Kitchen', surfaces: [{ lengthMm: 3200 }] })
    expectCleanRunOffline(jess)
  })

  it('a visit marked done with no signal after the office cancelled it is kept, with the office\'s words, until the plasterer chooses', async () => {
    const { api, visitId, jess, page } = await atVisitWithNoSignal('Lorcan Pheby')
    await page.getByTestId('visit-status').getByRole('button', { name: 'Mark done' }).click()
    await page.getByTestId('visit-done-form').getByRole('button', { name: 'Save: visit done' }).click()
    await expectText(page.getByTestId('visit-done-waiting'), 'Marked done on this phone')

    // meanwhile the office cancels it
    const office = await officeApi()
    expect((await office.post(`/api/visits/${visitId}/cancel`, { reason: 'Customer rang: the house is sold' })).status).toBe(200)

    // back online: refused, and kept with the server's words, not dropped
    await jess.context.setOffline(false)
    await page.evaluate(() => window.dispatchEvent(new Event('online')))
    await expectText(page.getByTestId('waiting-count'), '1 needs you')
    await page.getByTestId('waiting-count').click()
    await page.waitForURL(u => u.pathname === '/waiting')
    const item = page.getByTestId('outbox-item')
    await expectText(item, /Lorcan Pheby marked done/)
    await expectText(item, /cancelled/i)
    await screenshot(page, 'waiting-refused-owner')
    expect((await api.get(`/api/visits/${visitId}`)).body.status).toBe('cancelled')

    // take theirs: asked first, then gone from the phone
    await item.getByRole('button', { name: 'Take theirs: delete mine' }).click()
    await page.getByTestId('confirm-yes').click()
    await expectVisible(page.getByTestId('nothing-waiting'))
    await expect.poll(() => phoneKeys(page, 'setwell-outbox', 'items').then(k => k.filter(x => x.startsWith('item:')))).toEqual([])
    expect((await api.get(`/api/visits/${visitId}`)).body.status).toBe('cancelled')
    expectCleanRunOffline(jess)
  })

  it('signing out warns about what is not sent, then leaves nothing of the firm\'s on the phone', async () => {
    const { visitId, jess, page } = await atVisitWithNoSignal('Perpetua Lamb')
    await page.getByRole('button', { name: 'Add a room' }).click()
    await page.getByTestId('room-editor').getByLabel('Room name').fill('Hall')
    await jess.context.setOffline(false)

    // the warning names what would be lost; "no" keeps everything
    await page.getByRole('button', { name: 'Sign out' }).click()
    const dialog = page.getByRole('alertdialog')
    await expectText(dialog, /not reached Setwell yet/)
    await screenshot(page, 'sign-out-unsent-warning-owner')
    await dialog.getByRole('button', { name: 'Keep them and stay' }).click()
    expect(await phoneKeys(page, 'setwell-rooms', 'drafts')).toHaveLength(1)

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.getByTestId('confirm-yes').click()
    await page.waitForURL(u => u.pathname === '/sign-in')
    expect(await phoneKeys(page, 'setwell-rooms', 'drafts')).toEqual([])
    expect(await page.evaluate(async () => (await caches.keys()).filter(k => k === 'setwell-data' || k === 'setwell-pages'))).toEqual([])

    // with no signal, a signed-out phone shows nothing from before
    await openWithNoSignal(jess, `/visits/${visitId}`)
    await expect.poll(() => new URL(page.url()).pathname).toBe('/sign-in')
    expect(await page.locator('body').textContent()).not.toContain('Perpetua Lamb')
    await screenshot(page, 'offline-signed-out')
  })
})

/** Page errors and off-host requests are never acceptable; with no signal, failed loads are expected and logged by the browser. */
function expectCleanRunOffline(person: Person) {
  person.consoleErrors.splice(0, person.consoleErrors.length, ...person.consoleErrors.filter(m => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|ERR_FAILED/.test(m)))
  expectCleanRun(person)
}

// The questions the job, visit and firm pages ask are dialogs on the page, not the browser's:
// - the owner on a phone (390 x 844) cancels a job: the dialog asks why, says so beside the field
//   when nothing is typed (keeping the dialog open), and once sent the job shows as cancelled with
//   the reason in its history;
// - on a visit, deleting a room asks first: "Go back" keeps it, "Delete the room" deletes it;
// - the owner at a laptop (1366 x 900) makes a new enquiry-form link after saying yes.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()
const LAPTOP = { width: 1366, height: 900 }

async function ownerApi() {
  const api = new Client(e2e.url)
  expect((await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })).status).toBe(200)
  return api
}

async function customerWithSite(api: Client, name: string) {
  const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name, email: uniqueEmail('dialogs') }, site: { line1: '14 Tanners Row', town: 'Kettlebury', postcode: 'KB3 7TR' } })).body
  expect(c.id).toBeTruthy()
  return c as { id: string, sites: { id: string }[] }
}

describe('dialogs on the job, visit and firm pages', () => {
  it('cancelling a job asks why in a dialog, and the job shows as cancelled with the reason', async () => {
    const api = await ownerApi()
    const c = await customerWithSite(api, 'Odette Fairweather')
    const job = (await api.post('/api/jobs', { customerId: c.id, siteId: c.sites[0]!.id, title: 'Skim the landing' })).body
    expect(job.id).toBeTruthy()

    const jess = await e2e.open()
    const page = jess.page
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/jobs/${job.id}`)
    await expectText(page.getByTestId('job-status'), 'Booked')
    await screenshot(page, 'job-page-owner')

    await page.getByRole('button', { name: 'Cancel the job' }).click()
    const dialog = page.getByTestId('form-dialog')
    await expectVisible(dialog.getByRole('heading', { name: 'Why is the job cancelled?' }))
    // nothing typed: said beside the field, the dialog stays open and the job is not cancelled
    await dialog.getByRole('button', { name: 'Cancel the job' }).click()
    await expectText(dialog.getByRole('alert'), 'Say why the job is cancelled.')
    expect(await dialog.getByLabel('Reason').getAttribute('aria-invalid')).toBe('true')
    expect((await api.get(`/api/jobs/${job.id}`)).body.status).toBe('booked')
    await dialog.getByLabel('Reason').fill('Customer sold the house')
    // typing the reason puts the error away; what was typed stays
    await expectAbsent(dialog.getByRole('alert'))
    await screenshot(page, 'job-cancel-dialog')
    await dialog.getByRole('button', { name: 'Cancel the job' }).click()

    await expectAbsent(dialog)
    await expectText(page.getByTestId('job-status'), 'Cancelled')
    await expectText(page.getByTestId('job-history'), /Cancelled · .*Customer sold the house/)
    const after = (await api.get(`/api/jobs/${job.id}`)).body
    expect(after.status).toBe('cancelled')
    expect(after.history.at(-1).reason).toBe('Customer sold the house')
    await screenshot(page, 'job-cancelled')
    expectCleanRun(jess)
  })

  it('deleting a room asks first: going back keeps it, saying yes deletes it', async () => {
    const api = await ownerApi()
    const c = await customerWithSite(api, 'Crispin Ould')
    const v = (await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0]!.id, startsAt: new Date().toISOString() })).body
    const roomId = crypto.randomUUID()
    const room = await api.put(`/api/visits/${v.id}/rooms/${roomId}`, { revision: 0, name: 'Scullery', surfaces: [{ id: crypto.randomUUID(), kind: 'wall', lengthMm: 2400, secondMm: 2300 }] })
    expect(room.status, JSON.stringify(room.body)).toBe(200)
    const rooms = async () => (await api.get(`/api/visits/${v.id}/rooms`)).body.rooms as unknown[]

    const jess = await e2e.open()
    const page = jess.page
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/visits/${v.id}?room=${roomId}`)
    const editor = page.getByTestId('room-editor')
    await expectVisible(editor)
    await screenshot(page, 'visit-room-editor')

    const dialog = page.getByTestId('confirm-dialog')
    await editor.getByRole('button', { name: 'Delete room' }).click()
    await expectVisible(dialog.getByRole('heading', { name: 'Delete Scullery?' }))
    await screenshot(page, 'visit-room-delete-confirm')
    await dialog.getByRole('button', { name: 'Go back' }).click()
    await expectAbsent(dialog)
    await expectVisible(editor)
    expect(await rooms()).toHaveLength(1)

    await editor.getByRole('button', { name: 'Delete room' }).click()
    await dialog.getByTestId('confirm-yes').click()
    await expectText(page.locator('body'), /Scullery deleted\./)
    expect(await rooms()).toHaveLength(0)
    expectCleanRun(jess)
  })

  it('the owner makes a new enquiry-form link after saying yes in the dialog', async () => {
    const jess = await e2e.open({ desktop: true })
    const page = jess.page
    await page.setViewportSize(LAPTOP)
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/firm`)
    const link = page.getByTestId('enquiry-form-link')
    const before = (await link.textContent())!.trim()
    expect(before).toMatch(/\/enquire\/\S+$/)
    await screenshot(page, 'firm-page-laptop')

    await page.getByRole('button', { name: 'Make a new link' }).click()
    const dialog = page.getByTestId('confirm-dialog')
    await expectVisible(dialog.getByRole('heading', { name: 'Make a new link?' }))
    await screenshot(page, 'firm-new-link-confirm')
    await dialog.getByTestId('confirm-yes').click()
    await expectAbsent(dialog)
    await expect.poll(async () => (await link.textContent())!.trim()).not.toBe(before)
    expect((await link.textContent())!.trim()).toMatch(/\/enquire\/\S+$/)
    expectCleanRun(jess)
  })
})

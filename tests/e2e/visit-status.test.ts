// Journeys (issue 15, part 3): the office, on a wide screen, moves a visit with the date picker
// (the days the server refuses are greyed out; "Use this time" confirms) and cancels another with
// a reason in a dialog; the plasterer, on a phone, marks their visit done; Today and the visit
// list then show neither, and "Done and cancelled" shows both. On a phone, the room editor's
// summary stays within a fifth of the screen and the field typed in is never under it.
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { addDays, londonToday } from '../../shared/utils/dates'
import { visitDayLimits } from '../../shared/utils/visit-status'
import { Client } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { CREW, OFFICE, OWNER } from './demo'

const e2e = useE2E()
const inDays = (n: number, hhmm = '09:00') => `${addDays(londonToday(), n)}T${hhmm}:00.000Z`

/** A customer with an enquiry and three visits (the crew member makes the third), through the API as the owner. */
async function threeVisits() {
  const api = new Client(e2e.url)
  expect((await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })).status).toBe(200)
  const crewId = ((await api.get('/api/members')).body as { userId: string, name: string }[]).find(m => m.name === CREW.name)!.userId
  const name = `Bryony Lathe ${Date.now() % 100000}`
  const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name, phone: '07700 900555' }, site: { line1: '8 Scrim Walk', town: 'Kettlebury', postcode: 'KB2 8SW' } })).body
  const e = (await api.post('/api/enquiries', { customerId: c.id, siteId: c.sites[0].id, source: 'phone', description: 'Skim two bedrooms' })).body
  const book = async (startsAt: string, visitorUserId: string | null = null) => {
    const v = await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, enquiryId: e.id, startsAt, visitorUserId })
    expect(v.status, JSON.stringify(v.body)).toBe(201)
    return v.body.id as string
  }
  const toMove = await book(inDays(2, '09:00'))
  const toCancel = await book(inDays(2, '11:00'))
  // the plasterer's visit is this morning (in the past, so "now" is a fine done time)
  const toFinish = await book(new Date(Date.now() - 90 * 60_000).toISOString(), crewId)
  /** Cancel what a journey left booked, so the other journeys' lists (Today shows five) are theirs. */
  const tidy = async () => {
    for (const id of [toMove, toCancel, toFinish]) {
      if ((await api.get(`/api/visits/${id}`)).body.status === 'booked') await api.post(`/api/visits/${id}/cancel`, { reason: 'Test journey over' })
    }
  }
  return { api, name, enquiryId: e.id as string, toMove, toCancel, toFinish, tidy }
}

describe('finishing, moving and cancelling visits', () => {
  it('the office moves one visit and cancels another; they leave the list of visits to do', async () => {
    const { api, name, enquiryId, toMove, toCancel, tidy } = await threeVisits()
    const office = await e2e.open({ desktop: true })
    const { page } = office
    await page.setViewportSize({ width: 1366, height: 900 })
    await signInToDashboard(page, e2e.url, OFFICE.email, OFFICE.password)

    // the booking form's picker greys out the days before today; the move form's the same
    await visit(page, `${e2e.url}/visits?new=1`)
    await page.getByTestId('visit-booking').getByLabel('When').click()
    const yesterday = addDays(londonToday(), -1)
    const today = londonToday()
    if (yesterday.slice(0, 7) === today.slice(0, 7)) expect(await page.locator(`[data-test-id="dp-${yesterday}"]`).getAttribute('aria-disabled')).toBe('true')
    expect(await page.locator(`[data-test-id="dp-${today}"]`).getAttribute('aria-disabled')).toBeNull()
    const useIt = page.getByRole('button', { name: 'Use this time' })
    await expectVisible(useIt)
    expect((await useIt.boundingBox())!.height).toBeGreaterThanOrEqual(44)
    await screenshot(page, 'visit-picker-booking')
    await page.keyboard.press('Escape')

    await visit(page, `${e2e.url}/visits/${toMove}`)
    await page.getByRole('button', { name: 'Move', exact: true }).click()
    const moveForm = page.getByTestId('visit-move-form')
    const limits = visitDayLimits()
    expect(await page.getByTestId('visit-when').getAttribute('data-last-day')).toBe(limits.last)
    await moveForm.getByLabel('New date and time').click()
    if (yesterday.slice(0, 7) === today.slice(0, 7)) expect(await page.locator(`[data-test-id="dp-${yesterday}"]`).getAttribute('aria-disabled')).toBe('true')
    // the 20th of next month, at the 09:00 the picker starts from, confirmed with the picker's button
    await page.locator('.dp--arrow-btn-nav').last().click()
    await page.locator('.dp--calendar-item .dp--future', { hasText: /^20$/ }).first().click()
    await page.getByRole('button', { name: 'Use this time' }).click()
    await expect.poll(() => moveForm.getByLabel('New date and time').inputValue()).toMatch(/ 20 .*09:00/)
    await screenshot(page, 'visit-move')
    await moveForm.getByRole('button', { name: 'Move the visit' }).click()
    await expectAbsent(moveForm)
    await expectText(page.getByTestId('visit-header'), / 20 /)
    const moved = (await api.get(`/api/visits/${toMove}`)).body
    expect(new Date(moved.startsAt).getDate()).toBe(20)
    expect(moved.status).toBe('booked')

    // cancel: the dialog asks why, and will not go without a reason
    await visit(page, `${e2e.url}/visits/${toCancel}`)
    await page.getByRole('button', { name: 'Cancel visit', exact: true }).click()
    const dialog = page.getByTestId('form-dialog')
    await expectVisible(dialog)
    await dialog.getByRole('button', { name: 'Cancel the visit' }).click()
    await expectText(dialog.getByRole('alert'), 'Say why the visit is cancelled.')
    await dialog.getByLabel('Reason').fill('The customer is away that week')
    await screenshot(page, 'visit-cancel-dialog')
    await dialog.getByRole('button', { name: 'Cancel the visit' }).click()
    await expectAbsent(dialog)
    await expectText(page.getByTestId('visit-cancelled'), 'Cancelled: The customer is away that week')
    expect((await api.get(`/api/visits/${toCancel}`)).body).toMatchObject({ status: 'cancelled', cancelReason: 'The customer is away that week' })
    // another visit is still booked for the enquiry, so it stays at "visit booked"
    expect((await api.get(`/api/enquiries/${enquiryId}`)).body.status).toBe('visit-booked')

    // the list of visits to do: the moved one (on its new day), not the cancelled one
    await visit(page, `${e2e.url}/visits`)
    const list = page.getByRole('main')
    await expectVisible(list.locator(`a[href="/visits/${toMove}"]`))
    expect(await list.locator(`a[href="/visits/${toCancel}"]`).count()).toBe(0)
    await page.getByTestId('visits-tab-finished').click()
    await expectText(list.locator(`a[href="/visits/${toCancel}"]`), `${name}`)
    await expectText(list.locator(`a[href="/visits/${toCancel}"]`), 'Cancelled: The customer is away that week')
    expect(await list.locator(`a[href="/visits/${toMove}"]`).count()).toBe(0)
    await screenshot(page, 'visits-done-and-cancelled')
    expectCleanRun(office)
    await tidy()
  })

  it('the plasterer marks their visit done on the phone; Today and the list drop it', async () => {
    const { api, toFinish, tidy } = await threeVisits()
    const kieran = await e2e.open()
    const { page } = kieran
    await signInToDashboard(page, e2e.url, CREW.email, CREW.password)
    // its time has gone by: a next action on Today (mark it done), not a visit to come
    const today = page.getByTestId('dashboard-crew')
    await expectVisible(today.locator(`a[href="/visits/${toFinish}"]`))
    expect(await page.getByTestId('dashboard-visits').locator(`a[href="/visits/${toFinish}"]`).count()).toBe(0)

    await today.locator(`a[href="/visits/${toFinish}"]`).click()
    await page.waitForURL(u => u.pathname === `/visits/${toFinish}`)
    // crew mark done; they neither move nor cancel
    expect(await page.getByRole('button', { name: 'Move', exact: true }).count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Cancel visit', exact: true }).count()).toBe(0)
    await page.getByRole('button', { name: 'Mark done', exact: true }).click()
    const form = page.getByTestId('visit-done-form')
    expect(await form.getByLabel('Day').inputValue()).toBe(londonToday())
    expect(await form.getByLabel('Time').inputValue()).toMatch(/^\d\d:\d\d$/)
    await screenshot(page, 'visit-mark-done-phone')
    await form.getByRole('button', { name: 'Save: visit done' }).click()
    await expectText(page.getByTestId('visit-done-at'), /^Done .+\d\d:\d\d\.$/)
    const done = (await api.get(`/api/visits/${toFinish}`)).body
    expect(done.status).toBe('done')
    expect(Date.now() - new Date(done.doneAt).getTime()).toBeLessThan(60 * 60_000)
    await screenshot(page, 'visit-done-phone')

    await visit(page, `${e2e.url}/`)
    await expectVisible(page.getByTestId('dashboard-visits'))
    expect(await page.getByTestId('dashboard-visits').locator(`a[href="/visits/${toFinish}"]`).count()).toBe(0)
    expect(await page.getByTestId('dashboard-crew').locator(`a[href="/visits/${toFinish}"]`).count()).toBe(0)
    await visit(page, `${e2e.url}/visits`)
    expect(await page.getByRole('main').locator(`a[href="/visits/${toFinish}"]`).count()).toBe(0)
    await page.getByTestId('visits-tab-finished').click()
    await expectText(page.getByRole('main').locator(`a[href="/visits/${toFinish}"]`), /Done /)
    expectCleanRun(kieran)
    await tidy()
  })

  it('keeps the room summary within a fifth of a phone screen, and never over the field typed in', async () => {
    const { toMove, tidy } = await threeVisits()
    const owner = await e2e.open()
    const { page } = owner
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/visits/${toMove}`)
    await page.getByRole('button', { name: 'Add a room' }).click()
    const editor = page.getByTestId('room-editor')
    await editor.getByLabel('Room name').fill('Front bedroom')
    for (const kind of ['Add wall', 'Add wall', 'Add wall', 'Add ceiling']) await editor.getByRole('button', { name: kind }).click()
    const summary = page.getByTestId('room-summary')
    const cards = editor.getByTestId('surface-card')
    await cards.nth(0).getByLabel('Length (m)').fill('4.00')
    await cards.nth(0).getByLabel('Height (m)').fill('2.40')

    // scrolled down the page: the summary sticks at the top, at most 168 px tall (844 / 5)
    await page.evaluate(() => window.scrollTo({ top: document.body.scrollHeight }))
    const box = (await summary.boundingBox())!
    expect(box.y).toBeLessThanOrEqual(1)
    expect(box.height).toBeLessThanOrEqual(168)

    // a field just under the summary's edge (as after scrolling with a thumb), then typed in
    const field = cards.nth(1).getByLabel('Length (m)')
    await field.evaluate((el) => {
      window.scrollBy({ top: el.getBoundingClientRect().top - 20 })
    })
    const under = (await field.boundingBox())!
    expect(under.y, 'the field starts under the summary before it is focused').toBeLessThan(box.height)
    // focused as the keyboard's "next" or the form's own focus does (a Playwright action would
    // scroll the field into view itself), then typed in
    await field.evaluate(el => (el as HTMLInputElement).focus())
    await page.keyboard.type('3.5')
    expect(await field.inputValue()).toBe('3.5')
    const typing = (await summary.boundingBox())!
    const clear = (await field.boundingBox())!
    expect(typing.height).toBeLessThanOrEqual(168)
    expect(clear.y, `field at ${clear.y}, summary ends at ${typing.y + typing.height}`).toBeGreaterThanOrEqual(typing.y + typing.height)
    expect(clear.y + clear.height).toBeLessThanOrEqual(844)
    // what the phone shows (a full-page picture would draw the sticky summary where the page began)
    await page.screenshot({ path: join(process.env.SETWELL_ARTEFACTS ?? join(process.cwd(), 'tests/artefacts'), 'room-summary-typing.png') })
    expectCleanRun(owner)
    await tidy()
  })
})

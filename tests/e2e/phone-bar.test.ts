// The phone's bottom bar (390 x 844): at most five places, the rest of the sections under "More",
// every label at least 12 px. The plasterer who owns the firm has seven sections; the crew four.
import type { Locator, Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import { expectAbsent, expectCleanRun, expectPath, expectVisible, menuLabels, screenshot, sectionsNav, signInToDashboard, useE2E } from './browser'
import { CREW, OWNER } from './demo'

const e2e = useE2E()
const PHONE = { width: 390, height: 844 }

/** The computed font size, in px, of each element's text. */
async function fontSizes(items: Locator): Promise<number[]> {
  return items.evaluateAll(els => els.map(el => Number.parseFloat(getComputedStyle(el).fontSize)))
}

/** The places in the bar: its links and its More button (not what the opened sheet holds). */
function barPlaces(page: Page) {
  return sectionsNav(page).locator('ul[class*="flex"] > li > :is(a, button)')
}

describe('the phone\'s bottom bar', () => {
  it('the owner has four sections and More; the sheet holds the rest; labels are 12 px or more', async () => {
    const jess = await e2e.open()
    const { page } = jess
    await page.setViewportSize(PHONE)
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)

    const places = barPlaces(page)
    await places.first().waitFor({ state: 'visible' })
    expect(await places.count()).toBeLessThanOrEqual(5)
    expect((await places.allInnerTexts()).map(t => t.trim())).toEqual(['Today', 'Visits', 'Jobs', 'Money', 'More'])
    for (const size of await fontSizes(places.locator('span'))) expect(size).toBeGreaterThanOrEqual(12)
    // everything fits across the phone: no place wider than its share, nothing scrolled off
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await screenshot(page, 'plasterer-phone-bar')

    const more = page.getByTestId('nav-more')
    expect(await more.getAttribute('aria-expanded')).toBe('false')
    await more.click()
    expect(await more.getAttribute('aria-expanded')).toBe('true')
    const sheet = page.getByTestId('nav-more-sheet')
    await expectVisible(sheet)
    const sheetLinks = sheet.getByRole('link')
    expect((await sheetLinks.allInnerTexts()).map(t => t.trim())).toEqual(['Enquiries', 'Customers', 'Settings'])
    for (const size of await fontSizes(sheetLinks.locator('span'))) expect(size).toBeGreaterThanOrEqual(12)
    await screenshot(page, 'plasterer-phone-more-sheet')

    // a section from the sheet: it opens, the sheet closes, and More is lit as where you are
    await sheet.getByRole('link', { name: 'Customers' }).click()
    await expectPath(page, '/customers')
    await expectAbsent(sheet)
    expect(await more.getAttribute('aria-expanded')).toBe('false')
    await expect.poll(() => more.evaluate(el => el.className), { timeout: 10_000 }).toContain('text-plaster-700')

    // Escape and a tap beside the sheet close it too
    await more.click()
    await expectVisible(sheet)
    await page.keyboard.press('Escape')
    await expectAbsent(sheet)
    await more.click()
    await expectVisible(sheet)
    await page.mouse.click(PHONE.width / 2, 100)
    await expectAbsent(sheet)
    await screenshot(page, 'plasterer-phone-customers')

    expectCleanRun(jess)
  })

  it('the crew\'s four sections all fit: no More', async () => {
    const kieran = await e2e.open()
    const { page } = kieran
    await page.setViewportSize(PHONE)
    await signInToDashboard(page, e2e.url, CREW.email, CREW.password)
    expect(await menuLabels(page)).toEqual(['Today', 'Visits', 'Jobs', 'Settings'])
    expect(await page.getByTestId('nav-more').count()).toBe(0)
    for (const size of await fontSizes(barPlaces(page).locator('span'))) expect(size).toBeGreaterThanOrEqual(12)
    await screenshot(page, 'crew-phone-bar')
    expectCleanRun(kieran)
  })
})

// Journey 3: the accountant, who serves two firms, works on a desktop and switches between them
// with the firm menu in the header.
import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import { addDays, londonToday } from '#shared/utils/dates'
import { formatPence } from '#shared/utils/money'
import { vatQuarter } from '#shared/utils/periods'
import { expectAbsent, expectCleanRun, expectPath, expectText, expectVisible, menuLabels, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { ACCOUNTANT, FIRM_NAME, SECOND_FIRM_NAME, firstName } from './demo'

const e2e = useE2E()

describe('switching firm', () => {
  it('the accountant switches firm on a desktop and the firm name changes', async () => {
    const priya = await e2e.open({ desktop: true })
    const { page } = priya
    await signInToDashboard(page, e2e.url, ACCOUNTANT.email, ACCOUNTANT.password)
    await expectText(page.getByTestId('dashboard-heading'), `Hello, ${firstName(ACCOUNTANT)}`)
    await expectVisible(page.getByTestId('dashboard-accountant'))
    // an accountant reads customers; no enquiries or visits to run (here in the sidebar)
    expect(await menuLabels(page)).toEqual(['Today', 'Customers', 'Money', 'Settings'])

    const select = page.getByTestId('firm-switch')
    await expectVisible(select)
    expect((await select.locator('option').allInnerTexts()).map(t => t.trim()).sort()).toEqual([FIRM_NAME, SECOND_FIRM_NAME].sort())
    const selected = () => select.evaluate((s: HTMLSelectElement) => s.selectedOptions[0]?.text.trim() ?? '')

    // which firm she starts in depends on where she last worked; start from whichever it is
    const before = await selected()
    expect([FIRM_NAME, SECOND_FIRM_NAME]).toContain(before)
    const after = before === FIRM_NAME ? SECOND_FIRM_NAME : FIRM_NAME
    const firmLine = page.getByTestId('dashboard-heading').locator('xpath=following-sibling::p[1]')
    await expectText(firmLine, `${before} · Accountant`)
    await screenshot(page, 'accountant-desktop-before-switch')

    await select.selectOption({ label: after })
    await expectText(firmLine, `${after} · Accountant`)
    await expectText(page.getByTestId('dashboard-accountant'), `You can read ${after}'s money`)
    expect(await page.getByTestId('dashboard-accountant').innerText()).not.toContain(`${before}'s`)
    await expect.poll(selected).toBe(after)
    await screenshot(page, 'accountant-desktop-after-switch')

    // the server remembers the firm: a reload stays in it
    await reload(page)
    await expectText(firmLine, `${after} · Accountant`)
    expect(await selected()).toBe(after)

    // and back again
    await page.getByTestId('firm-switch').selectOption({ label: before })
    await expectText(firmLine, `${before} · Accountant`)
    await expect.poll(selected).toBe(before)

    expectCleanRun(priya)
  })
})

/** The screen size of the office's and the accountant's laptops. */
const LAPTOP = { width: 1366, height: 900 }

interface VatAnswer { boxes: Record<string, number>, entries: { vatPence: number, netPence: number }[] }

/**
 * Every money figure the firm the session is in has for this quarter and the last one (the quarters
 * Today and the quarter screen show), as the screen writes them ("£1,234.56"), read from the API.
 */
async function firmFigures(page: Page, url: string): Promise<Set<string>> {
  const me = await (await page.request.get(`${url}/api/firm`)).json() as { vatStagger?: number }
  const today = londonToday()
  const thisQuarter = vatQuarter(today, (me.vatStagger ?? 1) as 1 | 2 | 3)
  const figures = new Set<string>()
  for (const quarterOf of [today, addDays(thisQuarter.start, -1)]) {
    const res = await page.request.get(`${url}/api/vat-return?quarterOf=${quarterOf}`)
    expect(res.status()).toBe(200)
    const vat = await res.json() as VatAnswer
    for (const pence of [...Object.values(vat.boxes), ...vat.entries.flatMap(e => [e.vatPence, e.netPence])]) {
      if (pence) figures.add(formatPence(Math.abs(pence)))
    }
  }
  return figures
}

/** The firm the session is in, chosen through the API (then the page is loaded again), so a test starts where it means to. */
async function workIn(page: Page, url: string, firmName: string) {
  const me = await (await page.request.get(`${url}/api/me`)).json() as { firms: { id: string, tradingName: string }[] }
  const firm = me.firms.find(f => f.tradingName === firmName)
  expect(firm, `the accountant serves ${firmName}`).toBeTruthy()
  expect((await page.request.put(`${url}/api/me/firm`, { data: { firmId: firm!.id } })).status()).toBe(200)
  await reload(page)
}

/** The figures of `figures` the main part of the screen shows. */
async function shownOf(page: Page, figures: Iterable<string>): Promise<string[]> {
  const text = await page.getByRole('main').innerText()
  return [...figures].filter(f => text.includes(f))
}

describe('switching firm leaves nothing of the first firm on screen', () => {
  it('the accountant, on Today and on the quarter, switches firm and no figure of the first firm stays', async () => {
    const priya = await e2e.open({ desktop: true })
    const { page } = priya
    await page.setViewportSize(LAPTOP)
    await signInToDashboard(page, e2e.url, ACCOUNTANT.email, ACCOUNTANT.password)
    await workIn(page, e2e.url, FIRM_NAME)
    const select = page.getByTestId('firm-switch')

    // the two firms' figures, from the API: the demo firm has a quarter of work, the second firm none
    const firstFigures = await firmFigures(page, e2e.url)
    await workIn(page, e2e.url, SECOND_FIRM_NAME)
    const secondFigures = await firmFigures(page, e2e.url)
    await workIn(page, e2e.url, FIRM_NAME)
    /** What only the first firm has: none of it may be on screen once the second firm is chosen. */
    const firstOnly = [...firstFigures].filter(f => !secondFigures.has(f))
    expect(firstOnly.length, 'the demo firm has figures the second firm has not').toBeGreaterThan(0)

    // Today: the first firm's quarter figures are on screen
    await expectVisible(page.getByTestId('dashboard-heading'))
    await expect.poll(async () => (await shownOf(page, firstOnly)).length).toBeGreaterThan(0)

    await select.selectOption({ label: SECOND_FIRM_NAME })
    await expectText(page.getByTestId('dashboard-accountant'), `You can read ${SECOND_FIRM_NAME}'s money`)
    await expectAbsent(page.getByTestId('firm-switching'))
    await expectPath(page, '/')
    expect(await shownOf(page, firstOnly), 'figures of the first firm left on Today').toEqual([])
    // the first firm is named only in the list of the other firms served, by its name and a due date
    const mainBesideOthers = await page.getByRole('main').evaluate((m) => {
      const copy = m.cloneNode(true) as HTMLElement
      copy.querySelector('[data-testid="dashboard-other-firms"]')?.remove()
      return copy.textContent ?? ''
    })
    expect(mainBesideOthers).not.toContain(FIRM_NAME)
    await expectText(page.getByTestId('dashboard-other-firms'), FIRM_NAME)
    await screenshot(page, 'accountant-laptop-today-after-switch')

    // the quarter screen: the first firm's VAT return, then the second firm's quarter on the same screen
    await workIn(page, e2e.url, FIRM_NAME)
    await visit(page, `${e2e.url}/quarter`)
    await expectVisible(page.getByTestId('vat-return'))
    await expect.poll(async () => (await shownOf(page, firstOnly)).length).toBeGreaterThan(0)
    await expectVisible(page.getByRole('main').getByRole('link', { name: /CIS deducted by contractors/ }))
    await screenshot(page, 'accountant-laptop-quarter-first-firm')

    await page.getByTestId('firm-switch').selectOption({ label: SECOND_FIRM_NAME })
    await expectAbsent(page.getByTestId('firm-switching'))
    // she stays on the quarter, now the second firm's
    await expectPath(page, '/quarter')
    await expectVisible(page.getByTestId('quarter-sales'))
    await expect.poll(() => select.evaluate((s: HTMLSelectElement) => s.selectedOptions[0]?.text.trim() ?? '')).toBe(SECOND_FIRM_NAME)
    expect(await shownOf(page, firstOnly), 'figures of the first firm left on the quarter').toEqual([])
    // the second firm is not VAT-registered and not under CIS: no VAT return, no CIS figures
    expect(await page.getByTestId('vat-return').count()).toBe(0)
    expect(await page.getByRole('main').getByText(/return and payment due/i).count()).toBe(0)
    expect(await page.getByRole('main').getByRole('link', { name: /CIS deducted by contractors/ }).count()).toBe(0)
    await screenshot(page, 'accountant-laptop-quarter-second-firm')

    expectCleanRun(priya)
  })
})

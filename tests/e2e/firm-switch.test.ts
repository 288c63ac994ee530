// Journey 3: the accountant, who serves two firms, works on a desktop and switches between them
// with the firm menu in the header.
import { describe, expect, it } from 'vitest'
import { expectCleanRun, expectText, expectVisible, menuLabels, reload, screenshot, signInToDashboard, useE2E } from './browser'
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

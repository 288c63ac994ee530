// Asking before a change that cannot be undone is a dialog of Setwell's own (useConfirm), not the
// browser's confirm(): a crew member on a phone makes a new calendar link only when they say so.
import { describe, expect, it } from 'vitest'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { CREW } from './demo'

const e2e = useE2E()

async function status(url: string) {
  return (await fetch(url)).status
}

describe('a question before a change that cannot be undone', () => {
  it('a new calendar link is made only on "Make a new link"; Escape and "Go back" keep the old one working', async () => {
    const kieran = await e2e.open()
    const { page } = kieran
    // a browser confirm() would be answered here, and the test would fail on it
    const browserDialogs: string[] = []
    page.on('dialog', (d) => {
      browserDialogs.push(d.message())
      void d.dismiss()
    })
    await signInToDashboard(page, e2e.url, CREW.email, CREW.password)
    await visit(page, `${e2e.url}/account`)
    const feed = page.getByTestId('calendar-feed')
    const shown = feed.getByLabel(/Your calendar link/)
    const ask = page.getByRole('alertdialog')

    // a link to start from: the first needs no question; one made before is replaced, after saying yes
    if (await feed.getByRole('button', { name: 'Make my calendar link' }).count()) {
      await feed.getByRole('button', { name: 'Make my calendar link' }).click()
    }
    else {
      await feed.getByRole('button', { name: 'Make a new calendar link' }).click()
      await ask.getByRole('button', { name: 'Make a new link' }).click()
    }
    await expectVisible(shown)
    const first = await shown.inputValue()
    expect(await status(first)).toBe(200)

    // Escape says no
    await feed.getByRole('button', { name: 'Make a new calendar link' }).click()
    await expectText(ask, 'Make a new calendar link?')
    await expectText(ask, 'The old one stops working at once')
    await screenshot(page, 'dialog-new-calendar-link-phone')
    await page.keyboard.press('Escape')
    await expectAbsent(ask)
    expect(await shown.inputValue()).toBe(first)
    expect(await status(first)).toBe(200)

    // so does "Go back"
    await feed.getByRole('button', { name: 'Make a new calendar link' }).click()
    await ask.getByRole('button', { name: 'Go back' }).click()
    await expectAbsent(ask)
    expect(await shown.inputValue()).toBe(first)
    expect(await status(first)).toBe(200)

    // "Make a new link" makes one, and the old one stops working
    await feed.getByRole('button', { name: 'Make a new calendar link' }).click()
    await ask.getByRole('button', { name: 'Make a new link' }).click()
    await expectAbsent(ask)
    await expect.poll(() => shown.inputValue()).not.toBe(first)
    const second = await shown.inputValue()
    expect(await status(second)).toBe(200)
    expect(await status(first)).toBe(404)

    expect(browserDialogs).toEqual([])
    expectCleanRun(kieran)
  })
})

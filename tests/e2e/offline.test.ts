// With no signal on site (390 x 844): Setwell opened once with a signal opens again with none.
import { describe, expect, it } from 'vitest'
import { expectVisible, screenshot, signInToDashboard, useE2E } from './browser'
import { CREW } from './demo'

const e2e = useE2E()

describe('offline', () => {
  it('Today opens again with no signal after one visit with a signal', async () => {
    const kieran = await e2e.open()
    const page = kieran.page
    await signInToDashboard(page, e2e.url, CREW.email, CREW.password)
    await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 30_000 })
    await page.waitForFunction(() => Object.keys(localStorage).some(k => k.startsWith('setwell:kept:')), undefined, { timeout: 30_000 })
    await kieran.context.setOffline(true)
    await page.reload()
    await page.waitForTimeout(3000)
    await screenshot(page, 'offline-today')
    console.log(await page.evaluate(() => navigator.onLine))
    await expectVisible(page.getByTestId('dashboard-jobs'))
    expect(1).toBe(1)
  })
})

// Journey 4: signing out returns to the sign-in page, and the app stays closed afterwards.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectPath, expectText, expectVisible, signInToDashboard, useE2E, visit } from './browser'
import { OWNER, firstName } from './demo'

const e2e = useE2E()

describe('signing out', () => {
  it('sign out returns to sign-in, and Today then redirects to sign-in', async () => {
    const jess = await e2e.open()
    const { page, context } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await expectText(page.getByTestId('dashboard-heading'), `Hello, ${firstName(OWNER)}`)
    const session = (await context.cookies(e2e.url)).find(c => c.name === 'setwell-session')
    expect(session, 'a session cookie after signing in').toBeDefined()

    await page.getByRole('button', { name: 'Sign out' }).click()
    await expectPath(page, '/sign-in')
    await expectVisible(page.getByRole('button', { name: 'Sign in' }))
    expect(await page.getByTestId('dashboard-heading').count()).toBe(0)

    // a fresh visit to Today is sent back to sign in
    await visit(page, `${e2e.url}/`)
    await expectPath(page, '/sign-in')
    await expectVisible(page.getByLabel('E-mail'))
    expect(await page.getByTestId('dashboard-heading').count()).toBe(0)

    // the old cookie is dead on the server too, not only forgotten by this browser
    const replay = new Client(e2e.url)
    replay.setCookieHeader(`${session!.name}=${session!.value}`)
    expect((await replay.get('/api/me')).status).toBe(401)

    expectCleanRun(jess)
  })

  it('after signing out, a deep link asks for sign-in and then returns to that page', async () => {
    const jess = await e2e.open()
    const { page } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await page.getByRole('button', { name: 'Sign out' }).click()
    await expectPath(page, '/sign-in')

    await visit(page, `${e2e.url}/team`)
    await expectPath(page, '/sign-in')
    expect(new URL(page.url()).searchParams.get('next')).toBe('/team')

    await page.getByLabel('E-mail').fill(OWNER.email)
    await page.getByLabel('Password').fill(OWNER.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expectPath(page, '/team')
    await expectVisible(page.getByTestId('invite-form'))

    expectCleanRun(jess)
  })
})

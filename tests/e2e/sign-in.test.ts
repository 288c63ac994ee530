// Journey 1: the demo owner signs in on a phone and reaches Today; a wrong password is refused
// with the vague message, and the e-mail typed stays in the field.
import { describe, expect, it } from 'vitest'
import { expectCleanRun, expectPath, expectText, expectVisible, menuLabels, screenshot, signIn, textOf, useE2E, visit } from './browser'
import { FIRM_NAME, OWNER, firstName } from './demo'

const e2e = useE2E()

describe('sign in', () => {
  it('the owner signs in on a phone and reaches the dashboard with the full menu', async () => {
    const jess = await e2e.open()
    const { page } = jess

    await visit(page, `${e2e.url}/`)
    // signed out, Today sends you to the sign-in page first
    await expectPath(page, '/sign-in')
    await expectText(page.getByRole('heading', { level: 1 }), 'Sign in')

    await signIn(page, e2e.url, OWNER.email, OWNER.password)
    await expectPath(page, '/')
    await expectText(page.getByTestId('dashboard-heading'), `Hello, ${firstName(OWNER)}`)
    await expectVisible(page.getByTestId('dashboard-owner'))
    expect(await page.getByTestId('dashboard-crew').count()).toBe(0)
    await expectText(page.getByText(`${FIRM_NAME} · Owner`), FIRM_NAME)
    expect(await page.title()).toBe('Today · Setwell')

    // an owner's bottom bar: four sections and More (which holds Enquiries, Customers and Settings)
    expect(await menuLabels(page)).toEqual(['Today', 'Visits', 'Jobs', 'Money'])
    await expectVisible(page.getByTestId('nav-more'))
    expect(await textOf(page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Today' }))).toBe('Today')
    expect(await page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Today' }).getAttribute('aria-current')).toBe('page')

    await screenshot(page, 'owner-dashboard')
    expectCleanRun(jess)
  })

  it('a wrong password shows the vague message and keeps the e-mail typed', async () => {
    const someone = await e2e.open()
    const { page } = someone

    await signIn(page, e2e.url, OWNER.email, 'not-the-right-password-9')

    const alert = page.getByRole('alert')
    await expectText(alert, 'That e-mail and password do not match an account.')
    // it does not say which of the two was wrong
    expect(await alert.innerText()).not.toMatch(/password is wrong|no account|unknown/i)
    await expectPath(page, '/sign-in')
    expect(await page.getByLabel('E-mail').inputValue()).toBe(OWNER.email)
    expect(await page.getByLabel('Password').inputValue()).toBe('')
    expect(await page.getByRole('button', { name: 'Sign in' }).isEnabled()).toBe(true)
    expect(await page.getByTestId('dashboard-heading').count()).toBe(0)

    await screenshot(page, 'sign-in-wrong-password')

    // and the right password still works from here
    await page.getByLabel('Password').fill(OWNER.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expectPath(page, '/')
    await expectText(page.getByTestId('dashboard-heading'), `Hello, ${firstName(OWNER)}`)
    expectCleanRun(someone)
  })
})

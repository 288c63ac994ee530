// The office partner chases on a phone (390 x 844): from what is owed to the demo builder's
// overdue invoice, its chase log, a call noted, the statutory claim worked out with its caution
// and letter; then the reminder words changed, a bad day refused beside its field.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OFFICE } from './demo'

const e2e = useE2E()

describe('chasing what is owed', () => {
  it('notes a call, works out the late-payment claim on a builder\'s overdue invoice, and edits the reminders', async () => {
    const sam = await e2e.open()
    const page = sam.page
    await signInToDashboard(page, e2e.url, OFFICE.email, OFFICE.password)
    await visit(page, `${e2e.url}/owed`)
    const builder = page.getByTestId('owed-customers').locator('li.card', { hasText: 'Stonegate Builds Ltd' })
    await expectVisible(builder)
    // the builder's overdue invoice (the demo's only one owing from them)
    await builder.getByRole('link', { name: /\b[A-Z]+-\d+\b/ }).first().click()
    await page.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    await expectText(page.getByTestId('invoice-status'), 'Overdue')
    const chase = page.getByTestId('chase')
    await expectVisible(chase.getByText('Reminder 14 days after the due date'))

    await chase.getByLabel('Add to the log').selectOption('call')
    await chase.getByLabel('What was said').fill('Priti says it is in this week\'s payment run')
    await chase.getByRole('button', { name: 'Add to the log' }).click()
    await expectVisible(chase.getByText('Priti says it is in this week\'s payment run'))

    const claim = page.getByTestId('late-claim')
    await claim.getByRole('button', { name: 'Work out the claim' }).click()
    await expectVisible(claim.getByText(/Interest, \d+ days at \d+(\.\d+)?% from/))
    await expectVisible(claim.getByText(/not legal advice/))
    await expectVisible(claim.getByRole('link', { name: 'Download the claim letter' }))
    await screenshot(page, 'late-claim')

    // the reminders' words; a bad day is named beside its field, the rest kept
    await visit(page, `${e2e.url}/chasing`)
    await expectVisible(page.getByRole('heading', { name: 'Reminders' }))
    const first = page.getByLabel('Days from the due date').first()
    await first.fill('soon')
    await page.getByLabel('Subject').first().fill('Invoice {reference} falls due on {due}')
    await page.getByRole('button', { name: 'Save reminders' }).click()
    await expectVisible(page.getByRole('alert').filter({ hasText: 'Enter whole days' }))
    expect(await page.getByLabel('Subject').first().inputValue()).toBe('Invoice {reference} falls due on {due}')
    await first.fill('-2')
    await page.getByRole('button', { name: 'Save reminders' }).click()
    await expectVisible(page.getByText('Saved.'))
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OFFICE.email, password: OFFICE.password })
    expect((await api.get('/api/reminders')).body[0]).toMatchObject({ offsetDays: -2, subject: 'Invoice {reference} falls due on {due}' })
    expectCleanRun(sam)
  })
})

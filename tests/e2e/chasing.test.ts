// The office partner chases on a phone (390 x 844): from what is owed to the demo builder's
// overdue invoice, its chase log, a call with a promise noted (a past day refused beside its field),
// an entry removed the same day, the statutory claim worked out with its caution
// and letter; then the reminder words changed, a bad day refused beside its field.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { addDays, londonToday } from '../../shared/utils/dates'
import { PROMISE_DATE_PAST } from '../../shared/utils/chase'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OFFICE } from './demo'

const e2e = useE2E()

describe('chasing what is owed', () => {
  it('notes a call, works out the late-payment claim on a builder\'s overdue invoice, and edits the reminders', async () => {
    const sam = await e2e.open()
    const page = sam.page
    await signInToDashboard(page, e2e.url, OFFICE.email, OFFICE.password)
    await visit(page, `${e2e.url}/owed`)
    const builder = page.getByTestId('owed-customers').locator('li.card', { hasText: 'Pribbleworth Scarnholme Builds Ltd' })
    await expectVisible(builder)
    // the builder's overdue invoice (the older of the two they owe: the list is by due date)
    await builder.getByRole('link', { name: /BP-\d+/ }).first().click()
    await page.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    await expectText(page.getByTestId('invoice-status'), 'Overdue')
    const chase = page.getByTestId('chase')
    await expectVisible(chase.getByText('Reminder 14 days after the due date'))

    // a call and its promise in one entry; a day already past is refused beside its field, nothing typed lost
    await chase.getByLabel('How you chased').selectOption('call')
    await chase.getByLabel('How it went').selectOption('promised')
    await chase.getByLabel('Amount promised (£)').fill('500')
    await chase.getByLabel('Promised to pay by').fill(addDays(londonToday(), -1))
    await chase.getByLabel('What was said').fill('Priti says it is in this week\'s payment run')
    await chase.getByRole('button', { name: 'Add to the log' }).click()
    await expectVisible(chase.getByText(PROMISE_DATE_PAST))
    expect(await chase.getByLabel('What was said').inputValue()).toBe('Priti says it is in this week\'s payment run')
    expect(await chase.getByLabel('Amount promised (£)').inputValue()).toBe('500')
    await chase.getByLabel('Promised to pay by').fill(londonToday())
    await chase.getByRole('button', { name: 'Add to the log' }).click()
    await expectVisible(chase.getByText('Priti says it is in this week\'s payment run'))
    await expectVisible(chase.getByText(/£500\.00 promised by/))

    // an entry written by mistake, taken back out the same day (asked first)
    await chase.getByLabel('How you chased').selectOption('letter')
    await chase.getByLabel('How it went').selectOption('no-reply')
    await chase.getByLabel('What was said').fill('Sent to the wrong office')
    await chase.getByRole('button', { name: 'Add to the log' }).click()
    const mistake = chase.getByTestId('chase-log').locator('li', { hasText: 'Sent to the wrong office' })
    await expectVisible(mistake)
    await mistake.getByRole('button', { name: 'Remove' }).click()
    await page.getByRole('alertdialog').getByRole('button', { name: 'Remove the entry' }).click()
    await expectAbsent(mistake)
    await expectVisible(chase.getByText('Priti says it is in this week\'s payment run'))

    const claim = page.getByTestId('late-claim')
    await claim.getByRole('button', { name: 'Work out the claim' }).click()
    await expectVisible(claim.getByText(/Interest, \d+ days at \d+(\.\d+)?% from/))
    await expectVisible(claim.getByText(/not legal advice/))
    await expectVisible(claim.getByRole('link', { name: 'Download the claim letter' }))
    await expectVisible(claim.getByText(/it is not in the letter/))
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
    // each set of words says which stage it is for
    await expectVisible(page.getByText('Before the due date: sent 2 days before it', { exact: true }))
    await expectVisible(page.getByText('On the due date', { exact: true }))
    await page.getByRole('button', { name: 'Save reminders' }).click()
    await expectVisible(page.getByText('Saved.'))
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OFFICE.email, password: OFFICE.password })
    expect((await api.get('/api/reminders')).body[0]).toMatchObject({ offsetDays: -2, subject: 'Invoice {reference} falls due on {due}' })
    expectCleanRun(sam)
  })
})

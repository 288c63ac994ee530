// Is the work paying? The owner of a new firm, on a phone (390 x 844), sets up two jobs through the
// API (days worked, a receipt, invoices), opens the profit table, sees both jobs and the totals,
// sorts by the day rate earned, narrows to one kind of customer, sees the chart, and downloads the CSV.
import { readFile } from 'node:fs/promises'
import { describe, expect, it } from 'vitest'
import { GOOD_PASSWORD, signUpFirm, uniqueEmail, type Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { addDays } from '#shared/utils/dates'

const e2e = useE2E()

/** Today in the UK, as the page works it out. */
function londonToday() {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/London', year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(new Date())
  const part = (type: string) => parts.find(p => p.type === type)!.value
  return `${part('year')}-${part('month')}-${part('day')}`
}

async function setUp(owner: Client, today: string) {
  const me = (await owner.get('/api/me')).body
  const firm = (await owner.get('/api/firm')).body
  const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, ...fields } = firm
  expect((await owner.patch('/api/firm', { ...fields, dayRatePence: 200_00 })).status).toBe(200)
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Elin Brough', email: uniqueEmail('elin') } })).body
  const made: { id: string, reference: string }[] = []
  // job 1: a day, £100.00 of materials, £600.00 invoiced -> £500.00 a day; job 2: two days, £250.00 invoiced -> £125.00 a day
  for (const [title, days, pricePence, materialsPence] of [['Skim the kitchen', 1, 600_00, 100_00], ['Boarding and skim, loft', 2, 250_00, 0]] as const) {
    const job = (await owner.post('/api/jobs', { customerId: c.id, title })).body
    made.push(job)
    const booked = await owner.put(`/api/jobs/${job.id}/days`, { days: Array.from({ length: days }, (_, i) => ({ day: addDays(today, -10 + i), userId: me.user.id })) })
    expect(booked.status, JSON.stringify(booked.body)).toBe(200)
    for (const d of booked.body.days) expect((await owner.patch(`/api/job-days/${d.id}`, { worked: true })).status).toBe(200)
    if (materialsPence) expect((await owner.post('/api/purchases', { supplier: 'Wharf Road yard', boughtOn: addDays(today, -11), category: 'materials', netPence: materialsPence, jobs: [{ jobId: job.id, netPence: materialsPence }] })).status).toBe(201)
    const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id, jobId: job.id })).body
    expect((await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: title, quantityX1000: 1000, unitPence: pricePence }] })).status).toBe(200)
    expect((await owner.post(`/api/invoices/${draft.id}/issue`)).status).toBe(200)
  }
  return made
}

describe('is the work paying?', () => {
  it('the owner on a phone sees the jobs against the target day rate, sorts them, and downloads the CSV', async () => {
    const { client: api, email } = await signUpFirm(e2e.url, 'Brough Plastering')
    const today = londonToday()
    const [kitchen, loft] = await setUp(api, today)

    const owner = await e2e.open()
    const page = owner.page
    await signInToDashboard(page, e2e.url, email, GOOD_PASSWORD)
    await visit(page, `${e2e.url}/profit`)
    await expectVisible(page.getByRole('heading', { name: 'Is the work paying?' }))
    const table = page.getByTestId('profit-table')
    await expectVisible(table)
    const kitchenRow = table.locator(`tr[data-job="${kitchen!.reference}"]`)
    await expectText(kitchenRow, 'Elin Brough')
    await expectText(kitchenRow, '£500.00')
    await expectText(table.locator(`tr[data-job="${loft!.reference}"]`), '£125.00')
    // in all: £850.00 invoiced, £750.00 left after £100.00 of materials, over 3 days = £250.00 a day
    await expectText(page.getByTestId('profit-totals'), /£850\.00.*£100\.00.*3 days.*£750\.00.*£250\.00/)
    await expectText(page.getByTestId('profit-day-rate'), '£250.00')
    // the caution opens from its note
    await page.getByText('Rule of thumb: read this first').click()
    await expectVisible(page.getByText(/Your accountant decides what your books say/))

    // the page itself never scrolls sideways on a phone: the table scrolls in its own box
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)

    // sort by the day rate earned: largest first, then smallest first
    const order = async () => table.locator('tbody tr').evaluateAll(rows => rows.map(r => r.getAttribute('data-job')))
    const rateHeading = table.locator('th', { has: page.getByRole('button', { name: 'Day rate earned' }) })
    await rateHeading.getByRole('button').click()
    await expect.poll(async () => rateHeading.getAttribute('aria-sort')).toBe('descending')
    expect(await order()).toEqual([kitchen!.reference, loft!.reference])
    await rateHeading.getByRole('button').click()
    await expect.poll(async () => rateHeading.getAttribute('aria-sort')).toBe('ascending')
    expect(await order()).toEqual([loft!.reference, kitchen!.reference])

    // the chart, drawn in the browser, with its words for those who cannot see it
    const chart = page.getByTestId('profit-chart')
    await expectVisible(chart.locator('canvas[role="img"]'))
    expect(await chart.locator('canvas').getAttribute('aria-label')).toMatch(/target day rate of £200\.00: 1 below it/)
    await screenshot(page, 'profit-phone')

    // narrow to landlords: none; back to every kind
    await page.getByLabel('Customers').selectOption('landlord')
    await expectVisible(page.getByTestId('profit-empty'))
    expect(new URL(page.url()).searchParams.get('customerKind')).toBe('landlord')
    await page.getByLabel('Customers').selectOption('')
    await expectVisible(page.getByTestId('profit-table'))

    // the CSV: the same jobs, named for the period
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download as CSV' }).click(),
    ])
    expect(download.suggestedFilename()).toBe(`setwell-profit-${addDays(today, -89)}-to-${today}.csv`)
    const text = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '')
    const lines = text.trim().split('\r\n')
    expect(lines[0]).toMatch(/^Job,Job title,Customer,/)
    expect(lines).toHaveLength(3)
    expect(text).toContain(`${kitchen!.reference},Skim the kitchen,Elin Brough,Homeowner`)
    expect(text).toContain('500.00')
    expectCleanRun(owner)
  })
})

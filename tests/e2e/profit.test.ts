// Is the work paying? The owner of a new firm sets up three jobs through the API (days worked, a
// receipt, invoices): two finished, one still on site with only a deposit invoiced. On a phone
// (390 x 844) each job is a card with its day rate against the firm's target in words and a shape,
// the job on site apart from the totals (a toggle counts it), nothing wider than the screen; the
// chart and the CSV. On a laptop (1366 x 900) the table's chosen columns all fit, sort, and "Show
// every figure" adds the rest.
import { readFile } from 'node:fs/promises'
import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import { GOOD_PASSWORD, signUpFirm, uniqueEmail, type Client } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, textOf, useE2E, visit } from './browser'
import { addDays } from '#shared/utils/dates'

const e2e = useE2E()

/** Today in the UK, as the page works it out. */
function londonToday() {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/London', year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(new Date())
  const part = (type: string) => parts.find(p => p.type === type)!.value
  return `${part('year')}-${part('month')}-${part('day')}`
}

async function move(owner: Client, jobId: string, ...steps: ('in-progress' | 'finished')[]) {
  for (const to of steps) {
    const res = await owner.post(`/api/jobs/${jobId}/status`, { to })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
  }
}

async function setUp(owner: Client, today: string) {
  const me = (await owner.get('/api/me')).body
  const firm = (await owner.get('/api/firm')).body
  const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, ...fields } = firm
  expect((await owner.patch('/api/firm', { ...fields, dayRatePence: 200_00 })).status).toBe(200)
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Elin Brough', email: uniqueEmail('elin') } })).body
  const made: { id: string, reference: string }[] = []
  // job 1: a day, £100.00 of materials, £600.00 invoiced -> £500.00 a day, finished
  // job 2: two days, £250.00 invoiced -> £125.00 a day, finished
  // job 3: two days so far, still on site, won at £1,200.00, a deposit of £201.28 invoiced -> £100.64 a day so far
  const plan = [
    { title: 'Skim the kitchen', from: -10, days: 1, pricePence: 600_00, materialsPence: 100_00, finished: true },
    { title: 'Boarding and skim, loft', from: -10, days: 2, pricePence: 250_00, materialsPence: 0, finished: true },
    { title: 'Board and skim the extension', from: -3, days: 2, pricePence: 201_28, materialsPence: 0, finished: false },
  ]
  for (const p of plan) {
    const job = (await owner.post('/api/jobs', { customerId: c.id, title: p.title, ...(p.finished ? {} : { labourNetPence: 1_000_00, materialsNetPence: 200_00 }) })).body
    made.push(job)
    const booked = await owner.put(`/api/jobs/${job.id}/days`, { days: Array.from({ length: p.days }, (_, i) => ({ day: addDays(today, p.from + i), userId: me.user.id })) })
    expect(booked.status, JSON.stringify(booked.body)).toBe(200)
    for (const d of booked.body.days) expect((await owner.patch(`/api/job-days/${d.id}`, { worked: true })).status).toBe(200)
    if (p.materialsPence) expect((await owner.post('/api/purchases', { supplier: 'Wharf Road yard', boughtOn: addDays(today, -11), category: 'materials', netPence: p.materialsPence, jobs: [{ jobId: job.id, netPence: p.materialsPence }] })).status).toBe(201)
    const draft = p.finished
      ? (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id, jobId: job.id })).body
      : (await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, amountPence: p.pricePence })).body
    if (p.finished) expect((await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: p.title, quantityX1000: 1000, unitPence: p.pricePence }] })).status).toBe(200)
    expect((await owner.post(`/api/invoices/${draft.id}/issue`)).status).toBe(200)
    await move(owner, job.id, ...(p.finished ? ['in-progress', 'finished'] as const : ['in-progress'] as const))
  }
  return made
}

/** The page never scrolls sideways: nothing on it is wider than the screen. */
async function pageWidth(page: Page) {
  return page.evaluate(() => ({ scrollWidth: document.scrollingElement!.scrollWidth, clientWidth: document.scrollingElement!.clientWidth }))
}

describe('is the work paying?', () => {
  it('the owner on a phone reads a card a job, the job on site apart; on a laptop every chosen column fits, and the CSV', async () => {
    const { client: api, email } = await signUpFirm(e2e.url, 'Brough Plastering')
    const today = londonToday()
    const [kitchen, loft, extension] = await setUp(api, today)

    const owner = await e2e.open()
    const page = owner.page
    await signInToDashboard(page, e2e.url, email, GOOD_PASSWORD)
    await visit(page, `${e2e.url}/profit`)
    await expectVisible(page.getByRole('heading', { name: 'Is the work paying?' }))

    // a card a job; the table is for wider screens
    const cards = page.getByTestId('profit-cards')
    await expectVisible(cards)
    await expectAbsent(page.getByTestId('profit-table'))
    const card = (ref: string) => cards.locator(`[data-testid="profit-card"][data-job="${ref}"]`)
    const kitchenCard = await textOf(card(kitchen!.reference))
    expect(kitchenCard).toContain('Elin Brough')
    expect(kitchenCard).toMatch(/Day rate earned £500\.00 a day/)
    expect(kitchenCard).toContain('Your target day rate £200.00')
    expect(kitchenCard).toContain('▲ £300.00 a day above your target')
    expect(kitchenCard).toContain('Costs materials £100.00 from receipts £100.00')
    expect(kitchenCard).toMatch(/Margin on the price left after costs as a share of the price; not the day rate 83\.3%/)
    const loftCard = await textOf(card(loft!.reference))
    expect(loftCard).toMatch(/Day rate earned £125\.00 a day/)
    expect(loftCard).toContain('▼ £75.00 a day below your target')
    expect(loftCard).toContain('Costs none recorded £0.00')
    // the job on site: its day rate so far, not judged (no red "below"), listed apart after its heading
    const extensionCard = await textOf(card(extension!.reference))
    expect(extensionCard).toMatch(/Day rate so far £100\.64 a day/)
    expect(extensionCard).toContain('◐ Still on site: figures so far')
    expect(extensionCard).toContain('invoiced so far, of £1,200.00 as won')
    expect(extensionCard).not.toMatch(/below your target|above your target/)
    expect(await card(extension!.reference).locator('[data-standing]').getAttribute('data-standing')).toBe('on-site')
    const order = async () => cards.locator('[data-testid="profit-card"], [data-testid="profit-on-site-heading"]').evaluateAll(els => els.map(e => e.getAttribute('data-job') ?? 'on site'))
    // latest last day first: the loft's was a day after the kitchen's
    expect(await order()).toEqual([loft!.reference, kitchen!.reference, 'on site', extension!.reference])

    // every job's day rate is on the screen, and nothing is wider than it
    for (const [ref, rate] of [[kitchen!.reference, '£500.00'], [loft!.reference, '£125.00'], [extension!.reference, '£100.64']] as const) {
      const rateBox = card(ref).getByTestId('profit-card-rate')
      await expectText(rateBox, rate)
      const box = (await rateBox.boundingBox())!
      expect(box.x).toBeGreaterThanOrEqual(0)
      expect(box.x + box.width).toBeLessThanOrEqual(390)
      expect(await card(ref).evaluate(el => el.scrollWidth <= el.clientWidth)).toBe(true)
    }
    const width = await pageWidth(page)
    expect(width.scrollWidth).toBeLessThanOrEqual(width.clientWidth)
    expect(width.clientWidth).toBeLessThanOrEqual(390)

    // the totals: the two finished jobs, £850.00 invoiced, £750.00 left after £100.00 of materials, over 3 days = £250.00 a day
    const summary = page.getByTestId('profit-summary')
    await expectText(page.getByTestId('profit-day-rate'), '£250.00')
    await expectText(page.getByTestId('profit-jobs-counted'), '2')
    await expectText(summary, /Price before VAT £850\.00 Left after costs £750\.00/)
    await expectText(page.getByTestId('profit-summary-verdict'), '▲ £50.00 a day above your target')
    await expectText(page.getByTestId('profit-on-site'), '◐ 1 job still on site: not in these totals')
    // counted on asking: (750.00 + 201.28) / 5 days = £190.256 -> £190.26, and the address keeps it
    await page.getByLabel('Count the jobs still on site in the totals').check()
    await expectText(page.getByTestId('profit-day-rate'), '£190.26')
    expect(new URL(page.url()).searchParams.get('onSite')).toBe('include')
    await expectText(page.getByTestId('profit-on-site'), 'counted above, figures so far')
    await expectText(page.getByTestId('profit-summary-verdict'), '▼ £9.74 a day below your target')
    await page.getByLabel('Count the jobs still on site in the totals').uncheck()
    await expectText(page.getByTestId('profit-day-rate'), '£250.00')
    expect(new URL(page.url()).searchParams.get('onSite')).toBeNull()

    // highest day rate first, the job on site still apart
    await page.getByLabel('Order of the jobs').selectOption({ label: 'Highest day rate first' })
    await expect.poll(order).toEqual([kitchen!.reference, loft!.reference, 'on site', extension!.reference])

    // the caution opens from its note
    await page.getByText('Rule of thumb: read this first').click()
    await expectVisible(page.getByText(/Your accountant decides what your books say/))
    await expectVisible(page.getByTestId('profit-on-site-caution'))

    // the chart, drawn in the browser, of the jobs the totals count, with its words for those who cannot see it
    const chart = page.getByTestId('profit-chart')
    await expectVisible(chart.locator('canvas[role="img"]'))
    expect(await chart.locator('canvas').getAttribute('aria-label')).toMatch(/each of 2 jobs.*target day rate of £200\.00: 1 below it/)
    await screenshot(page, 'profit-phone')

    // narrow to landlords: none; back to every kind
    await page.getByLabel('Customers').selectOption('landlord')
    await expectVisible(page.getByTestId('profit-empty'))
    expect(new URL(page.url()).searchParams.get('customerKind')).toBe('landlord')
    await page.getByLabel('Customers').selectOption('')
    await expectVisible(page.getByTestId('profit-cards'))

    // the CSV: the same jobs, named for the period, the one on site saying so
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download as CSV' }).click(),
    ])
    expect(download.suggestedFilename()).toBe(`setwell-profit-${addDays(today, -89)}-to-${today}.csv`)
    const text = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '')
    const lines = text.trim().split('\r\n')
    expect(lines[0]).toMatch(/^Job,Job title,Customer,.*,Margin on the price \(percent\),Still on site \(figures so far\)$/)
    expect(lines).toHaveLength(4)
    expect(text).toContain(`${kitchen!.reference},Skim the kitchen,Elin Brough,Homeowner`)
    expect(text).toContain('500.00')
    expect(lines.find(l => l.startsWith(`${extension!.reference},`))).toMatch(/,100\.64,.*,Yes$/)
    expectCleanRun(owner)

    // on a laptop, 1366 x 900: the table, its chosen columns all in view
    const laptop = await e2e.open({ desktop: true })
    const desk = laptop.page
    await desk.setViewportSize({ width: 1366, height: 900 })
    await signInToDashboard(desk, e2e.url, email, GOOD_PASSWORD)
    await visit(desk, `${e2e.url}/profit`)
    const table = desk.getByTestId('profit-table')
    await expectVisible(table)
    await expectAbsent(desk.getByTestId('profit-cards'))
    const fits = async () => desk.evaluate(() => {
      const box = document.querySelector('[data-testid="profit-table-box"]')!
      const edge = box.getBoundingClientRect().right
      const cut = [...box.querySelectorAll('thead th, tbody td, tbody th[scope="row"]')]
        .filter(c => c.getBoundingClientRect().right > edge + 0.5)
        .map(c => (c.textContent ?? '').trim().slice(0, 40))
      return { cut, scrolls: box.scrollWidth > box.clientWidth, page: document.scrollingElement!.scrollWidth <= document.scrollingElement!.clientWidth }
    })
    expect(await fits()).toEqual({ cut: [], scrolls: false, page: true })
    const headings = (await table.locator('thead th').allInnerTexts()).map(t => t.replace(/\s+/g, ' ').trim())
    expect(headings).toEqual(['Job', 'Last day worked ▼', 'Price before VAT', 'Costs', 'Days worked', 'Left after costs', 'Day rate earned'])
    const kitchenRow = table.locator(`tr[data-job="${kitchen!.reference}"]`)
    await expectText(kitchenRow, /£500\.00 ▲ £300\.00 a day above your target/)
    await expectText(table.locator(`tr[data-job="${loft!.reference}"]`), /£125\.00 ▼ £75\.00 a day below your target/)
    await expectText(table.getByTestId('profit-totals'), /In all \(2 finished\).*£850\.00.*£100\.00.*3 days.*£750\.00.*£250\.00/)
    // the job on site, after the totals, under its own heading
    await expectVisible(table.locator('tbody[data-group="on-site"]').getByTestId('profit-on-site-heading'))
    await expectText(table.locator(`tbody[data-group="on-site"] tr[data-job="${extension!.reference}"]`), /£100\.64 ◐ Still on site/)
    await screenshot(desk, 'profit-laptop')

    // sort by the day rate earned: largest first, then smallest first (the job on site stays apart)
    const rows = async () => table.locator('tbody[data-group="counted"] tr[data-job]').evaluateAll(rs => rs.map(r => r.getAttribute('data-job')))
    const rateHeading = table.locator('th', { has: desk.getByRole('button', { name: 'Day rate earned' }) })
    await rateHeading.getByRole('button').click()
    await expect.poll(async () => rateHeading.getAttribute('aria-sort')).toBe('descending')
    expect(await rows()).toEqual([kitchen!.reference, loft!.reference])
    await rateHeading.getByRole('button').click()
    await expect.poll(async () => rateHeading.getAttribute('aria-sort')).toBe('ascending')
    expect(await rows()).toEqual([loft!.reference, kitchen!.reference])

    // every figure: the costs apart, the price at the day rate, the margin on the price; the table scrolls in its own box
    await desk.getByTestId('profit-every-figure').click()
    await expect.poll(async () => table.getAttribute('data-columns')).toBe('every')
    await expectVisible(table.getByRole('button', { name: 'Margin on the price' }))
    await expectVisible(table.getByRole('button', { name: 'Labour paid to others' }))
    expect(await desk.getByRole('region', { name: 'Profit by job (scrolls sideways)' }).count()).toBe(1)
    expect((await pageWidth(desk)).scrollWidth).toBeLessThanOrEqual(1366)
    await screenshot(desk, 'profit-laptop-every')
    await desk.getByTestId('profit-every-figure').click()
    await expect.poll(async () => table.getAttribute('data-columns')).toBe('chosen')
    expect((await fits()).cut).toEqual([])
    expectCleanRun(laptop)
  })
})

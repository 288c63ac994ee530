// The accountant's quarter on a desktop: sign in, see last quarter on the dashboard, pick it on the
// quarter screen, read the boxes, download the quarter-end pack, and every file in it parses (with
// csv-parse, not the app's own writer) to the demo quarter's invented figures. Then the owner, on
// a phone, sees the same quarter's jobs against the firm's day rate.
import { readFile } from 'node:fs/promises'
import { parse } from 'csv-parse/sync'
import { strFromU8, unzipSync } from 'fflate'
import { describe, expect, it } from 'vitest'
import { demoQuarter } from '../../seeds/quarter'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { ACCOUNTANT, FIRM_NAME, OWNER } from './demo'

const e2e = useE2E()
const q = demoQuarter()
const rowsOf = (text: string) => parse(text, { columns: true, bom: true, skip_empty_lines: true }) as Record<string, string>[]

describe('the quarter', () => {
  it('the accountant picks last quarter, reads the boxes and downloads the pack, whose files all parse', async () => {
    const priya = await e2e.open({ desktop: true })
    const { page } = priya
    await signInToDashboard(page, e2e.url, ACCOUNTANT.email, ACCOUNTANT.password)
    // she serves two firms; this is the demo firm's quarter
    const select = page.getByTestId('firm-switch')
    if ((await select.evaluate((s: HTMLSelectElement) => s.selectedOptions[0]?.text.trim())) !== FIRM_NAME) {
      await select.selectOption({ label: FIRM_NAME })
      await expectText(page.getByTestId('dashboard-accountant'), `You can read ${FIRM_NAME}'s money`)
    }
    const last = page.getByTestId('dashboard-last-quarter')
    await expectVisible(last.getByText(/Last quarter/))
    await expectVisible(last.getByText(/box 5/))
    await screenshot(page, 'accountant-dashboard-quarter')

    // Money -> the quarter; pick last quarter from the list
    await visit(page, `${e2e.url}/money`)
    await page.getByRole('link', { name: /The quarter/ }).click()
    await page.waitForURL(u => u.pathname === '/quarter')
    const quarter = page.getByLabel('Quarter', { exact: true })
    const lastLabel = await quarter.locator('option', { hasText: 'last quarter' }).textContent()
    await quarter.selectOption({ label: lastLabel!.trim() })
    await page.waitForURL(u => u.searchParams.get('quarterOf') === q.start)

    // the purchases are the demo's alone, worked by hand:
    // box 4 = 17.68 + 19.44 + 62.40 + 0 + 39.70 + 12.50 + 11.75 + 30.00 + 42.00 = 235.47
    // box 7 = 88.40 + 97.20 + 312.00 + 300.00 + 198.50 + 62.50 + 58.75 + 149.99 + 210.00 = 1,477.34
    await expectText(page.getByTestId('vat-box-4').locator('td').last(), /£235\.47/)
    await expectText(page.getByTestId('vat-box-7').locator('td').last(), /£1,477\.34/)
    const api = await (await page.request.get(`${e2e.url}/api/vat-return?quarterOf=${q.start}`)).json()
    await expectText(page.getByTestId('vat-box-6').locator('td').last(), new RegExp(`£${(api.boxes[6] / 100).toLocaleString('en-GB', { minimumFractionDigits: 2 })}`))
    // the reverse-charge sales are in box 6 and nowhere in box 1
    const box6 = page.getByTestId('vat-box-6')
    await box6.getByText(/What makes it up/).click()
    await expectVisible(box6.getByText(/Pribbleworth Scarnholme Builds Ltd/).first())
    expect(await page.getByTestId('vat-box-1').innerText()).not.toContain('Pribbleworth')
    await screenshot(page, 'accountant-quarter-boxes')

    // the pack: one ZIP, eight files
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-pack').click()])
    expect(download.suggestedFilename()).toBe(`setwell-quarter-${q.start}-to-${q.end}.zip`)
    const files = unzipSync(new Uint8Array(await readFile((await download.path())!)))
    const names = Object.keys(files)
    expect(names).toHaveLength(8)
    const file = (kind: string) => rowsOf(strFromU8(files[names.find(n => n.startsWith(`setwell-${kind}-`))!]!))
    for (const n of names.filter(n => n.endsWith('.csv'))) expect(() => rowsOf(strFromU8(files[n]!)), n).not.toThrow()

    // invoices (the demo's figures): Alys Dunmore 875.00 net + 175.00 VAT; her credit note -20.00;
    // Pribbleworth's plots under the reverse charge: no VAT charged, 20% of 2,780.00 for them to account
    // for = 556.00, CIS 20% of the 2,400.00 labour = 480.00
    const invoices = file('invoices')
    expect(invoices.find(r => r.Customer === 'Alys Dunmore' && r.Kind === 'Final invoice')).toMatchObject({ 'Net (pounds)': '875.00', 'VAT (pounds)': '175.00' })
    expect(invoices.find(r => r.Number === 'CN-0001')).toMatchObject({ 'Net (pounds)': '-20.00', 'VAT (pounds)': '-4.00' })
    expect(invoices.find(r => r['Net (pounds)'] === '2780.00')).toMatchObject({ 'Customer': 'Pribbleworth Scarnholme Builds Ltd', 'VAT (pounds)': '0.00', 'Reverse charge VAT for the customer (pounds)': '556.00', 'CIS deduction (pounds)': '480.00', 'Paid to date (pounds)': '2300.00' })
    const boxes = file('vat-summary')
    for (const b of boxes) expect(Number(b['Amount (pounds)']), `box ${b.Box}`).toBeCloseTo(api.boxes[b.Box!] / 100, 2)
    expect(file('purchases')).toHaveLength(9)
    // CIS: plot 3's month agrees with the builder's statement; plot 4's has none yet
    const cis = file('cis-deductions')
    expect(cis.map(r => r.Reconciled).sort()).toEqual(['Matches the statement', 'No statement recorded'])
    expect(cis.find(r => r.Reconciled === 'Matches the statement')).toMatchObject({ 'Gross paid excluding VAT (pounds)': '2780.00', 'Materials (pounds)': '380.00', 'CIS deducted (pounds)': '480.00' })

    // she reads the CIS months but has nothing to record with
    await visit(page, `${e2e.url}/cis`)
    await expectVisible(page.getByTestId('cis-months'))
    expect(await page.getByTestId('cis-statement-new').count()).toBe(0)
    expectCleanRun(priya)
  })

  it('the owner on a phone sees last quarter\'s jobs against the day rate, and the same boxes', async () => {
    const jess = await e2e.open()
    const { page } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    // Today: what is owed, and the way to each job's day rate (the profit page, one tap)
    await expectVisible(page.getByTestId('dashboard-money').getByText('Owed to the firm'))
    await expectVisible(page.getByTestId('dashboard-money').getByRole('link', { name: 'Day rate earned on each job' }))
    await screenshot(page, 'owner-dashboard')

    await visit(page, `${e2e.url}/profit?from=${q.start}&to=${q.end}`)
    // a card a job on a phone (the quarter's jobs are paid: none is still on site)
    const table = page.getByTestId('profit-cards')
    await expectVisible(table.getByText('Alys Dunmore').first())
    await expectVisible(table.getByText('Fernhill Homes').first())
    await expectVisible(page.getByTestId('profit-chart'))
    // plot 3 (worked by hand): price 2,780.00 less materials 356.40 (44.40 + 312.00) less the labourer 300.00
    // = 2,123.60 over 8 person-days = 265.45 a day
    await expectVisible(table.getByText('£265.45').first())
    await screenshot(page, 'owner-profit-quarter')

    await visit(page, `${e2e.url}/quarter?quarterOf=${q.start}`)
    await expectText(page.getByTestId('vat-box-4').locator('td').last(), /£235\.47/)
    expectCleanRun(jess)
  })
})

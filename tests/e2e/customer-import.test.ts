// Journey: the demo owner, on a phone, imports 500 invented customers from a CSV file: the columns
// are matched from the headings, the 3 bad rows are shown with their row numbers before anything
// is written, the rest go in batches behind a progress bar, the rejected rows download as a CSV
// with the reasons, and importing the same file again adds nobody.
import { mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Papa from 'papaparse'
import pg from 'pg'
import type { Locator, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { importKey } from '../../shared/utils/customer-import'
import { requiredEnv } from '../support/app'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, textOf, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

// --- an invented customer list: 25 first names x 20 surnames = 500 different people ---
const FIRST = ['Ada', 'Bram', 'Cora', 'Dev', 'Elsie', 'Finn', 'Gwen', 'Hal', 'Isla', 'Jory', 'Kit', 'Lark', 'Mabel', 'Ned', 'Orla', 'Pip', 'Quin', 'Rhea', 'Sol', 'Tansy', 'Ulric', 'Vesna', 'Wren', 'Xander', 'Yara']
const LAST = ['Thorne', 'Ashdown', 'Brackley', 'Corrow', 'Dunmore', 'Elmsworth', 'Fallon', 'Gorrick', 'Hesketh', 'Ingleby', 'Jessop', 'Kettering', 'Lorrimer', 'Moxley', 'Nettlefold', 'Ockenden', 'Pellow', 'Quarrie', 'Rudge', 'Sallowby']
const STREETS = ['Wicket Lane', 'Sallow Street', 'Tanyard Close', 'Cooper\'s Row', 'Lantern Walk', 'Mill Brow']
const TOWNS = ['Kettlebury', 'Fallowmere', 'Thistlecombe', 'Marlbeck']
const HEADERS = ['Customer name', 'Type', 'Contact', 'E-mail', 'Mobile', 'Address 1', 'Town', 'Postcode', 'VAT number', 'CIS rate', 'Notes']
/** Record indexes of the deliberately bad rows (spreadsheet rows 13, 252 and 500). */
const BAD = { badEmail: 11, homeownerUnderCis: 250, noName: 498 }

function inventedCustomers(): Record<string, string>[] {
  return Array.from({ length: 500 }, (_, i) => {
    const first = FIRST[i % FIRST.length]!
    const last = LAST[Math.floor(i / FIRST.length)]!
    const n = (i % 9) + 1
    const kind = ['', 'Homeowner', 'homeowner', '', 'Home owner', '', 'Letting agent', 'Landlord', 'Contractor', 'Business'][i % 10]!
    const row: Record<string, string> = {
      'Customer name': `${first} ${last}`,
      'Type': kind,
      'Contact': kind === 'Contractor' || kind === 'Business' ? `${first} ${last}` : '',
      // every third has no e-mail, so it is matched on name and postcode
      'E-mail': i % 3 === 0 ? '' : `${first}.${last}.${i}@mail.example`.toLowerCase(),
      'Mobile': `07700 9${String(i).padStart(5, '0')}`,
      'Address 1': `${i + 1} ${STREETS[i % STREETS.length]}`,
      'Town': TOWNS[i % TOWNS.length]!,
      'Postcode': `KB${n} ${n}${'ABDEFGHJL'[i % 9]}${'NPQRSTUWX'[(i * 7) % 9]}`,
      'VAT number': kind === 'Contractor' ? `GB${100000000 + i}` : '',
      'CIS rate': kind === 'Contractor' ? '20%' : '',
      'Notes': i % 25 === 0 ? 'Side gate, "ring twice"' : '',
    }
    return row
  }).map((row, i) => {
    if (i === BAD.badEmail) return { ...row, 'E-mail': 'not-an-e-mail', 'Notes': '=1+2' }
    if (i === BAD.homeownerUnderCis) return { ...row, 'Type': 'Homeowner', 'CIS rate': '20%' }
    if (i === BAD.noName) return { ...row, 'Customer name': '' }
    return row
  })
}

let dir: string
let csvPath: string
let emptyPath: string
const customers = inventedCustomers()

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'setwell-import-'))
  csvPath = join(dir, 'invented-customers.csv')
  await writeFile(csvPath, Papa.unparse({ fields: HEADERS, data: customers.map(r => HEADERS.map(h => r[h] ?? '')) }))
  emptyPath = join(dir, 'headings-only.csv')
  await writeFile(emptyPath, `${HEADERS.join(',')}\n`)
})

/** The demo firm is shared by the journeys: take this file's customers out again afterwards. */
let demoFirmId: string | undefined
afterAll(async () => {
  if (demoFirmId) {
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [demoFirmId])
      const keys = customers.map(c => importKey({ email: c['E-mail']!, name: c['Customer name']!, billingPostcode: c.Postcode! }))
      await db.query('delete from customers where import_key = any($1)', [keys])
      await db.query('commit')
    }
    finally {
      await db.end()
    }
  }
  if (dir) await rm(dir, { recursive: true, force: true })
})

/** A picture of one part of the page, beside the full-page screenshots. */
async function shotOf(locator: Locator, name: string) {
  const dir = process.env.SETWELL_ARTEFACTS ?? join(process.cwd(), 'tests/artefacts')
  await mkdir(dir, { recursive: true })
  await locator.screenshot({ path: join(dir, `${name}.png`) })
}

async function progressNow(page: Page) {
  return page.getByTestId('import-progress').getAttribute('aria-valuenow')
}

describe('importing customers', () => {
  it('the owner imports 500 rows on a phone: checked first, sent in batches, rejected rows downloadable, and a second run adds nobody', async () => {
    const jess = await e2e.open()
    const { page } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    demoFirmId = (await (await page.request.get(`${e2e.url}/api/me`)).json()).firm.id

    await visit(page, `${e2e.url}/customers/import`)
    await expectText(page.getByRole('heading', { level: 1 }), 'Import customers')
    expect(await page.title()).toBe('Import customers · Setwell')
    // the file target is big enough for a thumb
    const target = page.locator('label', { has: page.getByTestId('import-file') })
    const box = (await target.boundingBox())!
    expect(box.height).toBeGreaterThanOrEqual(44)
    expect(box.width).toBeGreaterThan(300)

    await page.getByTestId('import-file').setInputFiles(csvPath)
    await expectText(page.getByTestId('import-file-status'), 'invented-customers.csv: 500 rows, 11 columns')

    // the columns were matched from the headings
    const mappingForm = page.getByTestId('import-mapping')
    const select = (label: RegExp) => mappingForm.getByRole('combobox', { name: label })
    expect(await select(/^Name/).inputValue()).toBe('Customer name')
    expect(await select(/^Kind/).inputValue()).toBe('Type')
    expect(await select(/^Contact name/).inputValue()).toBe('Contact')
    expect(await select(/^E-mail/).inputValue()).toBe('E-mail')
    expect(await select(/^Phone/).inputValue()).toBe('Mobile')
    expect(await select(/^Address line 1/).inputValue()).toBe('Address 1')
    expect(await select(/^Postcode/).inputValue()).toBe('Postcode')
    expect(await select(/^CIS rate/).inputValue()).toBe('CIS rate')
    expect(await select(/^Pays under CIS/).inputValue()).toBe('')
    expect(await select(/^Address line 2/).inputValue()).toBe('')

    // checked before anything is written
    await expectText(page.getByTestId('import-ready-count'), '497 of 500 ready to import')
    await expectText(page.getByTestId('import-problem-count'), '3 rows have problems')
    const problems = page.getByTestId('import-problem')
    expect(await problems.count()).toBe(3)
    expect(await textOf(problems.nth(0))).toMatch(/^Row 13 · Lark Thorne E-mail: Enter an e-mail address/)
    expect(await textOf(problems.nth(1))).toMatch(/^Row 252 · .+ Pays under CIS: A homeowner never pays under CIS\./)
    expect(await textOf(problems.nth(2))).toMatch(/^Row 500 Name: Enter the customer's name\./)

    const preview = page.getByTestId('import-preview')
    expect(await preview.locator('tbody tr').count()).toBe(5)
    expect(await textOf(preview.locator('tbody tr').first())).toBe('2 Ada Thorne ✓ Ready Homeowner 07700 900000 KB1 1AN')
    expect(await textOf(preview.locator('tbody tr').nth(1))).toContain('bram.thorne.1@mail.example')
    await screenshot(page, 'customer-import-check')
    await shotOf(page.getByTestId('import-check'), 'customer-import-check-section')

    // import: the bar reaches 497 of 497
    const start = page.getByRole('button', { name: 'Import 497 customers' })
    await expectVisible(start)
    expect((await start.boundingBox())!.height).toBeGreaterThanOrEqual(44)
    await start.click()
    await expect.poll(() => progressNow(page), { timeout: 20_000 }).toBe('497')
    const bar = page.getByTestId('import-progress')
    expect(await bar.getAttribute('aria-valuemax')).toBe('497')
    expect(await bar.getAttribute('aria-valuetext')).toBe('497 of 497')
    await expectText(page.getByTestId('import-progress-text'), '497 of 497 (100%)')

    await expectVisible(page.getByTestId('import-summary'))
    expect(await textOf(page.getByTestId('import-created'))).toBe('497')
    expect(await textOf(page.getByTestId('import-skipped'))).toBe('0')
    expect(await textOf(page.getByTestId('import-rejected'))).toBe('3')
    // the choices are kept, but cannot be changed under a finished import
    expect(await select(/^Name/).isDisabled()).toBe(true)
    await screenshot(page, 'customer-import-done')
    await shotOf(page.getByRole('region', { name: '4. Import' }), 'customer-import-done-section')

    // the rejected rows, as in the file, with the row number and the problem
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Download rejected rows' }).click(),
    ])
    expect(download.suggestedFilename()).toBe('invented-customers-rejected.csv')
    const text = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '')
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true })
    expect(parsed.meta.fields).toEqual(['Row', ...HEADERS, 'Problem'])
    expect(parsed.data.map(r => r.Row)).toEqual(['13', '252', '500'])
    expect(parsed.data[0]!['E-mail']).toBe('not-an-e-mail')
    expect(parsed.data[0]!.Problem).toMatch(/^E-mail: /)
    // a cell a spreadsheet would run as a formula is written as text
    expect(parsed.data[0]!.Notes).toBe('\'=1+2')
    expect(parsed.data[1]!.Problem).toBe('Pays under CIS: A homeowner never pays under CIS.')
    expect(parsed.data[2]!['Customer name']).toBe('')

    // a file that cannot be used is refused beside the file box, and what was there stays
    await page.getByTestId('import-file').setInputFiles(emptyPath)
    await expectText(page.getByRole('alert').filter({ hasText: 'headings-only.csv' }), 'headings-only.csv has no customers in it')
    expect(await textOf(page.getByTestId('import-created'))).toBe('497')
    await expectText(page.getByTestId('import-file-status'), 'invented-customers.csv: 500 rows, 11 columns')

    // the same file again: everyone is already there
    await page.getByRole('button', { name: 'Import another file' }).click()
    await page.getByTestId('import-file').setInputFiles(csvPath)
    await expectText(page.getByTestId('import-ready-count'), '497 of 500 ready to import')
    await page.getByRole('button', { name: 'Import 497 customers' }).click()
    await expectVisible(page.getByTestId('import-summary'))
    expect(await textOf(page.getByTestId('import-created'))).toBe('0')
    expect(await textOf(page.getByTestId('import-skipped'))).toBe('497')
    expect(await textOf(page.getByTestId('import-rejected'))).toBe('3')
    await screenshot(page, 'customer-import-second-run')

    expectCleanRun(jess)
  })
})

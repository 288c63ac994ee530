// The office partner settles the ledger from the bank (issue 20), on a laptop (1366 x 900): the demo
// firm's statement (seeds/statement.ts, built from what the seed wrote) imported, the proposals read
// with their reasons, the sure ones confirmed together, and What is owed no longer lists the invoices
// they paid; the same file again adds nothing. Then every match is undone and the lines set aside,
// so the demo firm is as it was for the journeys after this one.
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { requiredEnv } from '../support/app'
import { demoStatement } from '../../seeds/statement'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OFFICE } from './demo'

const e2e = useE2E()

describe('the bank statement', () => {
  it('imports the demo statement, confirms the sure matches, and What is owed drops the invoices they paid', async () => {
    const statement = await demoStatement(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'))
    const file = join(mkdtempSync(join(tmpdir(), 'setwell-bank-')), statement.fileName)
    writeFileSync(file, statement.text)
    // the invoices the sure lines pay in full, and the one paid in part (still owed after)
    const paidInFull = statement.lines.filter(l => l.is.kind === 'invoices' && ['two-at-once', 'contractor-net-of-cis', 'odd-reference'].includes(l.is.how))
    const part = statement.lines.find(l => l.is.kind === 'invoices' && l.is.how === 'part-payment')!
    expect(paidInFull.length).toBeGreaterThanOrEqual(3)

    const sam = await e2e.open({ desktop: true })
    const page = sam.page
    await page.setViewportSize({ width: 1366, height: 900 })
    await signInToDashboard(page, e2e.url, OFFICE.email, OFFICE.password)
    await visit(page, `${e2e.url}/owed`)
    const owedBefore = await page.getByTestId('owed-customers').innerText()
    const referencesOf = async (ids: string[]) => {
      const out: string[] = []
      for (const id of ids) out.push((await page.request.get(`${e2e.url}/api/invoices/${id}`).then(r => r.json())).reference)
      return out
    }
    const fullRefs = await referencesOf(paidInFull.flatMap(l => (l.is.kind === 'invoices' ? l.is.invoiceIds : [])))
    const partRefs = await referencesOf(part.is.kind === 'invoices' ? part.is.invoiceIds : [])
    for (const r of [...fullRefs, ...partRefs]) expect(owedBefore).toMatch(new RegExp(`\\b${r}\\b`))

    // Money holds the bank statement; the demo firm's account is there, empty
    await visit(page, `${e2e.url}/money`)
    await page.getByRole('link', { name: 'Bank statement' }).click()
    await expectVisible(page.getByRole('heading', { name: 'Bank statement', level: 1 }))
    await page.getByTestId('bank-file').setInputFiles(file)
    await page.getByTestId('bank-import').click()
    await expectText(page.getByTestId('bank-message'), `${statement.fileName}: ${statement.lines.length} new lines, 0 already imported.`)

    // each proposal says why: the oddly written reference, the contractor paying net of CIS
    const odd = statement.lines.find(l => l.is.kind === 'invoices' && l.is.how === 'odd-reference')!
    const oddRow = page.locator(`[data-testid="bank-line"][data-line="${odd.description}"]`)
    await expectText(oddRow.getByTestId('bank-line-certainty'), 'Sure')
    await expectText(oddRow.getByTestId('bank-line-reasons'), /reference BP-\d+ in the description; amount equal/)
    const ambiguous = statement.lines.find(l => l.is.kind === 'invoices' && l.is.how === 'ambiguous')!
    const ambiguousRow = page.locator(`[data-testid="bank-line"][data-line="${ambiguous.description}"]`)
    await expectText(ambiguousRow.getByTestId('bank-line-certainty'), 'Likely: check it')
    await expectVisible(ambiguousRow.getByLabel('Which is it?'))
    await screenshot(page, 'bank-statement-proposals')

    const confirmAll = page.getByTestId('bank-confirm-sure')
    await expectText(confirmAll, /^Confirm the \d+ sure matches$/)
    await confirmAll.click()
    await expectText(page.getByTestId('bank-message'), /^Confirmed \d+ lines\.$/)
    // the ambiguous one waits for the partner
    await expectVisible(page.locator(`[data-testid="bank-line"][data-line="${ambiguous.description}"]`))
    await page.getByTestId('bank-state-matched').click()
    await expectVisible(page.locator(`[data-testid="bank-line"][data-line="${odd.description}"]`).getByTestId('bank-line-matches'))
    await screenshot(page, 'bank-statement-matched')

    // What is owed: the invoices paid in full are gone, the one paid in part is still there
    await visit(page, `${e2e.url}/owed`)
    const owedAfter = await page.getByTestId('owed-customers').innerText()
    for (const r of fullRefs) expect(owedAfter).not.toMatch(new RegExp(`\\b${r}\\b`))
    for (const r of partRefs) expect(owedAfter).toMatch(new RegExp(`\\b${r}\\b`))
    await screenshot(page, 'bank-statement-owed-after')

    // the same file again adds nothing
    await visit(page, `${e2e.url}/bank`)
    await page.getByTestId('bank-file').setInputFiles(file)
    await page.getByTestId('bank-import').click()
    await expectText(page.getByTestId('bank-message'), `${statement.fileName}: 0 new lines, ${statement.lines.length} already imported.`)
    expectCleanRun(sam)

    // as it was: every match undone, every line set aside (the journeys after this one read the demo firm)
    const accounts = await (await page.request.get(`${e2e.url}/api/bank-accounts`)).json()
    const accountId = accounts.accounts[0].id
    const matched = await (await page.request.get(`${e2e.url}/api/bank-accounts/${accountId}/lines?state=matched`)).json()
    for (const l of matched.lines) expect((await page.request.delete(`${e2e.url}/api/bank-lines/${l.id}/match`)).status()).toBe(200)
    const open = await (await page.request.get(`${e2e.url}/api/bank-accounts/${accountId}/lines?state=open`)).json()
    for (const l of open.lines) expect((await page.request.patch(`${e2e.url}/api/bank-lines/${l.id}`, { data: { state: 'ignored' } })).status()).toBe(200)
    await visit(page, `${e2e.url}/owed`)
    for (const r of fullRefs) expect(await page.getByTestId('owed-customers').innerText()).toMatch(new RegExp(`\\b${r}\\b`))
  })
})

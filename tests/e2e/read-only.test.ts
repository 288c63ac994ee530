// Read-only screens say what they are: an issued invoice, an accepted quote and, for the
// accountant, the firm's rates show their values as text (no greyed-out fields that look live),
// with the reason they cannot be changed. The office and the accountant on a laptop (1366 x 900).
import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import { expectCleanRun, expectText, expectVisible, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { ACCOUNTANT, FIRM_NAME, OFFICE } from './demo'

const e2e = useE2E()
const LAPTOP = { width: 1366, height: 900 }

/** Form fields in the page's main part that are greyed out (disabled, or in a disabled fieldset). */
function disabledFields(page: Page) {
  return page.getByRole('main').locator('input:disabled, select:disabled, textarea:disabled')
}

async function firstIssuedInvoice(page: Page): Promise<{ id: string, reference: string, lines: number }> {
  const list = await (await page.request.get(`${e2e.url}/api/invoices`)).json() as { id: string, kind: string, issuedOn: string | null, reference: string | null }[]
  const issued = list.find(i => i.issuedOn && i.kind !== 'credit-note')
  expect(issued, 'the demo firm has an issued invoice').toBeTruthy()
  const full = await (await page.request.get(`${e2e.url}/api/invoices/${issued!.id}`)).json() as { lines: unknown[] }
  return { id: issued!.id, reference: issued!.reference!, lines: full.lines.length }
}

describe('read-only screens', () => {
  it('the office reads an issued invoice and an accepted quote as text, with the reason', async () => {
    const sam = await e2e.open({ desktop: true })
    const { page } = sam
    await page.setViewportSize(LAPTOP)
    await signInToDashboard(page, e2e.url, OFFICE.email, OFFICE.password)

    const invoice = await firstIssuedInvoice(page)
    await visit(page, `${e2e.url}/invoices/${invoice.id}`)
    await expectText(page.getByTestId('read-only-reason'), /Issued on .*never changes.*credit note/)
    const lines = page.getByTestId('invoice-line')
    await expectVisible(lines.first())
    expect(await lines.count()).toBe(invoice.lines)
    // each line is text: its description, quantity, price and VAT, no field
    expect(await lines.locator('input, select, textarea').count()).toBe(0)
    await expectVisible(lines.first().getByTestId('line-description'))
    expect(await disabledFields(page).count()).toBe(0)
    await screenshot(page, 'office-laptop-issued-invoice')

    const quotes = await (await page.request.get(`${e2e.url}/api/quotes`)).json() as { id: string, status: string }[]
    const accepted = quotes.find(q => q.status === 'accepted')
    expect(accepted, 'the demo firm has an accepted quote').toBeTruthy()
    await visit(page, `${e2e.url}/quotes/${accepted!.id}`)
    await expectText(page.getByTestId('read-only-reason'), /Accepted by the customer/)
    await expectVisible(page.getByTestId('quote-terms-read-only'))
    expect(await page.getByTestId('quote-line').locator('input, select, textarea').count()).toBe(0)
    expect(await disabledFields(page).count()).toBe(0)
    await screenshot(page, 'office-laptop-accepted-quote')
    expectCleanRun(sam)
  })

  it('the accountant reads the invoice and the firm\'s rates as text, told why', async () => {
    const priya = await e2e.open({ desktop: true })
    const { page } = priya
    await page.setViewportSize(LAPTOP)
    await signInToDashboard(page, e2e.url, ACCOUNTANT.email, ACCOUNTANT.password)
    // the demo firm's books
    const me = await (await page.request.get(`${e2e.url}/api/me`)).json() as { firms: { id: string, tradingName: string }[] }
    await page.request.put(`${e2e.url}/api/me/firm`, { data: { firmId: me.firms.find(f => f.tradingName === FIRM_NAME)!.id } })
    await reload(page)

    const invoice = await firstIssuedInvoice(page)
    await visit(page, `${e2e.url}/invoices/${invoice.id}`)
    await expectText(page.getByTestId('read-only-reason'), /As the firm's accountant you can read this invoice/)
    await expectVisible(page.getByTestId('invoice-line').first())
    expect(await page.getByTestId('invoice-line').locator('input, select, textarea').count()).toBe(0)
    expect(await disabledFields(page).count()).toBe(0)
    // nothing tells the accountant to do what only the firm can
    await expectText(page.getByRole('main'), /the firm corrects it with a credit note/)
    expect((await page.getByRole('main').innerText()).toLowerCase()).not.toContain('make a credit note')
    expect(await page.getByRole('button', { name: 'Make a credit note' }).count()).toBe(0)
    await screenshot(page, 'accountant-laptop-issued-invoice')

    await visit(page, `${e2e.url}/rates`)
    await expectText(page.getByTestId('read-only-reason'), /accountant/)
    await expectVisible(page.getByTestId('read-only-value').first())
    expect(await page.getByRole('main').locator('input, select, textarea').count()).toBe(0)
    await screenshot(page, 'accountant-laptop-rates')
    expectCleanRun(priya)
  })
})

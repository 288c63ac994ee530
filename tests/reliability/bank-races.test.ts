import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { type Client, signUpFirm } from '../support/client'
import { queryAsFirm } from '../support/db'
import { statuses, together } from './race'

// The bank statement's rules under many requests at once (issue 20), each case released behind
// one gate and then read back from the database:
// - a line confirmed many times at once records its payment once;
// - a purchase is matched to one line, however many claim it together;
// - undoing many times at once takes the payment off once;
// - "confirm all the sure ones" sent many times at once, beside single confirmations of two lines
//   for the same invoice, never pays it more than it owes.

const AT_ONCE = 12
let app: TestApp
let owner: Client
let firmId: string
let accountId: string
const db = <T = Record<string, any>>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
let customerId: string
let number = 100

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Race Ledger Plastering'))
  accountId = (await owner.post('/api/bank-accounts', { name: 'Race account' })).body.id
  ;[{ id: customerId }] = await db<{ id: string }>(`insert into customers (firm_id, kind, name, email, billing_line1, billing_postcode) values ($1, 'homeowner', 'Tamsin Greave', 'tamsin@example.invalid', '2 Cinder Path', 'KB4 7CP') returning id`, [firmId]) as [{ id: string }]
})
afterAll(async () => {
  await app?.stop()
})

async function invoice(pence: number) {
  number++
  return (await db<{ id: string }>(`insert into invoices (firm_id, kind, series, number, reference, customer_id, vat, issued_on, due_on, amount_due_pence) values ($1, 'final', 'invoice', $2, $3, $4, 'standard', '2026-11-20', '2026-12-04', $5) returning id`, [firmId, number, `RL-${number}`, customerId, pence]))[0]!.id
}
async function statement(csv: string) {
  const form = new FormData()
  form.append('file', new Blob([`Date,Description,Amount\n${csv}`], { type: 'text/csv' }), 'statement.csv')
  const res = await fetch(`${app.url}/api/bank-accounts/${accountId}/statements/uploads`, { method: 'POST', body: form, headers: { cookie: owner.cookieHeader() } })
  expect(res.status).toBe(200)
  const lines = (await owner.get(`/api/bank-accounts/${accountId}/lines`)).body.lines as { id: string, description: string, proposal: any }[]
  return (d: string) => lines.find(l => l.description === d)!
}
const paid = async (invoiceId: string) => (await db<{ n: number }>('select coalesce(sum(amount_pence), 0)::int as n from payments where firm_id = $1 and invoice_id = $2', [firmId, invoiceId]))[0]!.n

describe('bank statement lines under many requests at once', () => {
  it('records a line confirmed many times at once once', async () => {
    const inv = await invoice(40000)
    const line = (await statement('16/12/2026,FP GREAVE RL-101 ONCE,400.00'))('FP GREAVE RL-101 ONCE')
    const answers = await together(AT_ONCE, () => owner.post(`/api/bank-lines/${line.id}/match`, { kind: 'payment', parts: [{ invoiceId: inv, amountPence: 40000 }] }))
    expect(statuses(answers)).toEqual({ 201: 1, 409: AT_ONCE - 1 })
    expect(await paid(inv)).toBe(40000)
    expect((await db<{ n: number }>('select count(*)::int as n from bank_matches where firm_id = $1 and line_id = $2 and undone_at is null', [firmId, line.id]))[0]!.n).toBe(1)
  })

  it('undoes many times at once once', async () => {
    const inv = await invoice(41000)
    const line = (await statement('17/12/2026,FP GREAVE RL-102 UNDO,410.00'))('FP GREAVE RL-102 UNDO')
    expect((await owner.post(`/api/bank-lines/${line.id}/match`, { kind: 'payment', parts: [{ invoiceId: inv, amountPence: 41000 }] })).status).toBe(201)
    const answers = await together(AT_ONCE, () => owner.delete(`/api/bank-lines/${line.id}/match`))
    expect(statuses(answers)).toEqual({ 200: 1, 409: AT_ONCE - 1 })
    expect(await paid(inv)).toBe(0)
    expect((await db<{ state: string }>('select state from bank_lines where firm_id = $1 and id = $2', [firmId, line.id]))[0]!.state).toBe('open')
  })

  it('matches a purchase to one line however many claim it together', async () => {
    const [{ id: purchaseId }] = await db<{ id: string }>(`insert into purchases (firm_id, supplier, bought_on, category, net_pence, vat_pence) values ($1, 'Cinder Path Sands', '2026-12-18', 'materials', 5000, 1000) returning id`, [firmId]) as [{ id: string }]
    const rows = Array.from({ length: AT_ONCE }, (_, i) => `18/12/2026,CARD PAYMENT CINDER PATH ${i},-60.00`).join('\n')
    const find = await statement(rows)
    const answers = await together(AT_ONCE, i => owner.post(`/api/bank-lines/${find(`CARD PAYMENT CINDER PATH ${i}`).id}/match`, { kind: 'purchase', purchaseId }))
    expect(statuses(answers)).toEqual({ 201: 1, 409: AT_ONCE - 1 })
    expect((await db<{ n: number }>('select count(*)::int as n from bank_matches where firm_id = $1 and purchase_id = $2 and undone_at is null', [firmId, purchaseId]))[0]!.n).toBe(1)
  })

  it('never pays an invoice more than it owes when "confirm the sure ones" and single confirmations of two lines arrive together', async () => {
    const inv = await invoice(42000)
    // two transfers quoting the same invoice for its whole amount: only one of them can be its payment
    const find = await statement(`19/12/2026,FP GREAVE RL-${number} FIRST,420.00\n20/12/2026,FP GREAVE RL-${number} AGAIN,420.00`)
    const first = find(`FP GREAVE RL-${number} FIRST`)
    const again = find(`FP GREAVE RL-${number} AGAIN`)
    expect(first.proposal.certainty).toBe('sure')
    const answers = await together(AT_ONCE, i => i % 3 === 0
      ? owner.post(`/api/bank-accounts/${accountId}/confirmations`, { lineIds: [first.id, again.id] })
      : owner.post(`/api/bank-lines/${i % 3 === 1 ? first.id : again.id}/match`, { kind: 'payment', parts: [{ invoiceId: inv, amountPence: 42000 }] }))
    expect(answers.every(a => [200, 201, 409].includes(a.status)), JSON.stringify(answers.map(a => a.status))).toBe(true)
    expect(await paid(inv)).toBe(42000)
    expect((await db<{ n: number }>('select count(*)::int as n from bank_matches where firm_id = $1 and line_id = any($2) and undone_at is null', [firmId, [first.id, again.id]]))[0]!.n).toBe(1)
  })
})

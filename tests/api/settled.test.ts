import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { queryAsFirm } from '../support/db'
import type { Client } from '../support/client'
import { signUpFirm, uniqueEmail } from '../support/client'

// invoices.settled_pence (drizzle/0020_invoice_settled.sql) is kept by triggers as payments,
// refunds and credit notes are written; the owed view reads it through a partial index. These
// tests write money every way the app does (and the ways it doesn't yet: a payment changed or
// deleted in the database) and check it against the sums worked out afresh from the rows.

let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Settled Firm'))
})
afterAll(async () => {
  await app?.stop()
})

/** Run SQL as the firm, straight in the database (the owner role, row-level security on). */
const asFirm = <T = Record<string, unknown>>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)

/** Every invoice whose kept figure differs from its payments and credit notes summed now. */
const drifted = () => asFirm<{ reference: string, settled_pence: number, summed: number }>(`
  select i.reference, i.settled_pence, (
    coalesce((select sum(p.amount_pence) from payments p where p.firm_id = i.firm_id and p.invoice_id = i.id), 0)
    + coalesce((select sum(n.amount_due_pence) from invoices n where n.firm_id = i.firm_id and n.credits_invoice_id = i.id and n.kind = 'credit-note' and n.issued_on is not null), 0)
  )::int as summed
  from invoices i where i.firm_id = $1`, [firmId]).then(rows => rows.filter(r => r.settled_pence !== r.summed))

async function issued(amountPence: number) {
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Orla Fenwick', email: uniqueEmail('orla') } })).body
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  const saved = await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the back bedroom', quantityX1000: 1000, unitPence: amountPence }] })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  const res = await owner.post(`/api/invoices/${d.id}/issue`)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body as { id: string, reference: string, amountDuePence: number }
}

const pay = (id: string, amountPence: number) => owner.post(`/api/invoices/${id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence, receivedOn: '2026-12-01', reference: 'FPS' })

const owedReferences = async () => {
  const res = await owner.get('/api/owed')
  expect(res.status).toBe(200)
  return (res.body.customers as { invoices: { reference: string, outstandingPence: number }[] }[]).flatMap(c => c.invoices).map(i => i.reference).sort()
}

describe('what is settled against each invoice', () => {
  it('follows part payments, overpayment, refunds, credit notes and payments at the same moment', async () => {
    const unpaid = await issued(200_00)
    const part = await issued(300_00)
    const whole = await issued(150_00)
    const over = await issued(80_00)
    const refunded = await issued(120_00)
    const credited = await issued(90_00)
    const crowd = await issued(100_00)

    expect((await pay(part.id, 100_00)).status).toBe(201)
    expect((await pay(whole.id, whole.amountDuePence)).status).toBe(201)
    expect((await pay(over.id, over.amountDuePence + 5_00)).status).toBe(201)
    const cash = (await pay(refunded.id, refunded.amountDuePence)).body.payments[0]
    expect((await owner.post(`/api/invoices/${refunded.id}/refunds`, { paymentId: cash.id, amountPence: 20_00, requestId: crypto.randomUUID() })).status).toBe(201)
    const note = await owner.post(`/api/invoices/${credited.id}/credit-note`)
    expect(note.status).toBe(201)
    // a credit note settles nothing until it is issued
    expect(await drifted()).toEqual([])
    expect(await owedReferences()).toContain(credited.reference)
    expect((await owner.post(`/api/invoices/${note.body.id}/issue`)).status).toBe(200)
    // ten part payments of a tenth each, all at once: every one counts
    const all = await Promise.all(Array.from({ length: 10 }, () => pay(crowd.id, crowd.amountDuePence / 10)))
    expect(all.map(r => r.status)).toEqual(Array(10).fill(201))

    expect(await drifted()).toEqual([])
    const kept = Object.fromEntries((await asFirm<{ reference: string, settled_pence: number }>(`select reference, settled_pence from invoices where firm_id = $1 and reference is not null and kind <> 'credit-note'`, [firmId])).map(r => [r.reference, r.settled_pence]))
    expect(kept[unpaid.reference]).toBe(0)
    expect(kept[part.reference]).toBe(100_00)
    expect(kept[over.reference]).toBe(over.amountDuePence + 5_00)
    expect(kept[refunded.reference]).toBe(refunded.amountDuePence - 20_00)
    expect(kept[credited.reference]).toBe(credited.amountDuePence)
    expect(kept[crowd.reference]).toBe(crowd.amountDuePence)

    // the owed view: the unpaid, the part paid and the part refunded; not the paid, overpaid or credited
    expect(await owedReferences()).toEqual([unpaid.reference, part.reference, refunded.reference].sort())
  })

  it('follows a payment changed, moved to another invoice, or deleted, and many written in one statement', async () => {
    const a = await issued(60_00)
    const b = await issued(70_00)
    const [p] = await asFirm<{ id: string }>(`insert into payments (firm_id, invoice_id, method, amount_pence, received_on) values ($1, $2, 'cheque', 6000, '2026-12-01') returning id`, [firmId, a.id])
    expect(await owedReferences()).not.toContain(a.reference)
    await asFirm('update payments set amount_pence = 1000 where id = $1', [p!.id])
    expect(await drifted()).toEqual([])
    await asFirm('update payments set invoice_id = $2 where id = $1', [p!.id, b.id])
    expect(await drifted()).toEqual([])
    await asFirm('delete from payments where id = $1', [p!.id])
    expect(await drifted()).toEqual([])
    // one statement, five payments over two invoices
    await asFirm(`insert into payments (firm_id, invoice_id, method, amount_pence, received_on)
      select $1, case when n % 2 = 0 then $2::uuid else $3::uuid end, 'cash', 1200, '2026-12-01' from generate_series(1, 5) n`, [firmId, a.id, b.id])
    expect(await drifted()).toEqual([])
    const owed = await owedReferences()
    expect(owed).toContain(a.reference)
    expect(owed).toContain(b.reference)
  })

  it('pages the customers most owed, with whole totals and counts, and the longest overdue first', async () => {
    const late = await issued(55_00)
    const later = await issued(65_00)
    await asFirm('update invoices set due_on = $2 where id = $1', [late.id, '2026-09-01'])
    await asFirm('update invoices set due_on = $2 where id = $1', [later.id, '2026-06-01'])
    const whole = (await owner.get('/api/owed?pageSize=200')).body
    expect(whole.counts.customers).toBeGreaterThan(3)
    expect(whole.customers).toHaveLength(whole.counts.customers)
    // most owed first
    const totals = whole.customers.map((c: { totalPence: number }) => c.totalPence)
    expect(totals).toEqual([...totals].sort((a: number, b: number) => b - a))
    const first = await owner.get('/api/owed?pageSize=1')
    expect(first.status).toBe(200)
    const second = (await owner.get('/api/owed?pageSize=1&page=2')).body
    for (const page of [first.body, second]) {
      expect(page.totals).toEqual(whole.totals)
      expect(page.totalPence).toBe(whole.totalPence)
      expect(page.counts).toEqual(whole.counts)
    }
    expect(first.body.customers).toEqual(whole.customers.slice(0, 1))
    expect(second.customers).toEqual(whole.customers.slice(1, 2))
    // the longest overdue first, as many as the page size
    expect(whole.counts.overdue).toBe(2)
    expect(whole.overdue.map((i: { reference: string }) => i.reference)).toEqual([later.reference, late.reference])
    expect(first.body.overdue.map((i: { reference: string }) => i.reference)).toEqual([later.reference])
    // each customer's total is the sum of its invoices, and the buckets add up to the whole
    for (const c of whole.customers) expect(c.invoices.reduce((s: number, i: { outstandingPence: number }) => s + i.outstandingPence, 0)).toBe(c.totalPence)
    expect(Object.values(whole.totals as Record<string, number>).reduce((a, b) => a + b, 0)).toBe(whole.totalPence)
    for (const [query, field] of [['pageSize=0', 'pageSize'], ['pageSize=201', 'pageSize'], ['pageSize=2.5', 'pageSize'], ['page=0', 'page'], ['page=ten', 'page']]) {
      const res = await owner.get(`/api/owed?${query}`)
      expect(res.status, query).toBe(400)
      expect(JSON.stringify(res.body), query).toContain(`${field} is a whole number`)
    }
  })
})

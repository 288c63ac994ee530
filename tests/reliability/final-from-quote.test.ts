import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { statuses, together } from './race'

// The final invoice of a job made from an accepted quote carries the quote's lines, less each
// invoice before it as a negative line (issue 17). Released many at once behind one gate, then read
// from the database: one final at most, and the job's invoices never claim more than the quote's
// net; with a final drafted, exactly the quote's net. The firm, customer and prices are invented.

const AT_ONCE = 12
let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Sorrel Gate Plastering'))
  // the firm's bank account (invented), so its invoices may offer payment by transfer
  await queryAsFirm(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, `update firms set bank_account_name = 'Sorrel Gate Plastering', bank_sort_code = '608371', bank_account_number = '31926819' where id = $1`, [firmId])
})
afterAll(async () => {
  await app?.stop()
})

const show = (r: { status: number, body: unknown }) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 300)}`

// awkward pence: each line's net rounded on its own (6.977 x £18.07 = £126.07, 2.405 x £6.33 = £15.22)
const LINES = [
  { kind: 'labour', description: 'Skim walls: Front room', quantityX1000: 6977, unit: 'm²', unitPence: 18_07, vatRatePercent: 0, derivation: '' },
  { kind: 'labour', description: 'Fit beads: Front room', quantityX1000: 2405, unit: 'm', unitPence: 6_33, vatRatePercent: 0, derivation: '' },
  { kind: 'materials', description: 'Multi-finish (25 kg bag)', quantityX1000: 3000, unit: 'packs', unitPence: 11_11, vatRatePercent: 0, derivation: '' },
]

/** An accepted quote of these lines (the firm is not VAT-registered), made a job; its net and the job's id. */
async function acceptedJob() {
  const email = uniqueEmail('sorrel')
  const c = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Linnea Barrowcliffe', email }, site: { line1: '12 Sorrel Gate', postcode: 'KB2 6SG' } })
  expect(c.status, show(c)).toBe(201)
  const q = (await owner.post('/api/quotes', { customerId: c.body.id, siteId: c.body.sites[0].id })).body
  const saved = await owner.put(`/api/quotes/${q.id}/draft`, { pricing: 'measure', estimatedDaysX100: 100, validUntil: '2027-03-01', vat: 'not-registered', lines: LINES })
  expect(saved.status, show(saved)).toBe(200)
  expect((await owner.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
  const token = /\/q\/([\w-]+)/.exec((await app.waitForMail(email, /quote/i)).text!)![1]!
  expect((await new Client(app.url).post(`/api/public/quotes/${token}/accept`, { name: 'Linnea Barrowcliffe' })).status).toBe(200)
  const job = await owner.post(`/api/quotes/${q.id}/job`)
  expect(job.status, show(job)).toBe(201)
  return { jobId: job.body.id as string, netPence: saved.body.current.totals.netPence as number }
}

/** What the job's invoices (drafts included, credit notes apart) claim, each line's net rounded as the totals round it, and how many finals it has. */
async function claimed(jobId: string) {
  const [row] = await queryAsFirm<{ n: number, finals: number }>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, `
    select coalesce(sum(round(l.quantity_x_1000::numeric * l.unit_pence / 1000)), 0)::int as n,
           (select count(*) from invoices f where f.firm_id = $1 and f.job_id = $2 and f.kind = 'final')::int as finals
      from invoice_lines l join invoices i on i.firm_id = l.firm_id and i.id = l.invoice_id
     where i.firm_id = $1 and i.job_id = $2 and i.kind <> 'credit-note' and not l.extra_work`, [firmId, jobId])
  return row!
}

describe('the final invoice from an accepted quote, drafted many at once', () => {
  it('drafts one final of twelve sent at once, carrying the quote\'s net exactly', async () => {
    const { jobId, netPence } = await acceptedJob()
    expect(netPence).toBe(126_07 + 15_22 + 33_33)
    const answers = await together(AT_ONCE, () => owner.post('/api/invoices', { kind: 'final', jobId }))
    expect(statuses(answers), answers.map(show).join('\n')).toEqual({ 201: 1, 409: AT_ONCE - 1 })
    expect(await claimed(jobId)).toEqual({ n: netPence, finals: 1 })
  })

  it('after a deposit, finals and more deposits at once never claim past the quote, and a final takes exactly what is left', async () => {
    const { jobId, netPence } = await acceptedJob()
    const deposit = await owner.post('/api/invoices', { kind: 'deposit', jobId, percent: 30 })
    expect(deposit.status, show(deposit)).toBe(201)
    expect((await owner.post(`/api/invoices/${deposit.body.id}/issue`)).status).toBe(200)
    const answers = await together(AT_ONCE, i => owner.post('/api/invoices', i % 2 === 0 ? { kind: 'final', jobId } : { kind: 'deposit', jobId, percent: 10 }))
    expect(answers.filter(r => r.status >= 500), answers.map(show).join('\n')).toEqual([])
    const finals = answers.filter((r, i) => i % 2 === 0 && r.status === 201)
    expect(finals).toHaveLength(1)
    // the final carries the quote's lines, then one line taking off each invoice before it
    const lines = (await owner.get(`/api/invoices/${finals[0]!.body.id}`)).body.lines as { description: string, unitPence: number }[]
    expect(lines.slice(0, 3).map(l => l.description)).toEqual(LINES.map(l => l.description))
    expect(lines.slice(3).length).toBeGreaterThan(0)
    expect(lines.slice(3).every(l => l.description.startsWith('Less invoiced before: ') && l.unitPence < 0)).toBe(true)
    expect(await claimed(jobId)).toEqual({ n: netPence, finals: 1 })
  })
})

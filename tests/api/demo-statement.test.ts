import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client } from '../support/client'
import { queryAsFirm } from '../support/db'
import { DEMO_PEOPLE } from '../../seeds/demo'
import { DEMO_BANK_ACCOUNT, demoStatement, type DemoStatement } from '../../seeds/statement'

// The demo firm's bank statement (seeds/statement.ts), built from the database the test run seeded
// (scripts/test.mjs runs seeds/index.ts), imported into an account of its own (the seeded "Business
// current account" is left empty for the partner and the browser tests), and what the import
// proposes for it. The account goes at the end, so the demo firm is as it was seeded.

let app: TestApp
let owner: Client
let statement: DemoStatement
let accountId: string | null = null
const ownerUrl = () => requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL')
const sql = <T = Record<string, unknown>>(text: string, values: unknown[] = []) => queryAsFirm<T>(ownerUrl(), statement.firmId, text, values)

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  statement = await demoStatement(ownerUrl())
  const jess = DEMO_PEOPLE.find(p => p.role === 'owner')!
  owner = new Client(app.url)
  expect((await owner.post('/api/auth/sign-in', { email: jess.email, password: jess.password })).status).toBe(200)
})
afterAll(async () => {
  if (accountId) await sql('delete from bank_accounts where firm_id = $1 and id = $2', [statement.firmId, accountId])
  await app?.stop()
})

async function upload(id: string, text: string) {
  const form = new FormData()
  form.append('file', new Blob([text], { type: 'text/csv' }), statement.fileName)
  const res = await fetch(`${app.url}/api/bank-accounts/${id}/statements/uploads`, { method: 'POST', body: form, headers: { cookie: owner.cookieHeader() } })
  return { status: res.status, body: await res.json().catch(() => null) as any }
}

describe('the demo firm\'s bank statement', () => {
  it('the seed gives the demo firm its "Business current account", with no lines of its own', async () => {
    const accounts = await sql<{ id: string, name: string, seeded_lines: number }>(`select a.id, a.name,
      (select count(*)::int from bank_lines l where l.firm_id = a.firm_id and l.account_id = a.id and l.created_at = a.created_at) as seeded_lines
      from bank_accounts a where a.firm_id = $1 and a.name = $2`, [statement.firmId, DEMO_BANK_ACCOUNT])
    expect(accounts).toEqual([expect.objectContaining({ name: DEMO_BANK_ACCOUNT, seeded_lines: 0 })])
  })

  it('is the same file however often it is built from the same database', async () => {
    expect((await demoStatement(ownerUrl())).text).toBe(statement.text)
    expect(statement.text.split('\r\n')[0]).toBe('Date,Description,Amount,Balance')
  })

  it('imports whole, and the import proposes what each line is', async () => {
    const made = await owner.post('/api/bank-accounts', { name: 'Demo statement (API test)' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    accountId = made.body.id as string
    const imported = await upload(accountId, statement.text)
    expect(imported.status, JSON.stringify(imported.body)).toBe(200)
    expect(imported.body).toMatchObject({ linesNew: statement.lines.length, linesAlready: 0, format: 'csv' })

    const res = await owner.get(`/api/bank-accounts/${accountId}/lines`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const got = res.body.lines as { date: string, description: string, amountPence: number, balancePence: number, proposal: any }[]
    expect(got).toHaveLength(statement.lines.length)
    const proposalOf = (l: DemoStatement['lines'][number]) => {
      const found = got.find(g => g.date === l.date && g.description === l.description && g.amountPence === l.amountPence)
      expect(found, `${l.date} ${l.description}`).toBeTruthy()
      return found!.proposal
    }

    // money in against the invoices it pays: at least three for sure; the ambiguous amount never sure
    const paying = statement.lines.filter(l => l.is.kind === 'invoices')
    let sure = 0
    for (const l of paying) {
      if (l.is.kind !== 'invoices') continue
      const p = proposalOf(l)
      expect(p?.parts?.map((x: { invoiceId: string }) => x.invoiceId), `${l.is.how}: ${l.description} ${JSON.stringify(p)}`).toEqual(l.is.invoiceIds)
      if (l.is.how === 'ambiguous') {
        expect(p.certainty).not.toBe('sure')
        expect(p.alternatives).toHaveLength(1)
      }
      else {
        expect(p.certainty, `${l.is.how}: ${JSON.stringify(p.reasons)}`).toBe('sure')
        sure++
      }
    }
    expect(sure).toBeGreaterThanOrEqual(3)
    const part = paying.find(l => l.is.kind === 'invoices' && l.is.how === 'part-payment')!
    expect(proposalOf(part).parts).toEqual([expect.objectContaining({ amountPence: part.amountPence })])

    // money out: each card payment to a merchant is its recorded purchase; the fuel with none becomes a new one
    const bought = statement.lines.filter(l => l.is.kind === 'purchase')
    expect(bought.length).toBeGreaterThanOrEqual(1)
    for (const l of bought) {
      expect(proposalOf(l), l.description).toMatchObject({ certainty: 'sure', match: { kind: 'purchase', purchaseId: l.is.kind === 'purchase' ? l.is.purchaseId : '' } })
    }
    const fuel = statement.lines.find(l => l.is.kind === 'no-purchase')!
    expect(proposalOf(fuel)).toMatchObject({ match: { kind: 'new-purchase', supplier: 'HOBBLECOTE FUEL STOP' } })

    // the deposit's transfer, typed in by hand when it came: that payment, recording nothing more
    const typed = statement.lines.find(l => l.is.kind === 'recorded-transfer')!
    expect(proposalOf(typed)).toMatchObject({ certainty: 'sure', parts: [], recordedPaymentId: typed.is.kind === 'recorded-transfer' ? typed.is.paymentId : '' })

    // the Stripe payout: its card payments were recorded one by one, so it settles no invoice
    const payouts = statement.lines.filter(l => l.is.kind === 'stripe-payout')
    expect(payouts).toHaveLength(1)
    expect(proposalOf(payouts[0]!)).toMatchObject({ certainty: 'sure', payout: true, parts: [] })
  })
})

import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { BANK_DETAILS_NEEDED } from '../../shared/utils/bank-details'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type Client } from '../support/client'
import { inviteAndJoin } from './support'

// The firm's bank account for payment by transfer: asked for in the firm's settings (account name,
// sort code, account number, each checked, a bad one named beside its field), shown only to those
// who see the money, and needed before an invoice offering transfer is issued: without it the
// issue is refused with a 409 naming what is missing, and nothing is numbered or sent.

let app: TestApp

beforeAll(async () => {
  app = await startApp()
})
afterAll(async () => {
  await app?.stop()
})

/** The firm's settings as the Firm page sends them, with `patch` on top. */
async function settings(owner: Client, patch: Record<string, unknown>) {
  const firm = (await owner.get('/api/firm')).body
  return owner.patch('/api/firm', {
    tradingName: firm.tradingName, addressLine1: firm.addressLine1, addressLine2: firm.addressLine2, town: firm.town, postcode: firm.postcode,
    email: firm.email, phone: firm.phone, vatRegistered: firm.vatRegistered, vatNumber: firm.vatNumber, cisStatus: firm.cisStatus, utr: firm.utr,
    dayRatePence: firm.dayRatePence, paymentTermsDays: firm.paymentTermsDays, invoicePrefix: 'BD-', creditNotePrefix: 'BD-C',
    ...patch,
  })
}

/** A blank draft invoice of one labour line for a new customer with an e-mail address. */
async function draftFor(owner: Client) {
  const email = uniqueEmail('ffion')
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Ffion Quillet', email }, site: { line1: '8 Tansy Row', postcode: 'KB8 3TT' } })).body
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  const saved = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Skim the back bedroom', quantityX1000: 1000, unitPence: 380_00 }] })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  return { id: draft.id as string, email }
}

/** The firm's invoices as the database holds them (the owner role, the firm set). */
async function invoiceRows(firmId: string) {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const { rows } = await db.query<{ id: string, number: number | null, reference: string | null, issued_on: string | null }>('select id, number, reference, issued_on from invoices where firm_id = $1 order by created_at', [firmId])
    await db.query('commit')
    return rows
  }
  finally {
    await db.end()
  }
}

describe('the bank account in the firm\'s settings', () => {
  it('keeps a good account as digits, shows the sort code as people write it, and names a bad part beside its field', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Quillet Bank Plastering', { bank: false })
    const kept = await settings(owner, { takesTransfer: true, bankAccountName: ' Quillet Bank Plastering ', bankSortCode: '12 34 56', bankAccountNumber: '1234 5678' })
    expect(kept.status, JSON.stringify(kept.body)).toBe(200)
    expect(kept.body).toMatchObject({ takesTransfer: true, bankAccountName: 'Quillet Bank Plastering', bankSortCode: '123456', bankAccountNumber: '12345678' })
    expect(kept.body).not.toHaveProperty('bankDetails')

    // bad parts: a 400 naming each field, and what was kept stays as it was
    for (const [patch, field, words] of [
      [{ bankSortCode: '12-34-5' }, 'bankSortCode', /six digits/],
      [{ bankSortCode: '12-34-5X' }, 'bankSortCode', /six digits/],
      [{ bankAccountNumber: '1234567' }, 'bankAccountNumber', /eight digits/],
      [{ bankAccountNumber: '1234-5678' }, 'bankAccountNumber', /digits only/],
      [{ takesTransfer: 'yes' }, 'takesTransfer', /transfer/],
      [{ bankAccountName: 'x'.repeat(141) }, 'bankAccountName', /140/],
    ] as const) {
      const res = await settings(owner, { takesTransfer: true, bankAccountName: 'Quillet Bank Plastering', bankSortCode: '12-34-56', bankAccountNumber: '12345678', ...patch })
      expect(res.status, JSON.stringify(patch)).toBe(400)
      expect(Object.keys(res.body.data.fields), JSON.stringify(patch)).toEqual([field])
      expect(res.body.data.fields[field]).toMatch(words)
    }
    expect((await owner.get('/api/firm')).body).toMatchObject({ bankAccountName: 'Quillet Bank Plastering', bankSortCode: '123456', bankAccountNumber: '12345678' })

    // a client that does not send the bank fields leaves them as they are; blanks are kept as blanks
    const { takesTransfer: _t, bankAccountName: _n, bankSortCode: _s, bankAccountNumber: _a, ...older } = (await owner.get('/api/firm')).body
    const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, ...rest } = older
    expect((await owner.patch('/api/firm', { ...rest, invoicePrefix: 'BD-', creditNotePrefix: 'BD-C' })).body).toMatchObject({ bankSortCode: '123456', bankAccountNumber: '12345678' })
    expect((await settings(owner, { bankAccountName: '', bankSortCode: '', bankAccountNumber: '' })).body).toMatchObject({ bankAccountName: '', bankSortCode: '', bankAccountNumber: '' })
  })

  it('is shown to those who see the money (owner, office, accountant), not to the crew', async () => {
    const { client: owner } = await signUpFirm(app.url, 'Roles Bank Plastering', { bank: false })
    expect((await settings(owner, { bankAccountName: 'Roles Bank Plastering', bankSortCode: '65-43-21', bankAccountNumber: '87654321' })).status).toBe(200)
    const account = { bankAccountName: 'Roles Bank Plastering', bankSortCode: '654321', bankAccountNumber: '87654321' }
    for (const role of ['office', 'accountant', 'crew'] as const) {
      const { client } = await inviteAndJoin(app, owner, uniqueEmail(role), role)
      const firm = (await client.get('/api/firm')).body
      expect(firm.tradingName).toBe('Roles Bank Plastering')
      expect(firm).not.toHaveProperty('bankDetails')
      if (role === 'crew') for (const key of Object.keys(account)) expect(firm, `crew: ${key}`).not.toHaveProperty(key)
      else expect(firm, role).toMatchObject(account)
    }
  })
})

describe('issuing an invoice that offers payment by transfer', () => {
  it('is refused without the bank details (nothing numbered, nothing sent, even many at once), and goes once they are there', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Nobank Plastering', { bank: false })
    // half the account is no account: the name missing
    expect((await settings(owner, { takesTransfer: true, bankAccountName: '', bankSortCode: '11-22-33', bankAccountNumber: '44556677' })).status).toBe(200)
    const drafts = await Promise.all(Array.from({ length: 6 }, () => draftFor(owner)))
    // all released at once
    const answers = await Promise.all(drafts.map(d => owner.post(`/api/invoices/${d.id}/issue`)))
    for (const res of answers) {
      expect(res.status, JSON.stringify(res.body)).toBe(409)
      expect(res.body.data.fields).toEqual({ bankDetails: BANK_DETAILS_NEEDED })
    }
    // the database: every one still a draft, no number taken
    const before = await invoiceRows(firmId)
    expect(before).toHaveLength(drafts.length)
    for (const row of before) expect(row).toMatchObject({ number: null, reference: null, issued_on: null })
    expect((await owner.get(`/api/invoices/${drafts[0]!.id}`)).body.issuedOn).toBeNull()

    // with the account filled in, the first one issued takes the first number and is sent once
    expect((await settings(owner, { takesTransfer: true, bankAccountName: 'Nobank Plastering', bankSortCode: '11-22-33', bankAccountNumber: '44556677' })).status).toBe(200)
    const issued = await owner.post(`/api/invoices/${drafts[0]!.id}/issue`)
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    expect(issued.body.reference).toBe((await invoiceRows(firmId)).find(r => r.id === drafts[0]!.id)!.reference)
    expect((await invoiceRows(firmId)).find(r => r.id === drafts[0]!.id)!.number).toBe(1)
    await app.waitForMail(drafts[0]!.email, /Invoice /)
    // the refused ones were never sent: no mail to their customers (the first customer's came after its issue)
    for (const d of drafts) expect(app.mails.filter(m => m.to && JSON.stringify(m.to).includes(d.email)), d.email).toHaveLength(d === drafts[0] ? 1 : 0)
  })

  it('goes without bank details when the firm does not take payment by transfer; a credit note never needs them', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Cardonly Plastering', { bank: false })
    expect((await settings(owner, { takesTransfer: false, bankAccountName: '', bankSortCode: '', bankAccountNumber: '' })).status).toBe(200)
    const d = await draftFor(owner)
    const issued = await owner.post(`/api/invoices/${d.id}/issue`)
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    expect((await invoiceRows(firmId)).find(r => r.id === d.id)).toMatchObject({ number: 1 })

    // transfer back on, still no account: a credit note asks the customer for nothing, so it is issued
    expect((await settings(owner, { takesTransfer: true })).status).toBe(200)
    const note = await owner.post(`/api/invoices/${d.id}/credit-note`)
    expect(note.status, JSON.stringify(note.body)).toBe(201)
    expect((await owner.post(`/api/invoices/${note.body.id}/issue`)).status).toBe(200)
    // ...while a new invoice is refused again
    const next = await draftFor(owner)
    const refused = await owner.post(`/api/invoices/${next.id}/issue`)
    expect(refused.status).toBe(409)
    expect(refused.body.data.fields.bankDetails).toBe(BANK_DETAILS_NEEDED)
  })
})

// Setwell's own references (issue 17): a new firm's letters and prefixes come from its trading name
// by the same rule as migration 0027's back-fill; every list and detail sends the job's reference
// (the pages never rebuild one); the first invoice and credit note are numbered under the defaults.
import { readFileSync } from 'node:fs'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type Client } from '../support/client'
import { firmLetters } from '../../shared/utils/references'

let app: TestApp
let owner: Client

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner } = await signUpFirm(app.url, 'The Hartley and Moss Plastering Company Ltd'))
})
afterAll(async () => {
  await app?.stop()
})

describe('references of Setwell\'s own', () => {
  it('a new firm starts with its letters and prefixes from its trading name', async () => {
    const firm = (await owner.get('/api/firm')).body
    expect(firm).toMatchObject({ referenceLetters: 'HMP', invoicePrefix: 'HMP-', creditNotePrefix: 'HMP-C' })
  })

  it('sends the job\'s reference in the list, the detail and the diary, and numbers invoices and credit notes under the letters', async () => {
    const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Orla Penhallow', email: uniqueEmail('orla') }, site: { line1: '3 Tanner Yard', postcode: 'KB2 4TR' } })).body
    const made = await owner.post('/api/jobs', { customerId: c.id, siteId: c.sites[0].id, title: 'Skim the back bedroom' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    expect(made.body.reference).toBe('HMP-J1')
    expect((await owner.get(`/api/jobs/${made.body.id}`)).body.reference).toBe('HMP-J1')
    expect((await owner.get('/api/jobs')).body.find((j: any) => j.id === made.body.id).reference).toBe('HMP-J1')
    const me = (await owner.get('/api/me')).body
    const booked = await owner.put(`/api/jobs/${made.body.id}/days`, { days: [{ day: '2026-12-08', userId: me.user.id }] })
    expect(booked.status, JSON.stringify(booked.body)).toBe(200)
    const diary = (await owner.get('/api/diary?from=2026-12-07&to=2026-12-13')).body
    expect(diary.map((d: any) => d.reference)).toEqual(['HMP-J1'])
    expect((await owner.get('/api/quotes')).body).toEqual([])
  })
})

describe('the firm\'s letters: the same rule in TypeScript (sign-up) as in migration 0027\'s back-fill (firms made before)', () => {
  const migration = readFileSync(new URL('../../drizzle/0027_firm_bank_and_letters.sql', import.meta.url), 'utf8')
  const expression = migration.match(/SET "reference_letters" = (coalesce\([\s\S]*?'S'\));/)?.[1]

  it.each([
    'Brackenridge Plastering', 'Brackenridge Plastering Ltd', 'The Lath and Float Company Limited', 'Lath & Float Plastering',
    'Hartley, Moss & Dunne Plastering Co.', 'smith plastering', 'Kettlebury', 'J.R. Skim-Coat 2000 PLC', 'O\'Neill Plastering',
    'The Ltd', '', '123', 'Éclair Plastering', 'A B C D E', 'Walls of Stone LLP',
  ])('%j', async (name) => {
    expect(expression, 'the back-fill expression in the migration').toBeTruthy()
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      const { rows } = await db.query(`select ${expression!.replaceAll('"trading_name"', '$1::text')} as letters`, [name])
      expect(rows[0].letters).toBe(firmLetters(name))
    }
    finally {
      await db.end()
    }
  })
})

import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { signUpFirm } from '../support/client'

// The second wall: even a query that forgot its firm condition sees nothing of any firm.
let app: TestApp
let db: pg.Client
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ firmId } = await signUpFirm(app.url, 'RLS Check Plastering'))
  db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_DATABASE_URL') })
  await db.connect()
})
afterAll(async () => {
  await db?.end()
  await app?.stop()
})

const FIRM_TABLES = ['firms', 'memberships', 'invitations', 'audit_log', 'customers', 'sites', 'enquiries', 'enquiry_events', 'visits', 'rooms', 'surfaces', 'openings', 'conditions', 'corners', 'photos', 'price_books', 'materials', 'quotes', 'quote_versions', 'quote_lines', 'jobs', 'job_status_changes', 'job_days', 'set_logs', 'material_uses', 'calendar_feeds', 'set_log_photos', 'invoices', 'invoice_lines', 'payments', 'stripe_events', 'chase_notes', 'reminder_rules', 'bank_rates', 'purchases', 'purchase_jobs', 'cis_statements', 'documents']

describe('row-level security, as the app\'s database role', () => {
  it.each(FIRM_TABLES)('%s returns no rows with no firm set', async (table) => {
    const { rows } = await db.query(`select count(*)::int as n from ${table}`)
    expect(rows[0].n).toBe(0)
  })

  it('returns the firm\'s rows, and only those, once the firm is set for the transaction', async () => {
    await db.query('begin')
    try {
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      const firms = await db.query('select id, trading_name from firms')
      expect(firms.rows).toEqual([{ id: firmId, trading_name: 'RLS Check Plastering' }])
      const others = await db.query('select count(*)::int as n from memberships where firm_id <> $1', [firmId])
      expect(others.rows[0].n).toBe(0)
      const mine = await db.query('select count(*)::int as n from memberships')
      expect(mine.rows[0].n).toBe(1)
    }
    finally {
      await db.query('rollback')
    }
    // the setting was transaction-local: gone again
    expect((await db.query('select count(*)::int as n from firms')).rows[0].n).toBe(0)
  })

  it('refuses to write a row into another firm', async () => {
    const other = await signUpFirm(app.url, 'Other Firm')
    await db.query('begin')
    try {
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      await expect(db.query(`insert into audit_log (firm_id, action, entity) values ($1, 'x', 'y')`, [other.firmId])).rejects.toThrow(/row-level security/)
    }
    finally {
      await db.query('rollback')
    }
  })

  it('runs as a role that owns no table, with RLS forced on every firm table', async () => {
    const { rows } = await db.query(`
      select c.relname, c.relrowsecurity, c.relforcerowsecurity, pg_get_userbyid(c.relowner) as owner
      from pg_class c where c.relname = any($1) order by c.relname`, [FIRM_TABLES])
    expect(rows.map(r => r.relname)).toEqual([...FIRM_TABLES].sort())
    for (const r of rows) {
      expect(r.relrowsecurity, r.relname).toBe(true)
      expect(r.relforcerowsecurity, r.relname).toBe(true)
      expect(r.owner).not.toBe((await db.query('select current_user as u')).rows[0].u)
    }
    const su = await db.query('select rolsuper, rolbypassrls from pg_roles where rolname = current_user')
    expect(su.rows[0]).toEqual({ rolsuper: false, rolbypassrls: false })
  })

  it('keeps the audit log append-only for the app', async () => {
    await expect(db.query('delete from audit_log')).rejects.toThrow(/permission denied/)
    await expect(db.query(`update audit_log set action = 'x'`)).rejects.toThrow(/permission denied/)
  })
})

import { randomUUID } from 'node:crypto'
import { execFile } from 'node:child_process'
import { mkdtempSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { promisify } from 'node:util'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
// @ts-expect-error plain JavaScript, no types
import { profile, urls } from '../../scripts/lib/env.mjs'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'

// `npm run db:backup` and `npm run db:restore` (scripts/db.mjs, scripts/backup.mjs) on the test
// cluster: rows written through the server, a dump taken by the script as of a snapshot we hold
// open, restored by the script into a new database on the same cluster (the main test database is
// left alone), then every table of every schema of ours (from the catalogue) compared by row count
// and checksum, with the owners, grants, policies, FORCE flags and pg-boss's schema; then a server
// runs on the restored database as the app role, as it did on the original.

const run = promisify(execFile)
const p = profile('test')
const u = urls(p) as { superuser: string, owner: string, app: string }
const copyName = `setwell_restore_${process.pid}`

/** A connection string for another database of the same cluster. */
function on(url: string, database: string) {
  const x = new URL(url)
  x.pathname = `/${database}`
  return x.href
}

async function connect(url: string) {
  const c = new pg.Client({ connectionString: url })
  await c.connect()
  return c
}

/** The script as a person runs it: `node scripts/db.mjs backup|restore ... --test`. Its last line of output. */
async function script(...args: string[]) {
  const { stdout } = await run('node', ['scripts/db.mjs', ...args, '--test'], { env: process.env, timeout: 60_000 })
  return stdout.trim().split('\n').pop()!
}

const USER_SCHEMAS = `n.nspname not in ('pg_catalog', 'information_schema') and n.nspname not like 'pg\\_toast%' and n.nspname not like 'pg\\_temp%'`

/**
 * Every table's row count and checksum, and the parts of the catalogue the app depends on, read
 * as the superuser (the owner role is under FORCE ROW LEVEL SECURITY and would see no firm's rows).
 */
async function fingerprint(c: pg.Client) {
  const { rows: tables } = await c.query<{ name: string }>(`
    select format('%I.%I', n.nspname, c.relname) as name from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where c.relkind in ('r', 'p') and ${USER_SCHEMAS} order by 1`)
  const data: Record<string, { rows: number, md5: string }> = {}
  for (const { name } of tables) {
    const { rows: [r] } = await c.query(`select count(*)::int as rows, coalesce(md5(string_agg(t::text, '|' order by t::text)), '') as md5 from ${name} t`)
    data[name] = r
  }
  const lines = async (sql: string) => (await c.query<{ line: string }>(sql)).rows.map(r => r.line)
  const catalogue = {
    database: await lines(`select concat_ws(' ', pg_get_userbyid(datdba), datacl::text, pg_encoding_to_char(encoding), datcollate) as line from pg_database where datname = current_database()`),
    schemas: await lines(`select concat_ws(' ', nspname, pg_get_userbyid(nspowner), nspacl::text) as line from pg_namespace n where ${USER_SCHEMAS} order by 1`),
    relations: await lines(`select concat_ws(' ', format('%I.%I', n.nspname, c.relname), c.relkind, pg_get_userbyid(c.relowner), c.relacl::text, 'rls=' || c.relrowsecurity, 'force=' || c.relforcerowsecurity) as line
      from pg_class c join pg_namespace n on n.oid = c.relnamespace where c.relkind in ('r', 'p', 'S', 'v', 'm') and ${USER_SCHEMAS} order by 1`),
    policies: await lines(`select concat_ws(' ', schemaname, tablename, policyname, permissive, roles::text, cmd, qual, with_check) as line from pg_policies order by 1`),
    constraints: await lines(`select concat_ws(' ', conrelid::regclass::text, conname, pg_get_constraintdef(c.oid)) as line from pg_constraint c join pg_namespace n on n.oid = c.connamespace where ${USER_SCHEMAS} order by 1`),
    indexes: await lines(`select indexdef as line from pg_indexes where schemaname not in ('pg_catalog', 'information_schema') order by 1`),
    functions: await lines(`select concat_ws(' ', p.oid::regprocedure::text, pg_get_userbyid(p.proowner), p.proacl::text) as line from pg_proc p join pg_namespace n on n.oid = p.pronamespace where ${USER_SCHEMAS} order by 1`),
    defaultPrivileges: await lines(`select concat_ws(' ', pg_get_userbyid(defaclrole), defaclnamespace::regnamespace::text, defaclobjtype, defaclacl::text) as line from pg_default_acl order by 1`),
    extensions: await lines(`select concat_ws(' ', extname, pg_get_userbyid(extowner), extversion) as line from pg_extension order by 1`),
    sequences: await lines(`select concat_ws(' ', schemaname, sequencename, last_value) as line from pg_sequences order by 1`),
  }
  return { data, catalogue }
}

let app: TestApp
let restoredApp: TestApp | undefined
let owner: Client
let ownerEmail: string
let firmId: string
let invoiceId: string
let dir: string

beforeAll(async () => {
  // the script's test profile is the cluster and database scripts/test.mjs gave this run
  expect(u.owner, 'scripts/lib/env.mjs profile("test") is not the database of this test run (SETWELL_TEST_PG_PORT?)').toBe(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'))
  dir = mkdtempSync(join(tmpdir(), 'setwell-backup-'))
  app = await startApp()
  ;({ client: owner, email: ownerEmail, firmId } = await signUpFirm(app.url, 'Backup & Restore Plastering'))
  // text that a careless dump or checksum would mangle: quotes, a backslash, a new line, accents, an emoji
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Siân O\'Rourke-Łęcka "Nan" \\ 🏠', email: uniqueEmail('sian'), notes: 'Side gate sticks.\nRing twice.' }, site: { line1: '1 Chalk Yard', postcode: 'KB2 9PQ' } })).body
  expect(c.id).toBeTruthy()
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Float and set the back bedroom', quantityX1000: 1500, unitPence: 210_00 }] })
  const issued = await owner.post(`/api/invoices/${draft.id}/issue`)
  expect(issued.status, JSON.stringify(issued.body)).toBe(200)
  invoiceId = draft.id
  const paid = await owner.post(`/api/invoices/${invoiceId}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 100_00, receivedOn: '2026-11-30', reference: 'FPS O\'ROURKE' })
  expect(paid.status, JSON.stringify(paid.body)).toBe(201)
})

afterAll(async () => {
  await restoredApp?.stop()
  await app?.stop()
  const c = await connect(u.superuser)
  try {
    await c.query(`drop database if exists ${copyName} with (force)`)
  }
  finally { await c.end() }
  if (dir) rmSync(dir, { recursive: true, force: true })
})

describe('npm run db:backup and db:restore', () => {
  let before: Awaited<ReturnType<typeof fingerprint>>
  let after: Awaited<ReturnType<typeof fingerprint>>

  it('restores a dump into a new database with the same rows in every table, and the same owners, grants and policies', async () => {
    // the owner role cannot take the dump: FORCE ROW LEVEL SECURITY applies to it too
    const asOwner = await connect(u.owner)
    try {
      expect((await asOwner.query('select count(*)::int as n from customers')).rows[0].n).toBe(0)
      expect((await asOwner.query('select rolbypassrls from pg_roles where rolname = current_user')).rows[0].rolbypassrls).toBe(false)
    }
    finally { await asOwner.end() }

    // what we compare with is what the dump saw: one snapshot, held open while the script dumps it,
    // so other test files writing meanwhile cannot make the comparison lie
    const src = await connect(u.superuser.replace(/\/postgres$/, '/setwell'))
    let file: string
    try {
      await src.query('begin isolation level repeatable read read only')
      const { rows: [{ snapshot }] } = await src.query('select pg_export_snapshot() as snapshot')
      before = await fingerprint(src)
      file = await script('backup', `${dir}/`, '--snapshot', snapshot)
      await src.query('commit')
    }
    finally { await src.end() }
    expect(file).toMatch(new RegExp(`^${dir}/setwell-[\\dT-]+Z\\.dump$`))
    expect(statSync(file).mode & 0o077, 'a dump holds password hashes: only its owner may read it').toBe(0)

    // the catalogue's list, not ours: the app's tables, the migration journal and pg-boss's
    const names = Object.keys(before.data)
    expect(names.length).toBeGreaterThan(30)
    expect(names).toEqual(expect.arrayContaining(['public.firms', 'public.customers', 'public.invoices', 'public.payments', 'public.audit_log', 'public.sessions', 'drizzle.__drizzle_migrations', 'pgboss.job', 'pgboss.queue', 'pgboss.version']))
    expect(before.catalogue.relations.filter(l => l.startsWith('public.') && l.includes('force=true')).length).toBeGreaterThan(30)
    expect(before.data['public.payments']!.rows).toBeGreaterThan(0)

    expect(await script('restore', file, '--database', copyName)).toContain(`into ${copyName}`)
    const copy = await connect(on(u.superuser, copyName))
    try {
      after = await fingerprint(copy)
      const mine = await copy.query('select name, notes from customers where firm_id = $1', [firmId])
      expect(mine.rows).toEqual([{ name: 'Siân O\'Rourke-Łęcka "Nan" \\ 🏠', notes: 'Side gate sticks.\nRing twice.' }])
    }
    finally { await copy.end() }
    expect(after.catalogue).toEqual(before.catalogue)
    expect(after.data).toEqual(before.data)
  })

  it('would notice a changed row: the checksum is of every column of every row', async () => {
    expect(after, 'the round trip did not run').toBeDefined()
    const copy = await connect(on(u.superuser, copyName))
    try {
      await copy.query('begin')
      await copy.query('update payments set reference = reference || \' \' where firm_id = $1', [firmId])
      const { rows: [r] } = await copy.query(`select count(*)::int as rows, coalesce(md5(string_agg(t::text, '|' order by t::text)), '') as md5 from public.payments t`)
      await copy.query('rollback')
      expect(r.rows).toBe(before.data['public.payments']!.rows)
      expect(r.md5).not.toBe(before.data['public.payments']!.md5)
    }
    finally { await copy.end() }
  })

  it('serves the restored database to the app role as before: sign-in, RLS, writes, the audit log and pg-boss', async () => {
    expect(after, 'the round trip did not run').toBeDefined()
    const startedAt = new Date() // the cluster is on this machine: one clock
    restoredApp = await startApp({ NUXT_DATABASE_URL: on(requiredEnv('SETWELL_TEST_DATABASE_URL'), copyName) })
    // the session row came across: the same cookie still signs in
    const same = new Client(restoredApp.url)
    same.setCookieHeader(owner.cookieHeader())
    const seen = await same.get(`/api/invoices/${invoiceId}`)
    expect(seen.status, JSON.stringify(seen.body)).toBe(200)
    expect(seen.body).toMatchObject({ status: 'part-paid', paidPence: 100_00 })
    expect(seen.body).toEqual((await owner.get(`/api/invoices/${invoiceId}`)).body)
    // and so did the password hash
    const fresh = new Client(restoredApp.url)
    expect((await fresh.post('/api/auth/sign-in', { email: ownerEmail, password: GOOD_PASSWORD })).status).toBe(200)
    expect((await fresh.post('/api/customers', { customer: { kind: 'homeowner', name: 'After Restore', email: uniqueEmail('after') } })).status).toBe(201)
    // row-level security still divides the firms
    const { client: stranger } = await signUpFirm(restoredApp.url, 'Stranger Firm')
    expect((await stranger.get(`/api/invoices/${invoiceId}`)).status).toBe(404)

    const appRole = await connect(on(requiredEnv('SETWELL_TEST_DATABASE_URL'), copyName))
    try {
      await expect(appRole.query('update audit_log set action = action')).rejects.toThrow(/permission denied/)
      await expect(appRole.query('create table sneaky (id int)')).rejects.toThrow(/permission denied/)
      // with no firm set, a firm table shows nothing to the app role
      expect((await appRole.query('select count(*)::int as n from customers')).rows[0].n).toBe(0)
    }
    finally { await appRole.end() }

    // pg-boss works as the app role: the restored server queued its start-up sweep in the copy
    const su = await connect(on(u.superuser, copyName))
    try {
      const sweeps = async () => (await su.query(`select count(*)::int as n from pgboss.job where name = 'reminders-sweep' and created_on >= $1`, [startedAt])).rows[0].n as number
      const until = Date.now() + 10_000
      while (await sweeps() === 0 && Date.now() < until) await sleep(200)
      expect(await sweeps()).toBeGreaterThan(0)
    }
    finally { await su.end() }
    expect(restoredApp.output()).not.toMatch(/\[jobs\] not started|permission denied/)
  })
})

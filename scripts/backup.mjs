// Backups of a profile's database: pg_dump's custom format (-Fc) out, pg_restore back in.
// Used by `npm run db:backup` and `npm run db:restore` (scripts/db.mjs parses the arguments).
//
// Why the superuser: every firm table has FORCE ROW LEVEL SECURITY, so the owner role is subject
// to the policies like the app is, and with no firm set it sees no rows. pg_dump as the owner
// stops with "query would be affected by row-level security policy"; only the cluster's
// superuser (password in <dataDir>/secrets.json) reads every row. The dump carries the owner of
// every object, the grants to the app role (and the audit log's missing UPDATE/DELETE), the
// default privileges, the policies and FORCE flags, the drizzle migration journal and pg-boss's
// own schema and queues. It does not carry roles (they belong to the cluster): restore makes
// sure both roles exist first, as `npm start` would.
//
// pg_dump and pg_restore are clients talking TCP to 127.0.0.1 with a password, so they run as
// whoever runs the script (root or not) and the dump file belongs to that person; only the
// server itself goes through `runuser -u postgres` (startCluster in lib/pg.mjs).
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import pg from 'pg'
import { DB_NAME, OWNER_ROLE, secrets, urls } from './lib/env.mjs'
import { bootstrap, findBinDir, startCluster } from './lib/pg.mjs'

const log = msg => console.log(`[db] ${msg}`)
const ident = s => `"${s.replaceAll('"', '""')}"`

/** Where dumps go by default: <dataDir>/backups (.data/backups for npm start's database). */
export const backupsDir = p => join(p.dataDir, 'backups')

const stamp = () => new Date().toISOString().replace(/[:.]/g, '-')

/** A database name we are willing to write: plain lower-case, and never one of the cluster's own. */
function checkDatabaseName(name) {
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(name)) throw new Error(`not a database name we use: ${name} (lower-case letters, digits and _ only)`)
  if (['postgres', 'template0', 'template1'].includes(name)) throw new Error(`${name} is the cluster's own database: choose another`)
  return name
}

/** The superuser's connection details; the password goes in the environment, never on a command line. */
function superuser(p) {
  const env = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith('PG')))
  return {
    args: ['-h', '127.0.0.1', '-p', String(p.pgPort), '-U', 'postgres', '--no-password'],
    env: { ...env, PGPASSWORD: secrets(p).superuserPassword, PGCONNECT_TIMEOUT: '10' },
  }
}

function tool(name) {
  const bin = findBinDir()
  if (!bin || !existsSync(join(bin, name))) throw new Error(`${name} not found under /usr/lib/postgresql/<major>/bin: run npm start once (it installs PostgreSQL)`)
  return join(bin, name)
}

function runTool(name, args, env) {
  const res = spawnSync(tool(name), args, { encoding: 'utf8', env, maxBuffer: 64 * 1024 * 1024 })
  if (res.status !== 0) {
    throw new Error(`${name} failed (${res.status ?? res.signal}):\n${(res.stderr || res.stdout || '').trim()}`)
  }
  return res.stdout
}

async function withSuperuser(p, database, fn) {
  const url = new URL(urls(p).superuser)
  url.pathname = `/${database}`
  const client = new pg.Client({ connectionString: url.href })
  await client.connect()
  try {
    return await fn(client)
  }
  finally {
    await client.end()
  }
}

async function databaseExists(p, name) {
  return withSuperuser(p, 'postgres', async c => (await c.query('select 1 from pg_database where datname = $1', [name])).rowCount > 0)
}

/** Whether a database holds any table of ours (an empty one just made by bootstrap is not worth keeping). */
async function hasTables(p, name) {
  return withSuperuser(p, name, async c => (await c.query(`select 1 from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where c.relkind in ('r', 'p') and n.nspname not in ('pg_catalog', 'information_schema') and n.nspname not like 'pg\\_toast%' limit 1`)).rowCount > 0)
}

/**
 * Dump a database of profile `p` to a file and return its path. `out` is a file, or a folder to
 * put <database>-<time>.dump in (default <dataDir>/backups, so setwell-<time>.dump). `snapshot`
 * dumps as of a snapshot exported by another session (pg_export_snapshot()), so a caller can
 * compare the dump with what it saw itself.
 */
export async function backup(p, { out, database = DB_NAME, snapshot } = {}) {
  checkDatabaseName(database)
  await startCluster(p)
  if (!(await databaseExists(p, database))) throw new Error(`there is no database ${database} on 127.0.0.1:${p.pgPort} to back up`)
  let file = resolve(out ?? backupsDir(p))
  // a folder (no path, one that exists, or one written with a trailing /) gets <database>-<time>.dump
  if (!out || /[/\\]$/.test(out) || (existsSync(file) && statSync(file).isDirectory())) file = join(file, `${database}-${stamp()}.dump`)
  mkdirSync(dirname(file), { recursive: true, mode: 0o700 })
  // written beside its final name, then renamed: a dump that stopped half way never looks whole.
  // Made first with mode 600 (pg_dump keeps it): a dump holds password hashes and customers' details.
  const partial = `${file}.partial`
  writeFileSync(partial, '', { mode: 0o600 })
  const { args, env } = superuser(p)
  try {
    runTool('pg_dump', [...args, '-d', database, '-Fc', '-f', partial, ...(snapshot ? [`--snapshot=${snapshot}`] : [])], env)
    renameSync(partial, file)
  }
  finally {
    rmSync(partial, { force: true })
  }
  log(`backed up ${database} (127.0.0.1:${p.pgPort}) to`)
  console.log(file)
  return file
}

/** The newest dump in the profile's backups folder (by modification time). */
export function newestBackup(p) {
  const dir = backupsDir(p)
  const files = existsSync(dir)
    ? readdirSync(dir).filter(f => f.endsWith('.dump')).map(f => join(dir, f)).sort((a, b) => statSync(b).mtimeMs - statSync(a).mtimeMs)
    : []
  if (!files.length) throw new Error(`no dumps in ${dir}: give the path of one, or run npm run db:backup first`)
  return files[0]
}

/**
 * Restore a dump into `database` (default the profile's own). The dump goes into a new database
 * first, in one transaction; only when that has worked is the old database dropped (its
 * connections closed, after a copy of it is kept under backups/before-restore/) and the new one
 * renamed into its place. Returns the name restored into.
 */
export async function restore(p, { file, database = DB_NAME } = {}) {
  checkDatabaseName(database)
  const dump = resolve(file ?? newestBackup(p))
  if (!existsSync(dump)) throw new Error(`no such dump: ${dump}`)
  await startCluster(p)
  // the roles belong to the cluster, not the dump: make sure both exist, with this profile's passwords
  await bootstrap(p)
  const { args, env } = superuser(p)
  const list = runTool('pg_restore', ['-l', dump], env) // also checks the file is a custom-format dump

  const scratch = `${database.slice(0, 50)}_restoring`
  await withSuperuser(p, 'postgres', async (c) => {
    await c.query(`drop database if exists ${ident(scratch)} with (force)`)
    await c.query(`create database ${ident(scratch)} owner ${ident(OWNER_ROLE)} template template0 encoding 'UTF8'`)
  })
  try {
    // Extensions are not owned in a dump: whoever restores creates them. Create the trusted ones
    // (pg_trgm) as the owner role first, as the migration did, so a later migration can still
    // alter them; the dump's CREATE EXTENSION IF NOT EXISTS then leaves them be.
    const extensions = [...list.matchAll(/^\d+; \d+ \d+ EXTENSION - (\S+)/gm)].map(m => m[1]).filter(e => e !== 'plpgsql')
    if (extensions.length) {
      const ownerUrl = new URL(urls(p).owner)
      ownerUrl.pathname = `/${scratch}`
      const owner = new pg.Client({ connectionString: ownerUrl.href })
      await owner.connect()
      try {
        for (const ext of extensions) {
          await owner.query(`create extension if not exists ${ident(ext)} schema public`).catch(() => { /* untrusted: pg_restore makes it as the superuser */ })
        }
      }
      finally { await owner.end() }
    }
    runTool('pg_restore', [...args, '-d', scratch, '--single-transaction', '--exit-on-error', dump], env)
  }
  catch (err) {
    await withSuperuser(p, 'postgres', c => c.query(`drop database if exists ${ident(scratch)} with (force)`)).catch(() => {})
    throw err
  }

  if (await databaseExists(p, database) && await hasTables(p, database)) {
    const kept = await backup(p, { out: join(backupsDir(p), 'before-restore/'), database })
    log(`kept a copy of the database it replaces in ${kept}`)
  }
  await withSuperuser(p, 'postgres', async (c) => {
    // WITH (FORCE) closes the running app's connections; its pool opens new ones to the restored database
    await c.query(`drop database if exists ${ident(database)} with (force)`)
    await c.query(`alter database ${ident(scratch)} rename to ${ident(database)}`)
  })
  log(`restored ${dump} into ${database} (127.0.0.1:${p.pgPort})`)
  return database
}

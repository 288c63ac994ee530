// PostgreSQL lifecycle for development and tests: find or install Debian's server, create a
// cluster of our own under .data/, start it on 127.0.0.1 on our own port, create the roles
// and the database, and apply the drizzle-kit migrations.
import { execFileSync, spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import pg from 'pg'
import { APP_ROLE, DB_NAME, OWNER_ROLE, root, secrets, urls } from './env.mjs'

const isRoot = process.getuid?.() === 0

function log(msg) {
  console.log(`[db] ${msg}`)
}

/** The directory holding initdb, pg_ctl and postgres: the newest major under /usr/lib/postgresql. */
export function findBinDir() {
  const base = '/usr/lib/postgresql'
  if (!existsSync(base)) return null
  const majors = readdirSync(base).filter(d => /^\d+$/.test(d)).sort((a, b) => Number(b) - Number(a))
  for (const m of majors) {
    const dir = join(base, m, 'bin')
    if (existsSync(join(dir, 'initdb')) && existsSync(join(dir, 'pg_ctl'))) return dir
  }
  return null
}

/** Make sure a PostgreSQL server is installed; as root, install Debian's package when missing. */
export function ensureServerInstalled() {
  let bin = findBinDir()
  if (bin) return bin
  if (!isRoot) {
    console.error('[db] PostgreSQL is not installed. Install the Debian package first:\n\n    sudo apt-get install -y postgresql\n')
    process.exit(1)
  }
  log('PostgreSQL is missing: installing the Debian package postgresql (apt-get)...')
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env })
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env })
  bin = findBinDir()
  if (!bin) {
    console.error('[db] apt-get finished but no PostgreSQL binaries were found under /usr/lib/postgresql.')
    process.exit(1)
  }
  return bin
}

function canPostgresEnter(dir) {
  if (!isRoot) return true
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status === 0
}

/**
 * Where the cluster lives. Normally <dataDir>/pg. When running as root, the server runs as the
 * postgres user, who cannot enter a checkout under a mode-700 parent (a checkout in root's home,
 * or a mktemp -d folder): then fall back to a folder under the system temp dir keyed by the path.
 */
export function clusterDir(p) {
  mkdirSync(p.dataDir, { recursive: true })
  if (canPostgresEnter(p.dataDir)) return join(p.dataDir, 'pg')
  const key = createHash('sha256').update(p.dataDir).digest('hex').slice(0, 12)
  const dir = join(tmpdir(), `setwell-pg-${p.name}-${key}`)
  return dir
}

function runPg(bin, tool, args, opts = {}) {
  const cmd = join(bin, tool)
  const res = isRoot
    ? spawnSync('runuser', ['-u', 'postgres', '--', cmd, ...args], { encoding: 'utf8', cwd: '/', ...opts })
    : spawnSync(cmd, args, { encoding: 'utf8', ...opts })
  return res
}

function chownToPostgres(path) {
  if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', path])
}

export function isReady(bin, p) {
  return runPg(bin, 'pg_isready', ['-h', '127.0.0.1', '-p', String(p.pgPort), '-q']).status === 0
}

function initCluster(bin, p, dir) {
  const s = secrets(p)
  mkdirSync(dir, { recursive: true })
  chmodSync(dir, 0o700)
  const pwFile = join(tmpdir(), `setwell-pw-${process.pid}`)
  writeFileSync(pwFile, s.superuserPassword, { mode: 0o600 })
  chownToPostgres(dir)
  chownToPostgres(pwFile)
  log(`creating a cluster in ${dir}`)
  const res = runPg(bin, 'initdb', ['-D', dir, '-U', 'postgres', '--auth=scram-sha-256', `--pwfile=${pwFile}`, '-E', 'UTF8', '--locale=C.UTF-8'])
  rmSync(pwFile, { force: true })
  if (res.status !== 0) {
    console.error(res.stdout, res.stderr)
    throw new Error('initdb failed')
  }
  const conf = [
    '',
    '# Setwell: loopback only, our own port, no Unix socket',
    `listen_addresses = '127.0.0.1'`,
    `port = ${p.pgPort}`,
    `unix_socket_directories = ''`,
    `max_connections = 100`,
    ...(p.fast ? ['# test cluster only: speed over durability', 'fsync = off', 'synchronous_commit = off', 'full_page_writes = off'] : []),
    '',
  ].join('\n')
  writeFileSync(join(dir, 'postgresql.conf'), readFileSync(join(dir, 'postgresql.conf'), 'utf8') + conf)
  chownToPostgres(dir)
}

/** Start the cluster (creating it first when missing); resolves when it accepts connections. */
export async function startCluster(p) {
  const bin = ensureServerInstalled()
  const dir = clusterDir(p)
  if (!existsSync(join(dir, 'PG_VERSION'))) initCluster(bin, p, dir)
  if (isReady(bin, p)) {
    log(`PostgreSQL already running on 127.0.0.1:${p.pgPort}`)
    return { bin, dir }
  }
  // After a kill -9 a postmaster.pid can be left behind (pg_ctl status then lies): trust pg_isready.
  const pidFile = join(dir, 'postmaster.pid')
  if (existsSync(pidFile)) {
    const pid = Number(readFileSync(pidFile, 'utf8').split('\n')[0])
    let alive = false
    try {
      process.kill(pid, 0)
      alive = !readFileSync(`/proc/${pid}/stat`, 'utf8').split(' ')[2].startsWith('Z')
    }
    catch { alive = false }
    if (!alive) {
      log('removing a stale postmaster.pid')
      rmSync(pidFile, { force: true })
    }
  }
  const logFile = join(dir, 'server.log')
  const res = runPg(bin, 'pg_ctl', ['-D', dir, '-l', logFile, '-w', '-t', '30', 'start'], { stdio: 'pipe' })
  if (res.status !== 0 && !isReady(bin, p)) {
    console.error(res.stdout, res.stderr)
    if (existsSync(logFile)) console.error(readFileSync(logFile, 'utf8').split('\n').slice(-20).join('\n'))
    throw new Error('PostgreSQL did not start')
  }
  for (let i = 0; i < 60 && !isReady(bin, p); i++) await sleep(250)
  log(`PostgreSQL running on 127.0.0.1:${p.pgPort} (data in ${dir})`)
  return { bin, dir }
}

export function stopCluster(p) {
  const bin = findBinDir()
  if (!bin) return
  const dir = clusterDir(p)
  if (!existsSync(join(dir, 'PG_VERSION'))) return
  if (!isReady(bin, p)) {
    log('PostgreSQL is not running')
    return
  }
  runPg(bin, 'pg_ctl', ['-D', dir, '-m', 'fast', '-w', 'stop'], { stdio: 'inherit' })
  log('PostgreSQL stopped')
}

export function removeCluster(p) {
  stopCluster(p)
  const dir = clusterDir(p)
  rmSync(dir, { recursive: true, force: true })
}

async function withClient(url, fn) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    return await fn(client)
  }
  finally {
    await client.end()
  }
}

const ident = s => `"${s.replaceAll('"', '""')}"`
const literal = s => `'${s.replaceAll('\'', '\'\'')}'`

/**
 * Roles and database. The owner role owns the schema and runs migrations; the app role the
 * server connects as owns nothing, so row-level security (forced on every firm table) applies.
 */
export async function bootstrap(p) {
  const s = secrets(p)
  const u = urls(p)
  await withClient(u.superuser, async (c) => {
    for (const [role, pw] of [[OWNER_ROLE, s.ownerPassword], [APP_ROLE, s.appPassword]]) {
      const { rowCount } = await c.query('select 1 from pg_roles where rolname = $1', [role])
      const verb = rowCount ? 'alter' : 'create'
      await c.query(`${verb} role ${ident(role)} login password ${literal(pw)} nosuperuser nobypassrls`)
    }
    const { rowCount } = await c.query('select 1 from pg_database where datname = $1', [DB_NAME])
    if (!rowCount) await c.query(`create database ${ident(DB_NAME)} owner ${ident(OWNER_ROLE)}`)
  })
  await withClient(u.superuser.replace(/\/postgres$/, `/${DB_NAME}`), async (c) => {
    await c.query(`revoke all on schema public from public`)
    await c.query(`alter schema public owner to ${ident(OWNER_ROLE)}`)
    await c.query(`grant usage on schema public to ${ident(APP_ROLE)}`)
    await c.query(`alter default privileges for role ${ident(OWNER_ROLE)} in schema public grant select, insert, update, delete on tables to ${ident(APP_ROLE)}`)
    await c.query(`alter default privileges for role ${ident(OWNER_ROLE)} in schema public grant usage, select on sequences to ${ident(APP_ROLE)}`)
    await c.query(`alter default privileges for role ${ident(OWNER_ROLE)} in schema public grant execute on functions to ${ident(APP_ROLE)}`)
  })
}

/** Apply the committed drizzle-kit migrations as the owner role. */
export async function migrate(p) {
  const { drizzle } = await import('drizzle-orm/node-postgres')
  const { migrate: run } = await import('drizzle-orm/node-postgres/migrator')
  const pool = new pg.Pool({ connectionString: urls(p).owner, max: 1 })
  try {
    await run(drizzle(pool), { migrationsFolder: join(root, 'drizzle') })
    log('migrations applied')
  }
  finally { await pool.end() }
  await installJobQueue(p)
}

/** The background jobs' queue names (server/plugins/jobs.ts works them). */
export const JOB_QUEUES = ['reminders-sweep', 'reminder-send']

/**
 * pg-boss's own schema, installed and upgraded here as the owner role, with its queues, so the
 * running app (which owns nothing) only reads and writes jobs: it starts pg-boss with migrate off.
 */
async function installJobQueue(p) {
  const { default: PgBoss } = await import('pg-boss')
  const boss = new PgBoss({ connectionString: urls(p).owner, schema: 'pgboss', supervise: false, schedule: false, max: 2 })
  boss.on('error', err => console.error('[jobs]', err.message))
  await boss.start()
  for (const name of JOB_QUEUES) {
    if (!(await boss.getQueue(name))) await boss.createQueue(name, { retryLimit: 3, retryDelay: 30, retryBackoff: true })
  }
  await boss.stop({ graceful: false, wait: true })
  await withClient(urls(p).owner, async (c) => {
    await c.query(`grant usage on schema pgboss to ${ident(APP_ROLE)}`)
    await c.query(`grant select, insert, update, delete on all tables in schema pgboss to ${ident(APP_ROLE)}`)
    await c.query(`grant usage, select on all sequences in schema pgboss to ${ident(APP_ROLE)}`)
    await c.query(`grant execute on all functions in schema pgboss to ${ident(APP_ROLE)}`)
  })
  log('job queue ready')
}

/** Drop and recreate the database (the test profile starts from nothing on every run). */
export async function recreateDatabase(p) {
  await withClient(urls(p).superuser, async (c) => {
    await c.query(`drop database if exists ${ident(DB_NAME)} with (force)`)
  })
  await bootstrap(p)
}

export async function hasData(p) {
  return withClient(urls(p).owner, async (c) => {
    const { rows } = await c.query(`select to_regclass('public.firms') is not null as ok`)
    if (!rows[0].ok) return false
    const r = await c.query('select exists (select 1 from seed_runs) as seeded').catch(() => ({ rows: [{ seeded: false }] }))
    return r.rows[0].seeded
  })
}

// The one entry point to PostgreSQL: owns the pool, and the firm-scoped transaction helper that
// every firm query goes through.
import { and, eq, sql, type SQL } from 'drizzle-orm'
import { drizzle, NodePgSession, NodePgTransaction, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import pg from 'pg'
import * as schema from '../db/schema'
import { notFound } from './validate'

export type Db = NodePgDatabase<typeof schema>
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]

let pool: pg.Pool | undefined
let db: Db | undefined

export function useDb(): Db {
  if (!db) {
    const config = useRuntimeConfig()
    if (!config.databaseUrl) throw new Error('NUXT_DATABASE_URL is not set (npm start sets it; see .env.example)')
    // a request waits at most 5 s for a connection: with the database down it answers 503, never hangs
    pool = new pg.Pool({ connectionString: config.databaseUrl, max: Number(config.databasePoolMax) || 10, connectionTimeoutMillis: 5000 })
    // An idle client that errors (server restart) must not crash the process.
    pool.on('error', err => console.error('[db] idle client error', err.message))
    db = drizzle({ client: pool, schema, casing: 'snake_case' })
  }
  return db
}

export async function closeDb() {
  await pool?.end()
  pool = undefined
  db = undefined
}

/** A table that carries the tenant column. */
type FirmTable = PgTable & { firmId: PgColumn }

/**
 * The tenant scope of one transaction. Row-level security already limits every firm table to
 * this firm (app.firm_id is set for the transaction); these helpers put the same condition in the
 * SQL itself, so a query is right even before the database checks it.
 */
export class FirmScope {
  /** The firm's letters for references, once read (server/utils/firm-letters.ts). */
  letters?: Promise<string>
  constructor(readonly tx: Tx, readonly firmId: string, readonly userId: string | null) {}

  /** `firm_id = <this firm>` and the other conditions, for a WHERE clause. */
  where(table: FirmTable, ...conditions: (SQL | undefined)[]): SQL {
    return and(eq(table.firmId, this.firmId), ...conditions) as SQL
  }

  /** Insert values with firm_id filled in (a caller cannot name another firm). */
  values<T extends object>(values: T): T & { firmId: string } {
    return { ...values, firmId: this.firmId }
  }

  /** Append to the firm's audit log. */
  async audit(action: string, entity: string, entityId: string | null, detail: Record<string, unknown> = {}) {
    await this.tx.insert(schema.auditLog).values(this.values({ actorUserId: this.userId, action, entity, entityId, detail }))
  }
}

/** A firm table with a uuid `id`. */
type FirmRowTable = FirmTable & { id: PgColumn, $inferSelect: object }

/**
 * The row with this id in the current firm, or 404 (another firm's id is the same 404 as a
 * missing one). `lock` takes it FOR UPDATE; `where` adds conditions (crew only on their own jobs).
 */
export async function findOr404<T extends FirmRowTable>(f: FirmScope, table: T, id: string, opts: { lock?: boolean, where?: SQL } = {}): Promise<T['$inferSelect']> {
  const q = f.tx.select().from(table as PgTable).where(f.where(table, eq(table.id, id), opts.where))
  const [row] = opts.lock ? await q.for('update') : await q
  if (!row) notFound()
  return row as T['$inferSelect']
}

async function setScope(tx: Tx, firmId: string | null, userId: string | null) {
  await tx.execute(sql`select set_config('app.firm_id', ${firmId ?? ''}, true), set_config('app.user_id', ${userId ?? ''}, true)`)
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
/** An id that may be written into SQL text: a uuid and nothing else. */
export const isUuid = (s: unknown): s is string => typeof s === 'string' && UUID.test(s)

/**
 * The statement that sets a transaction's scope, as text for a simple query, so BEGIN and the
 * scope go to PostgreSQL in one round trip (a simple query may hold several statements; one with
 * parameters may not). Only uuids are ever written into it; null when an id is not one.
 */
export function scopeText(firmId: string | null, userId: string | null): string | null {
  if ((firmId !== null && !isUuid(firmId)) || (userId !== null && !isUuid(userId))) return null
  return `select set_config('app.firm_id', '${firmId ?? ''}', true), set_config('app.user_id', '${userId ?? ''}', true)`
}

/** A Drizzle transaction on a connection we opened the transaction on ourselves (same class Drizzle's own transactions are). */
function txOn(client: pg.PoolClient): Tx {
  const base = useDb() as unknown as { dialect: never, session: { schema: never, options: never } }
  const session = new NodePgSession(client, base.dialect, base.session.schema, base.session.options)
  return new NodePgTransaction(base.dialect, session, base.session.schema) as unknown as Tx
}

/** Commit (or roll back) and give the connection back; a connection that fails to end its transaction is dropped, not reused. */
async function finish(client: pg.PoolClient, how: 'commit' | 'rollback') {
  try {
    await client.query(how)
  }
  catch (err) {
    client.release(err as Error)
    throw err
  }
  client.release()
}

/**
 * One transaction on a connection of its own: BEGIN and the scope in one round trip, `fn`, then
 * COMMIT (ROLLBACK when it throws). What Drizzle's `transaction` does, less one round trip.
 */
async function transactionWithScope<T>(firmId: string | null, userId: string | null, fn: (tx: Tx) => Promise<T>): Promise<T> {
  const text = scopeText(firmId, userId)
  if (!text) {
    return useDb().transaction(async (tx) => {
      await setScope(tx, firmId, userId)
      return fn(tx)
    })
  }
  useDb()
  const client = await pool!.connect()
  try {
    await client.query(`begin; ${text}`)
  }
  catch (err) {
    client.release(err as Error)
    throw err
  }
  return runOn(client, fn)
}

async function runOn<T>(client: pg.PoolClient, fn: (tx: Tx) => Promise<T>): Promise<T> {
  let result: T
  try {
    result = await fn(txOn(client))
  }
  catch (err) {
    await finish(client, 'rollback').catch(() => {})
    throw err
  }
  await finish(client, 'commit')
  return result
}

/**
 * A transaction a request's session check opened (server/utils/auth.ts), scoped to the session's
 * firm and person, that the request's first `withFirm` for that same scope carries on: the
 * session check and the firm's work are then one transaction, with one BEGIN and one COMMIT. It
 * is only kept while the request goes straight on to its work: at the next turn of the event loop
 * (anything that waits for input or output on the way), or when the request ends, it is committed
 * and its connection given back, and a later `withFirm` opens a transaction of its own, as before.
 */
export class RequestTx {
  private state: 'open' | 'taken' | 'closed' = 'open'
  constructor(private readonly client: pg.PoolClient, readonly firmId: string, readonly userId: string) {
    setImmediate(() => void this.close())
  }

  get open() {
    return this.state === 'open'
  }

  /** Run `fn` in this transaction, then commit; only the first caller gets it (null after). */
  take<T>(fn: (tx: Tx) => Promise<T>): Promise<T> | null {
    if (this.state !== 'open') return null
    this.state = 'taken'
    return runOn(this.client, fn)
  }

  /** End it unused: commit (the session check may have written) and give the connection back. */
  async close(how: 'commit' | 'rollback' = 'commit') {
    if (this.state !== 'open') return
    this.state = 'closed'
    await finish(this.client, how).catch(err => console.error('[db] ending a request transaction', (err as Error).message))
  }
}

/**
 * Open a transaction whose first statements are `text` (a simple query: BEGIN, then statements
 * with no parameters): the connection and each statement's rows. The caller ends it.
 */
export async function beginWith(text: string): Promise<{ client: pg.PoolClient, results: pg.QueryResult[] }> {
  useDb()
  const client = await pool!.connect()
  try {
    const res = await client.query(`begin; ${text}`) as unknown as pg.QueryResult[]
    return { client, results: res }
  }
  catch (err) {
    await client.query('rollback').then(() => client.release(), e => client.release(e as Error))
    throw err
  }
}

/** Statements with no parameters, in one round trip and one transaction of their own (a simple query). */
export async function simpleQuery(text: string): Promise<pg.QueryResult[]> {
  useDb()
  const res = await pool!.query(text) as unknown as pg.QueryResult | pg.QueryResult[]
  return Array.isArray(res) ? res : [res]
}

/** Transactions that a request's session check opened, by the context it returned (see RequestTx). */
const requestTxs = new WeakMap<object, RequestTx>()
export function holdRequestTx(scope: object, held: RequestTx) {
  requestTxs.set(scope, held)
}

/** Run `fn` in one transaction scoped to a firm (and the acting person). */
export async function withFirm<T>(scope: { firmId: string, userId: string | null, firmLetters?: string }, fn: (f: FirmScope) => Promise<T>): Promise<T> {
  const scoped = (tx: Tx) => {
    const f = new FirmScope(tx, scope.firmId, scope.userId)
    if (scope.firmLetters) f.letters = Promise.resolve(scope.firmLetters)
    return fn(f)
  }
  const held = requestTxs.get(scope)
  if (held && held.firmId === scope.firmId && held.userId === scope.userId) {
    const run = held.take(scoped)
    if (run) return run
  }
  return transactionWithScope(scope.firmId, scope.userId, scoped)
}

/** Run `fn` in one transaction as a person with no firm chosen: they see their own memberships and firms only. */
export async function withUser<T>(userId: string, fn: (tx: Tx) => Promise<T>): Promise<T> {
  return transactionWithScope(null, userId, fn)
}

/** Set the scope inside a transaction that has already started (sign-up, accepting an invitation). */
export function scopeTransaction(tx: Tx, firmId: string | null, userId: string | null) {
  return setScope(tx, firmId, userId)
}

/** PostgreSQL's unique_violation, for answering 409 instead of 500. */
export function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string, cause?: { code?: string } }
  return e?.code === '23505' || e?.cause?.code === '23505'
}

/**
 * A foreign key refused the write (23503): a row still names the one being removed, or the row a
 * new one names was removed meanwhile. Looks through the wrappers (Drizzle's, h3's) to the driver's error.
 */
export function isForeignKeyViolation(err: unknown): boolean {
  for (let e = err as { code?: string, cause?: unknown } | undefined, depth = 0; e && depth < 6; e = e.cause as typeof e, depth++) {
    if (e.code === '23503') return true
  }
  return false
}

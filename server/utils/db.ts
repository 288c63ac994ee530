// The one entry point to PostgreSQL: owns the pool, and the firm-scoped transaction helper that
// every firm query goes through.
import { and, eq, sql, type SQL } from 'drizzle-orm'
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
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

/** Run `fn` in one transaction scoped to a firm (and the acting person). */
export async function withFirm<T>(scope: { firmId: string, userId: string | null }, fn: (f: FirmScope) => Promise<T>): Promise<T> {
  return useDb().transaction(async (tx) => {
    await setScope(tx, scope.firmId, scope.userId)
    return fn(new FirmScope(tx, scope.firmId, scope.userId))
  })
}

/** Run `fn` in one transaction as a person with no firm chosen: they see their own memberships and firms only. */
export async function withUser<T>(userId: string, fn: (tx: Tx) => Promise<T>): Promise<T> {
  return useDb().transaction(async (tx) => {
    await setScope(tx, null, userId)
    return fn(tx)
  })
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

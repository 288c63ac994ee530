import { sql } from 'drizzle-orm'
import { timestamp, uuid } from 'drizzle-orm/pg-core'

/** created_at / updated_at, spread into every table. */
export const timestamps = {
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow().$onUpdate(() => new Date()),
}

/** The tenant column every firm-owned table starts with: part of the primary key and of every foreign key. */
export const firmColumn = () => uuid().notNull()

/**
 * Row-level security condition for firm tables: rows of the firm named by the transaction-local
 * setting app.firm_id (set by server/utils/db.ts withFirm). With no firm set, no rows.
 * app_firm_id() and app_user_id() are defined in drizzle/0000_app_settings.sql.
 */
export const sameFirm = sql`firm_id = app_firm_id()`

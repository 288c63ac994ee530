import { sql } from 'drizzle-orm'
import { bigserial, index, inet, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'

/**
 * A person. Not firm-owned: one person can belong to several firms (an accountant serves many),
 * through memberships. E-mail is stored lower-cased and unique.
 */
export const users = pgTable('users', {
  id: uuid().primaryKey().defaultRandom(),
  email: text().notNull(),
  name: text().notNull(),
  passwordHash: text().notNull(),
  passwordChangedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  ...timestamps,
}, t => [uniqueIndex('users_email_unique').on(sql`lower(${t.email})`)])

/**
 * One row per sign-in. The sealed cookie holds only this id; every request checks the row, so
 * signing out, changing the password or losing the membership ends the session at once.
 */
export const sessions = pgTable('sessions', {
  id: uuid().primaryKey().defaultRandom(),
  userId: uuid().notNull().references(() => users.id, { onDelete: 'cascade' }),
  /** The firm the person is working in now (switchable among their memberships). */
  firmId: uuid(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  lastSeenAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  revokedAt: timestamp({ withTimezone: true }),
  ip: inet(),
  userAgent: text().notNull().default(''),
}, t => [index('sessions_user_idx').on(t.userId)])

/** Failed sign-ins, for the limit of 5 per account and address in 15 minutes. */
export const signInFailures = pgTable('sign_in_failures', {
  id: bigserial({ mode: 'number' }).primaryKey(),
  email: text().notNull(),
  ip: inet().notNull(),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [index('sign_in_failures_lookup_idx').on(t.email, t.ip, t.at)])

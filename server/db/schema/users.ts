import { sql } from 'drizzle-orm'
import { bigserial, index, inet, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
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
 * One row per sign-in. The sealed cookie holds this id and the person's; every request checks the
 * row, so signing out, changing the password or losing the membership ends the session at once.
 * Keyed by the person (user_id, id), not by a firm: a person works in several firms and switches
 * between them in one session, so sessions are spread across servers by user_id (README "Scaling out").
 */
export const sessions = pgTable('sessions', {
  userId: uuid().notNull().references(() => users.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  /** The firm the person is working in now (switchable among their memberships). Not a tenant key: no firm owns a session. */
  currentFirmId: uuid(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  lastSeenAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  revokedAt: timestamp({ withTimezone: true }),
  ip: inet(),
  userAgent: text().notNull().default(''),
}, t => [primaryKey({ columns: [t.userId, t.id] })])

/**
 * One row per attempt counted against a limit (sign-in, the public enquiry form), by key
 * (`sign-in:<email>:<address>`, `sign-in-address:<address>`, `enquiry-form:<address>`). Rows are
 * only ever written by take_limits() (drizzle/0021_limits_function.sql), which counts and inserts
 * under an advisory lock on each key, so no two requests can both see room for one more.
 */
export const limitHits = pgTable('limit_hits', {
  id: bigserial({ mode: 'number' }).primaryKey(),
  key: text().notNull(),
  /** The request that took the slot, so a success can give back its own address slot. */
  attempt: uuid().notNull(),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [index('limit_hits_key_at_idx').on(t.key, t.at), index('limit_hits_at_idx').on(t.at), index('limit_hits_attempt_idx').on(t.attempt)])

/**
 * A sign-up waiting for its e-mail to be confirmed. The link's token is random and only its hash
 * is kept; the password only as its hash. Following the link (once, before it expires) makes the
 * firm, its owner and a session. Not firm-owned: there is no firm yet.
 */
export const pendingSignUps = pgTable('pending_sign_ups', {
  id: uuid().primaryKey().defaultRandom(),
  email: text().notNull(),
  name: text().notNull(),
  firmName: text().notNull(),
  passwordHash: text().notNull(),
  tokenHash: text().notNull(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  usedAt: timestamp({ withTimezone: true }),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [uniqueIndex('pending_sign_ups_token_unique').on(t.tokenHash), index('pending_sign_ups_expires_idx').on(t.expiresAt)])

import { sql } from 'drizzle-orm'
import { index, jsonb, pgEnum, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core'
import { ROLES } from '../../../shared/utils/roles'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { users } from './users'

export const memberRole = pgEnum('member_role', ROLES)

/** A person's place in a firm, with their role. */
export const memberships = pgTable('memberships', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  userId: uuid().notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: memberRole().notNull(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('memberships_firm_user_unique').on(t.firmId, t.userId),
  index('memberships_user_idx').on(t.userId),
  // Visible in the current firm, and to the person themselves in every firm they belong to.
  pgPolicy('memberships_visible', { for: 'select', using: sql`${sameFirm} or user_id = app_user_id()` }),
  pgPolicy('memberships_write', { for: 'all', using: sameFirm, withCheck: sameFirm }),
]).enableRLS()

/** An invitation to join a firm with a role: a single-use token (only its hash is stored) that expires. */
export const invitations = pgTable('invitations', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  email: text().notNull(),
  role: memberRole().notNull(),
  tokenHash: text().notNull(),
  invitedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  acceptedAt: timestamp({ withTimezone: true }),
  acceptedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  revokedAt: timestamp({ withTimezone: true }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  // unique within the firm; token_hash first, so a link from before links carried their firm is found by it alone
  unique('invitations_token_unique').on(t.tokenHash, t.firmId),
  // Someone holding the link, not signed in, sees only that invitation (app.invite_token_hash).
  pgPolicy('invitations_visible', { for: 'select', using: sql`${sameFirm} or token_hash = nullif(current_setting('app.invite_token_hash', true), '')` }),
  pgPolicy('invitations_write', { for: 'all', using: sameFirm, withCheck: sameFirm }),
]).enableRLS()

/** Who changed what, per firm. Append-only for the app's role (see drizzle/0002_force_rls.sql). */
export const auditLog = pgTable('audit_log', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  actorUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
  action: text().notNull(),
  entity: text().notNull(),
  entityId: text(),
  detail: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  index('audit_log_firm_at_idx').on(t.firmId, t.at),
  pgPolicy('audit_log_firm', { for: 'all', using: sameFirm, withCheck: sameFirm }),
]).enableRLS()

// Jobs: the work itself. A job comes from an accepted quote (or is made directly), carries the
// price it was won at, its booked days and who works them, the plan of plaster sets, and the
// log of each set as it was done with the materials mixed. Money is integer pence; bags and
// packs are thousandths (1.5 bags is 1500).
import { sql } from 'drizzle-orm'
import { boolean, foreignKey, index, integer, jsonb, pgEnum, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { customers, sites } from './ledger'
import { users } from './users'
import type { PlanAction } from '../../../shared/utils/plan-actions'
import { photos, visits } from './visits'
import { materials, quotes, quoteVersions } from './quotes'
import { JOB_STATUSES, LOG_COATS, DAY_PORTIONS } from '../../../shared/utils/jobs'

const firmPolicy = (name: string) => pgPolicy(`${name}_firm`, { for: 'all', using: sameFirm, withCheck: sameFirm })

export const jobStatus = pgEnum('job_status', JOB_STATUSES)
export const logCoat = pgEnum('log_coat', LOG_COATS)
export const dayPortion = pgEnum('day_portion', DAY_PORTIONS)

/** What the set planner works from, as the plasterer set it for the job. */
export interface JobPlanOptions { people: number, bagsPerPersonPerSet: number, coverageM2PerBag: number }

export const jobs = pgTable('jobs', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  number: integer().notNull(),
  title: text().notNull(),
  customerId: uuid().notNull(),
  siteId: uuid(),
  quoteId: uuid(),
  quoteVersionId: uuid(),
  /** The measured visit whose rooms and surfaces the job plasters. */
  visitId: uuid(),
  status: jobStatus().notNull().default('booked'),
  /**
   * Finished and waiting to be invoiced (status 'finished'), worked out by PostgreSQL: Today's list
   * of jobs to invoice asks for this column, which (unlike an enum's `=`, not leakproof) row-level
   * security lets reach an index (see invoices.owing).
   */
  finished: boolean().notNull().generatedAlwaysAs(sql`status = 'finished'`),
  /** The price as won (from the quote's totals): labour and materials apart. */
  labourNetPence: integer().notNull().default(0),
  materialsNetPence: integer().notNull().default(0),
  netPence: integer().notNull().default(0),
  grossPence: integer().notNull().default(0),
  estimatedDaysX100: integer().notNull().default(0),
  /** The materials estimate (shared/utils/materials.ts estimateMaterials), kept as it was when the job was made. */
  materialsEstimate: jsonb().$type<{ materialId: string | null, name: string, packs: number, costPence: number, derivation: string }[]>().notNull().default([]),
  planOptions: jsonb().$type<JobPlanOptions>().notNull().default({ people: 1, bagsPerPersonPerSet: 3, coverageM2PerBag: 10 }),
  /** Surfaces the plasterer moved by hand: surface id -> set number. Empty: the planner's own plan. */
  planMoves: jsonb().$type<Record<string, number>>().notNull().default({}),
  notes: text().notNull().default(''),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('jobs_firm_number_unique').on(t.firmId, t.number),
  // one job per accepted quote
  unique('jobs_quote_unique').on(t.firmId, t.quoteId),
  foreignKey({ name: 'jobs_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }),
  foreignKey({ name: 'jobs_site_fk', columns: [t.firmId, t.siteId], foreignColumns: [sites.firmId, sites.id] }),
  foreignKey({ name: 'jobs_quote_fk', columns: [t.firmId, t.quoteId], foreignColumns: [quotes.firmId, quotes.id] }),
  foreignKey({ name: 'jobs_quote_version_fk', columns: [t.firmId, t.quoteVersionId], foreignColumns: [quoteVersions.firmId, quoteVersions.id] }),
  foreignKey({ name: 'jobs_visit_fk', columns: [t.firmId, t.visitId], foreignColumns: [visits.firmId, visits.id] }),
  index('jobs_firm_status_idx').on(t.firmId, t.status),
  // Today's jobs to invoice: the oldest first and how many, from the index alone
  index('jobs_finished_idx').on(t.firmId, t.updatedAt, t.id).where(sql`${t.finished}`),
  firmPolicy('jobs'),
]).enableRLS()

/** Each change of a job's status: who, when, why. */
export const jobStatusChanges = pgTable('job_status_changes', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  jobId: uuid().notNull(),
  fromStatus: jobStatus(),
  toStatus: jobStatus().notNull(),
  reason: text().notNull().default(''),
  changedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  changedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'job_status_changes_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }).onDelete('cascade'),
  index('job_status_changes_job_idx').on(t.firmId, t.jobId),
  firmPolicy('job_status_changes'),
]).enableRLS()

/** A person booked on a job for a day (or half a day); `worked` once they have been. */
export const jobDays = pgTable('job_days', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  jobId: uuid().notNull(),
  /** ISO date, the firm's local day. */
  day: text().notNull(),
  userId: uuid().notNull().references(() => users.id, { onDelete: 'cascade' }),
  portion: dayPortion().notNull().default('day'),
  worked: boolean().notNull().default(false),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('job_days_person_unique').on(t.firmId, t.jobId, t.day, t.userId),
  foreignKey({ name: 'job_days_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }).onDelete('cascade'),
  index('job_days_firm_day_idx').on(t.firmId, t.day),
  index('job_days_user_idx').on(t.firmId, t.userId, t.day),
  firmPolicy('job_days'),
]).enableRLS()

/** A set as it was done, or a problem found. */
export const setLogs = pgTable('set_logs', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  jobId: uuid().notNull(),
  kind: text().$type<'set' | 'problem'>().notNull().default('set'),
  /** The planned set it carries out, when it does. */
  setNumber: integer(),
  startedAt: timestamp({ withTimezone: true }),
  endedAt: timestamp({ withTimezone: true }),
  coat: logCoat(),
  surfaceIds: jsonb().$type<string[]>().notNull().default([]),
  /** Who laid it on. */
  userIds: jsonb().$type<string[]>().notNull().default([]),
  coldOrDamp: boolean().notNull().default(false),
  notes: text().notNull().default(''),
  loggedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  /** The plan's tasks this entry carries out (surface and action), ticked on the phone. */
  tasks: jsonb().$type<{ surfaceId: string, action: PlanAction }[]>().notNull().default([]),
  /** Made on the phone when the entry was started: a resend of the same entry (after a lost answer or from the offline queue) is stored once. */
  clientId: uuid(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('set_logs_client_unique').on(t.firmId, t.clientId),
  foreignKey({ name: 'set_logs_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }).onDelete('cascade'),
  index('set_logs_job_idx').on(t.firmId, t.jobId),
  firmPolicy('set_logs'),
]).enableRLS()

/** Photos taken with a logged set (a photo belongs to one log). */
export const setLogPhotos = pgTable('set_log_photos', {
  firmId: firmColumn(),
  photoId: uuid().notNull(),
  setLogId: uuid().notNull(),
}, t => [
  primaryKey({ columns: [t.firmId, t.photoId] }),
  foreignKey({ name: 'set_log_photos_photo_fk', columns: [t.firmId, t.photoId], foreignColumns: [photos.firmId, photos.id] }).onDelete('cascade'),
  foreignKey({ name: 'set_log_photos_log_fk', columns: [t.firmId, t.setLogId], foreignColumns: [setLogs.firmId, setLogs.id] }).onDelete('cascade'),
  index('set_log_photos_log_idx').on(t.firmId, t.setLogId),
  firmPolicy('set_log_photos'),
]).enableRLS()

/** Bags or packs of one material mixed for a logged set. */
export const materialUses = pgTable('material_uses', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  jobId: uuid().notNull(),
  logId: uuid().notNull(),
  materialId: uuid().notNull(),
  /** Thousandths of a pack (half a bag is 500). */
  packsX1000: integer().notNull(),
  /** The pack's cost when logged, so later price changes do not rewrite the job. */
  costPencePerPack: integer().notNull(),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'material_uses_log_fk', columns: [t.firmId, t.logId], foreignColumns: [setLogs.firmId, setLogs.id] }).onDelete('cascade'),
  foreignKey({ name: 'material_uses_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }).onDelete('cascade'),
  foreignKey({ name: 'material_uses_material_fk', columns: [t.firmId, t.materialId], foreignColumns: [materials.firmId, materials.id] }),
  index('material_uses_job_idx').on(t.firmId, t.jobId),
  firmPolicy('material_uses'),
]).enableRLS()

/**
 * A person's calendar feed: a secret URL (only its hash kept) that a calendar app polls. Whoever
 * holds the URL sees that one feed row (app.calendar_token_hash), then only that person's days.
 */
export const calendarFeeds = pgTable('calendar_feeds', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  userId: uuid().notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text().notNull(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.userId] }),
  // unique within the firm; token_hash first, so a link from before links carried their firm is found by it alone
  unique('calendar_feeds_token_unique').on(t.tokenHash, t.firmId),
  pgPolicy('calendar_feeds_by_token', { for: 'select', using: sql`token_hash = nullif(current_setting('app.calendar_token_hash', true), '')` }),
  firmPolicy('calendar_feeds'),
]).enableRLS()

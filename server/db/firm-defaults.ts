// What every firm starts with: a price book, the generic materials catalogue, the reminder
// schedule and the Bank Rate table. Written when the firm is made (sign-up, the demo seed) and
// back-filled for firms made before (the seed script runs it for every firm on each start and
// test run), never on a read: a GET writes nothing, so the accountant opening a screen leaves no
// trace. Plain imports only (no Nitro auto-imports), so the seed script uses the same code.
import { and, eq, inArray, sql } from 'drizzle-orm'
import type { NodePgDatabase } from 'drizzle-orm/node-postgres'
import * as schema from './schema'
import { DEFAULT_MATERIALS, STARTING_PRICE, defaultMaterialRow } from '../../shared/utils/materials'
import { DEFAULT_REMINDERS } from '../../shared/utils/reminders'
import { DEFAULT_BANK_RATES } from '../../shared/utils/late-payment'
import { creditNotePrefixOf, firmLetters, invoicePrefixOf } from '../../shared/utils/references'

type Tx = Parameters<Parameters<NodePgDatabase<typeof schema>['transaction']>[0]>[0]

/**
 * A new firm's letters and prefixes, from its trading name: "Brackenridge Plastering" gives BP,
 * invoices BP-1, BP-2..., credit notes BP-C1... (shared/utils/references.ts). The owner can change the
 * prefixes in the firm's settings.
 */
export function referenceDefaults(tradingName: string) {
  const referenceLetters = firmLetters(tradingName)
  return { referenceLetters, invoicePrefix: invoicePrefixOf(referenceLetters, ''), creditNotePrefix: creditNotePrefixOf(referenceLetters, '') }
}

/** The starting catalogue's notes as they were written before issue 17, and the words now (words-test: old words, mended). */
const OLD_MATERIAL_WORDS: [string, string][] = [
  ['Demo price (invented): enter your supplier\'s price.', STARTING_PRICE], // words-test: old words, mended
  ['From memory (unverified): a roll of scrim tape is about 90 m.', 'A roll of scrim tape is usually about 90 m: check the rolls you buy.'], // words-test: old words, mended
]

/**
 * Add what the firm is missing of its defaults; never changes what it has. Call inside a
 * transaction with `app.firm_id` set to the firm (row-level security is forced).
 * - the firm's letters (its references start with them), from its trading name when blank (a firm
 *   made without them: its prefixes, blank, then follow the letters);
 * - the price book: one row, zero rates (the firm sets its own);
 * - the materials: the generic catalogue, when the firm has none; the starting catalogue's notes
 *   in the words they had before issue 17 ("Demo price (invented)"...) mended to the words now (a
 *   note the firm wrote itself is left as it is);
 * - the reminders: the default schedule, when the firm has none and has never saved its own (an
 *   empty schedule saved on purpose stays empty);
 * - the Bank Rate: each default rate dated before the firm's earliest, so a table seeded when the
 *   defaults began in 2024 gains the history back to 2009, and the firm's own later rows stand.
 */
export async function addFirmDefaults(tx: Tx, firmId: string, actorUserId: string | null = null) {
  const [firm] = await tx.select({ letters: schema.firms.referenceLetters, name: schema.firms.tradingName }).from(schema.firms).where(eq(schema.firms.id, firmId))
  if (firm && !firm.letters) await tx.update(schema.firms).set({ referenceLetters: firmLetters(firm.name) }).where(eq(schema.firms.id, firmId))

  await tx.insert(schema.priceBooks).values({ firmId }).onConflictDoNothing()

  const [material] = await tx.select({ id: schema.materials.id }).from(schema.materials).where(eq(schema.materials.firmId, firmId)).limit(1)
  if (!material) await tx.insert(schema.materials).values(DEFAULT_MATERIALS.map(m => ({ firmId, ...defaultMaterialRow(m) }))).onConflictDoNothing()
  for (const [before, now] of OLD_MATERIAL_WORDS) {
    await tx.update(schema.materials).set({ source: sql`replace(${schema.materials.source}, ${before}, ${now})` })
      .where(and(eq(schema.materials.firmId, firmId), sql`strpos(${schema.materials.source}, ${before}) > 0`))
  }

  const [rule] = await tx.select({ id: schema.reminderRules.id }).from(schema.reminderRules).where(eq(schema.reminderRules.firmId, firmId)).limit(1)
  if (!rule) {
    const [chosen] = await tx.select({ id: schema.auditLog.id }).from(schema.auditLog)
      .where(and(eq(schema.auditLog.firmId, firmId), inArray(schema.auditLog.action, ['reminders.changed', 'reminders.defaulted']))).limit(1)
    if (!chosen) {
      await tx.insert(schema.reminderRules).values(DEFAULT_REMINDERS.map(r => ({ firmId, ...r }))).onConflictDoNothing()
      await tx.insert(schema.auditLog).values({ firmId, actorUserId, action: 'reminders.defaulted', entity: 'firm', entityId: firmId, detail: { count: DEFAULT_REMINDERS.length } })
    }
  }

  const [earliest] = await tx.select({ from: sql<string | null>`min(${schema.bankRates.fromDate})::text` }).from(schema.bankRates).where(eq(schema.bankRates.firmId, firmId))
  const older = DEFAULT_BANK_RATES.filter(r => !earliest?.from || r.from < earliest.from)
  if (older.length) await tx.insert(schema.bankRates).values(older.map(r => ({ firmId, fromDate: r.from, rateBp: Math.round(r.ratePercent * 100) }))).onConflictDoNothing()
}

/** The defaults for every firm that is missing some (the seed script, on each start and test run). */
export async function addDefaultsToEveryFirm(db: NodePgDatabase<typeof schema>) {
  // every firm's id, through the policy the reminder sweep reads firms by (app.job_sweep)
  const ids = await db.transaction(async (tx) => {
    await tx.execute(sql`select set_config('app.job_sweep', 'on', true)`)
    return (await tx.select({ id: schema.firms.id }).from(schema.firms)).map(r => r.id)
  })
  for (const firmId of ids) {
    await db.transaction(async (tx) => {
      await tx.execute(sql`select set_config('app.firm_id', ${firmId}, true)`)
      await addFirmDefaults(tx, firmId)
    })
  }
  return ids.length
}

// The demo firm's bank statement (issue 20): a CSV file as a UK bank exports it (Date,
// Description, Amount, Balance; dates dd/mm/yyyy; a running balance), covering the six weeks
// before the day the seed ran, for the partner to import into the demo's "Business current
// account". `npm run db:seed` writes it to seeds/out/ (ignored by git) and says where.
//
// Built from what the seed wrote for the demo firm, read back from the database, so the same
// database always gives the same file (an e2e test can build it again for a fresh seed):
// - the transfers it recorded, and its card payments paid out by Stripe together, net of an
//   invented fee (1.5% + 20p a payment: the demo's own figure);
// - a card payment (or, for a labourer, a transfer) for each of its purchases, the day after;
// - the last six weeks' invoices (seeds/recent.ts) paid as PAID_IN says: a reference written
//   oddly ("bp 14"), the builder paying net of its CIS deduction and naming itself, a landlord
//   paying two invoices in one transfer, a part payment, and a payment of an amount two invoices
//   owe with only a surname. The builder's overdue invoice and Morwenna Tilsley's hall stay
//   unpaid, and part of Edwin Quarrendon's kitchen, so what is owed still has something;
// - the firm's own lines: fuel bought on the card with no purchase recorded, the van's finance
//   by standing order on the 20th, and interest at each month's end.
// "What the seed wrote" is every row written in the seed's one transaction: created_at equal to the
// demo firm's (now() is the transaction's start), so payments or purchases added since (by
// importing this very file) never change it. Payers are the demo's invented customers; merchants
// and the lender are invented too.
import { mkdir, writeFile } from 'node:fs/promises'
import { dirname } from 'node:path'
import { fileURLToPath } from 'node:url'
import { tz } from '@date-fns/tz'
import { format } from 'date-fns'
import { sql } from 'drizzle-orm'
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import * as schema from '../server/db/schema'
import { poundsCell, toCsv } from '../shared/utils/csv'
import { addDays, daysBetween, isoDay, monthBounds } from '../shared/utils/dates'
import { DEMO_FIRM, DEMO_PEOPLE } from './demo'
import { RECENT_INVOICES, type RecentKey } from './recent'

export const DEMO_BANK_ACCOUNT = 'Business current account'
export const DEMO_STATEMENT_FILE = 'brackenridge-statement.csv'
export const DEMO_STATEMENT_PATH = fileURLToPath(new URL(`./out/${DEMO_STATEMENT_FILE}`, import.meta.url))
/** Days the statement covers, ending the day before the seed ran. */
export const STATEMENT_DAYS = 42

/** What the seed wrote for the demo firm, as the statement needs it. Dates are ISO. */
export interface StatementFacts {
  firmId: string
  /** The day the seed ran (UTC, as the demo's invoices count their days). */
  seededOn: string
  invoices: { id: string, reference: string, customerName: string, firstLine: string, amountDuePence: number, cisDeductionPence: number }[]
  payments: { id: string, invoiceId: string, method: 'transfer' | 'card' | 'cash', amountPence: number, receivedOn: string, reference: string }[]
  purchases: { id: string, supplier: string, category: string, boughtOn: string, grossPence: number }[]
}

/** What a line is, so a test can say what its proposal should be. */
export type StatementLineIs
  = | { kind: 'invoices', how: PaidIn['how'], invoiceIds: string[] }
    | { kind: 'recorded-transfer', paymentId: string }
    | { kind: 'stripe-payout', paymentIds: string[] }
    | { kind: 'purchase', purchaseId: string }
    | { kind: 'no-purchase' }
    | { kind: 'standing-order' }
    | { kind: 'interest' }

export interface DemoStatementLine { date: string, description: string, amountPence: number, balancePence: number, is: StatementLineIs }
export interface DemoStatement { firmId: string, fileName: string, from: string, to: string, openingBalancePence: number, lines: DemoStatementLine[], text: string }

interface PaidIn {
  how: 'two-at-once' | 'contractor-net-of-cis' | 'part-payment' | 'odd-reference' | 'ambiguous'
  invoices: RecentKey[]
  /** Days before the seed ran. */
  day: number
  /** Less than is owed (a part payment); else what the invoices owe. */
  pence?: number
  words: (references: string[]) => string
}

/** The last six weeks' invoices, paid (seeds/recent.ts names them); in date order. */
export const PAID_IN: PaidIn[] = [
  { how: 'two-at-once', invoices: ['millbeck-flat2', 'millbeck-flat5'], day: -16, words: refs => `FASTER PAYMENT MILLBECK LETTINGS ${refs.map(r => r.replace(/[^A-Z0-9]/gi, '')).join(' ')}` },
  { how: 'contractor-net-of-cis', invoices: ['barn-stairwell'], day: -12, words: () => 'BACS PRIBBLEWORTH SCARNHOLME BUILDS SUBCONTRACT' },
  { how: 'part-payment', invoices: ['quarrendon-kitchen'], day: -10, pence: 500_00, words: ([ref]) => `FASTER PAYMENT E QUARRENDON ${ref} PART` },
  // "bp 14": lower case, a space for the dash
  { how: 'odd-reference', invoices: ['fernhill-ceiling'], day: -9, words: ([ref]) => `FASTER PAYMENT FERNHILL HOMES ${ref!.toLowerCase().replace(/-/g, ' ')}` },
  // what Morwenna Tilsley's hall owes too, with only the surname
  { how: 'ambiguous', invoices: ['dunmore-landing'], day: -6, words: () => 'FASTER PAYMENT DUNMORE' },
]

/** The firm's own lines (invented merchant, lender and figures). */
const OPENING_BALANCE_PENCE = 3842_17
const FUEL = { day: -4, merchant: 'HOBBLECOTE FUEL STOP', pence: 68_40 }
const VAN_FINANCE = { dayOfMonth: 20, words: 'STANDING ORDER HOLLINBRAKE VAN FINANCE', pence: 312_40 }
const INTEREST_PENCE = [41, 37, 44]
/** Stripe's fee on a card payment, for the demo only (invented: 1.5% and 20p). */
const payoutFee = (pence: number) => Math.round(pence * 15 / 1000) + 20
/** Card payments no more than this many days after the first of a run are paid out together, this many days after the last. */
const PAYOUT_RUN_DAYS = 7
const PAYOUT_AFTER_DAYS = 3

const utc = tz('UTC')
const ddMmYyyy = (iso: string) => format(isoDay(iso), 'dd/MM/yyyy', { in: utc })
const cardDay = (iso: string) => format(isoDay(iso), 'dd MMM', { in: utc }).toUpperCase()
/** A name as a bank prints it: capitals, no punctuation but &, cut short. */
const bankName = (name: string) => name.toUpperCase().replace(/\([^)]*\)/g, ' ').replace(/'/g, '').replace(/[^A-Z0-9&]+/g, ' ').trim().slice(0, 22).trim()

/** The statement's text and lines from what the seed wrote. Pure. Throws when the demo's invoices are not there (a database seeded before them). */
export function buildDemoStatement(facts: StatementFacts): DemoStatement {
  const to = addDays(facts.seededOn, -1)
  const from = addDays(facts.seededOn, -STATEMENT_DAYS)
  const inWindow = (d: string) => d >= from && d <= to
  const on = (days: number) => addDays(facts.seededOn, days)
  const lines: Omit<DemoStatementLine, 'balancePence'>[] = []

  // what was paid on each invoice when the seed ran
  const paid = new Map<string, number>()
  for (const p of facts.payments) paid.set(p.invoiceId, (paid.get(p.invoiceId) ?? 0) + p.amountPence)
  const byKey = (key: RecentKey) => {
    const spec = RECENT_INVOICES.find(i => i.key === key)!
    const found = facts.invoices.find(i => i.customerName === spec.customer && i.firstLine === spec.lines[0]!.description)
    if (!found) throw new Error(`the demo has no invoice to ${spec.customer} for "${spec.lines[0]!.description}" (seeded before it was added: npm run db:reset)`)
    return { ...found, owedPence: found.amountDuePence - (paid.get(found.id) ?? 0) }
  }
  for (const p of PAID_IN) {
    const invoices = p.invoices.map(byKey)
    const owed = invoices.reduce((n, i) => n + i.owedPence, 0)
    lines.push({ date: on(p.day), description: p.words(invoices.map(i => i.reference)), amountPence: p.pence ?? owed, is: { kind: 'invoices', how: p.how, invoiceIds: invoices.map(i => i.id) } })
  }

  // transfers the seed recorded, as the payer's reference
  for (const p of facts.payments) {
    if (p.method === 'transfer' && inWindow(p.receivedOn)) lines.push({ date: p.receivedOn, description: `FASTER PAYMENT ${p.reference.toUpperCase()}`, amountPence: p.amountPence, is: { kind: 'recorded-transfer', paymentId: p.id } })
  }
  // card payments, paid out by Stripe in runs, less its fee
  const cards = facts.payments.filter(p => p.method === 'card').sort((a, b) => a.receivedOn.localeCompare(b.receivedOn) || a.id.localeCompare(b.id))
  const runs: (typeof cards)[] = []
  for (const p of cards) {
    const run = runs.at(-1)
    if (run && daysBetween(run[0]!.receivedOn, p.receivedOn) <= PAYOUT_RUN_DAYS) run.push(p)
    else runs.push([p])
  }
  for (const run of runs) {
    const date = addDays(run.at(-1)!.receivedOn, PAYOUT_AFTER_DAYS)
    if (!inWindow(date)) continue
    const pence = run.reduce((n, p) => n + p.amountPence - payoutFee(p.amountPence), 0)
    lines.push({ date, description: 'STRIPE PAYMENTS UK PAYOUT', amountPence: pence, is: { kind: 'stripe-payout', paymentIds: run.map(p => p.id) } })
  }

  // purchases: on the card the day after, or a transfer to a labourer
  for (const p of facts.purchases) {
    const date = addDays(p.boughtOn, 1)
    if (!inWindow(date)) continue
    const description = p.category === 'labour' ? `FASTER PAYMENT TO ${bankName(p.supplier)}` : `CARD PAYMENT TO ${bankName(p.supplier)} ON ${cardDay(p.boughtOn)}`
    lines.push({ date, description, amountPence: -p.grossPence, is: { kind: 'purchase', purchaseId: p.id } })
  }
  lines.push({ date: on(FUEL.day), description: `CARD PAYMENT TO ${FUEL.merchant} ON ${cardDay(on(FUEL.day - 1))}`, amountPence: -FUEL.pence, is: { kind: 'no-purchase' } })

  // the van's finance on the 20th, interest at each month's end
  let months = 0
  for (let d = from; d <= to; d = addDays(d, 1)) {
    if (isoDay(d).getUTCDate() === VAN_FINANCE.dayOfMonth) lines.push({ date: d, description: VAN_FINANCE.words, amountPence: -VAN_FINANCE.pence, is: { kind: 'standing-order' } })
    if (d === monthBounds(d).end) lines.push({ date: d, description: 'INTEREST (GROSS)', amountPence: INTEREST_PENCE[months++ % INTEREST_PENCE.length]!, is: { kind: 'interest' } })
  }

  // oldest first, as the bank lists them; on one day, money in before money out
  const sorted = lines.filter(l => inWindow(l.date))
    .map((l, i) => ({ l, i }))
    .sort((a, b) => a.l.date.localeCompare(b.l.date) || Number(b.l.amountPence > 0) - Number(a.l.amountPence > 0) || a.i - b.i)
  const out: DemoStatementLine[] = []
  let balance = OPENING_BALANCE_PENCE
  for (const { l } of sorted) {
    balance += l.amountPence
    out.push({ ...l, balancePence: balance })
  }
  const text = toCsv(['Date', 'Description', 'Amount', 'Balance'], out.map(l => [ddMmYyyy(l.date), l.description, poundsCell(l.amountPence), poundsCell(l.balancePence)]))
  return { firmId: facts.firmId, fileName: DEMO_STATEMENT_FILE, from, to, openingBalancePence: OPENING_BALANCE_PENCE, lines: out, text }
}

type Db = NodePgDatabase<typeof schema>

/** What the seed wrote for the firm (rows made in its transaction), read as that firm. */
export async function readStatementFacts(db: Db, firmId: string): Promise<StatementFacts> {
  return db.transaction(async (tx) => {
    await tx.execute(sql`select set_config('app.firm_id', ${firmId}, true)`)
    const seeded = sql`(select f.created_at from firms f where f.id = ${firmId})`
    const [firm] = (await tx.execute<{ seeded_on: string }>(sql`select (created_at at time zone 'UTC')::date::text as seeded_on from firms where id = ${firmId}`)).rows
    if (!firm) throw new Error('the demo firm is not there')
    const invoices = (await tx.execute<StatementFacts['invoices'][number]>(sql`
      select i.id, i.reference, c.name as "customerName", i.amount_due_pence as "amountDuePence",
        coalesce((i.totals->>'cisDeductionPence')::int, 0) as "cisDeductionPence",
        (select l.description from invoice_lines l where l.firm_id = i.firm_id and l.invoice_id = i.id order by l.position limit 1) as "firstLine"
      from invoices i join customers c on c.firm_id = i.firm_id and c.id = i.customer_id
      where i.firm_id = ${firmId} and i.issued_on is not null and i.kind <> 'credit-note' and i.created_at = ${seeded}
      order by i.number`)).rows
    const payments = (await tx.execute<StatementFacts['payments'][number]>(sql`
      select id, invoice_id as "invoiceId", method, amount_pence as "amountPence", received_on::text as "receivedOn", reference
      from payments where firm_id = ${firmId} and created_at = ${seeded} order by received_on, id`)).rows
    const purchases = (await tx.execute<StatementFacts['purchases'][number]>(sql`
      select id, supplier, category, bought_on::text as "boughtOn", (net_pence + vat_pence)::int as "grossPence"
      from purchases where firm_id = ${firmId} and created_at = ${seeded} order by bought_on, id`)).rows
    return { firmId, seededOn: firm.seeded_on, invoices, payments, purchases }
  })
}

/** The demo firm's id, found through its owner (row-level security shows a person their firms). */
async function demoFirmId(db: Db): Promise<string> {
  return db.transaction(async (tx) => {
    const owner = DEMO_PEOPLE.find(p => p.role === 'owner')!
    const [user] = (await tx.execute<{ id: string }>(sql`select id from users where email = ${owner.email}`)).rows
    if (!user) throw new Error('the demo firm is not seeded')
    await tx.execute(sql`select set_config('app.user_id', ${user.id}, true)`)
    const [firm] = (await tx.execute<{ id: string }>(sql`select id from firms where trading_name = ${DEMO_FIRM.tradingName} order by created_at limit 1`)).rows
    if (!firm) throw new Error('the demo firm is not seeded')
    return firm.id
  })
}

/** The demo firm's statement from the database at `url` (the owner role's, as the seed uses). */
export async function demoStatement(url: string): Promise<DemoStatement> {
  const pool = new pg.Pool({ connectionString: url, max: 1 })
  try {
    const db = drizzle({ client: pool, schema, casing: 'snake_case' })
    return buildDemoStatement(await readStatementFacts(db, await demoFirmId(db)))
  }
  finally {
    await pool.end()
  }
}

/** Write the demo firm's statement to `path`. */
export async function writeDemoStatement(url: string, path = DEMO_STATEMENT_PATH) {
  const statement = await demoStatement(url)
  await mkdir(dirname(path), { recursive: true })
  await writeFile(path, statement.text)
  return { path, lines: statement.lines.length }
}

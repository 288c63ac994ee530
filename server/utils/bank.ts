// Importing a bank statement file into one of the firm's accounts (issue 20): read as OFX or CSV
// (shared/utils/bank-ofx.ts, bank-csv.ts), each line keyed (lineKeys) and written once per account
// (a unique key: a file imported again, or overlapping one, adds only what is new), all in one
// transaction, so nothing is half-imported.
import Papa from 'papaparse'
import { and, desc, eq, gte, lte, sql } from 'drizzle-orm'
import { bankAccounts, bankLines, bankMatches, bankStatements, customers, invoices, purchases } from '../db/schema'
import { owing } from './invoices'
import type { FirmScope } from './db'
import { lineKeys, readStatementRows, type BankMapping, type BankCsvLine } from '#shared/utils/bank-csv'
import { readOfx } from '#shared/utils/bank-ofx'
import { PURCHASE_DAYS, proposeAll, proposeMoneyOut } from '#shared/utils/bank-match'
import { addDays } from '#shared/utils/dates'

export interface StatementImport { statementId: string, linesNew: number, linesAlready: number, format: 'csv' | 'ofx' }

/** OFX by its header or its root element; anything else is read as CSV. */
export function looksLikeOfx(text: string) {
  const head = text.slice(0, 2000).trimStart()
  return head.startsWith('OFXHEADER') || /<OFX>/i.test(head) || /<\?OFX\b/i.test(head)
}

/**
 * Read the file and write its new lines. A file that cannot be read is a 400 naming its line, with
 * nothing written; a CSV whose header does not name its columns needs `layout` (the person's
 * mapping), which is then remembered for the account.
 */
export async function importStatement(f: FirmScope, accountId: string, file: { data: Buffer, filename: string }, layout?: { headerRow: number, mapping: BankMapping }): Promise<StatementImport> {
  const [account] = await f.tx.select().from(bankAccounts).where(f.where(bankAccounts, eq(bankAccounts.id, accountId))).for('update')
  if (!account) notFound()
  const text = file.data.toString('utf8').replace(/^\uFEFF/, '')
  const format = looksLikeOfx(text) ? 'ofx' : 'csv'
  let lines: (BankCsvLine & { fitId?: string | null })[]
  if (format === 'ofx') {
    const read = readOfx(text)
    if (!read.ok) throw fieldError({ file: read.message })
    lines = read.lines
  }
  else {
    const rows = Papa.parse<string[]>(text, { skipEmptyLines: false }).data
    const given = layout ?? account.csvLayout ?? undefined
    const read = readStatementRows(rows, given)
    if (!read.ok) throw fieldError({ file: read.message }, 400, given ? 'The file does not fit the columns chosen' : 'Check the statement file')
    lines = read.lines
    if (layout) await f.tx.update(bankAccounts).set({ csvLayout: layout }).where(f.where(bankAccounts, eq(bankAccounts.id, accountId)))
  }
  const keys = lineKeys(lines)
  const [statement] = await f.tx.insert(bankStatements).values(f.values({ accountId, fileName: file.filename.slice(0, 200), format, linesNew: 0, linesAlready: 0, importedBy: f.userId })).returning({ id: bankStatements.id })
  let linesNew = 0
  // in batches: a year's statement is thousands of lines
  for (let i = 0; i < lines.length; i += 1000) {
    const batch = lines.slice(i, i + 1000).map((l, j) => f.values({
      accountId, statementId: statement!.id, postedOn: l.date, description: l.description.slice(0, 500), amountPence: l.amountPence, balancePence: l.balancePence, lineKey: keys[i + j]!,
    }))
    const written = await f.tx.insert(bankLines).values(batch).onConflictDoNothing({ target: [bankLines.firmId, bankLines.accountId, bankLines.lineKey] }).returning({ id: bankLines.id })
    linesNew += written.length
  }
  const linesAlready = lines.length - linesNew
  await f.tx.update(bankStatements).set({ linesNew, linesAlready }).where(and(eq(bankStatements.firmId, f.firmId), eq(bankStatements.id, statement!.id)))
  await f.audit('bank.statement-imported', 'bank-account', accountId, { statementId: statement!.id, format, linesNew, linesAlready })
  return { statementId: statement!.id, linesNew, linesAlready, format }
}

/**
 * An account's lines with what each could be (shared/utils/bank-match.ts): money in against the
 * firm's owing invoices (the `owing` index), money out against purchases within a few days of the
 * lines and not matched yet. Newest first; `state` filters (the open ones by default).
 */
export async function linesWithProposals(f: FirmScope, accountId: string, state: 'open' | 'matched' | 'ignored' = 'open', limit = 200) {
  const lines = await f.tx.select({
    id: bankLines.id, date: bankLines.postedOn, description: bankLines.description, amountPence: bankLines.amountPence,
    balancePence: bankLines.balancePence, state: bankLines.state, note: bankLines.note,
  }).from(bankLines)
    .where(f.where(bankLines, eq(bankLines.accountId, accountId), eq(bankLines.state, state)))
    .orderBy(desc(bankLines.postedOn), desc(bankLines.id)).limit(limit)
  if (state !== 'open' || !lines.length) return lines.map(l => ({ ...l, proposal: null }))
  const open = await f.tx.select({
    id: invoices.id, reference: invoices.reference, customerName: customers.name, dueOn: invoices.dueOn,
    outstandingPence: sql<number>`(${invoices.amountDuePence} - ${invoices.settledPence})::int`,
    cisDeductionPence: sql<number>`coalesce((${invoices.totals}->>'cisDeductionPence')::int, 0)`,
    untouched: sql<boolean>`${invoices.settledPence} = 0`,
  }).from(invoices)
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(owing(f))
  const dates = lines.map(l => l.date).sort()
  const near = await f.tx.select({
    id: purchases.id, supplier: purchases.supplier, boughtOn: purchases.boughtOn,
    grossPence: sql<number>`(${purchases.netPence} + ${purchases.vatPence})::int`,
  }).from(purchases)
    .where(f.where(purchases, gte(purchases.boughtOn, addDays(dates[0]!, -PURCHASE_DAYS)), lte(purchases.boughtOn, addDays(dates.at(-1)!, PURCHASE_DAYS)),
      sql`not exists (select 1 from ${bankMatches} m where m.firm_id = ${purchases.firmId} and m.purchase_id = ${purchases.id} and m.undone_at is null)`))
  const moneyIn = new Map(proposeAll(lines.filter(l => l.amountPence > 0), open.map(i => ({ ...i, reference: i.reference ?? '' }))).map(p => [p.lineId, p]))
  return lines.map(l => ({ ...l, proposal: l.amountPence > 0 ? moneyIn.get(l.id) ?? null : proposeMoneyOut(l, near) }))
}

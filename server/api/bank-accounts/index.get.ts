import { asc, desc, sql } from 'drizzle-orm'
import { bankAccounts, bankLines, bankStatements } from '../../db/schema'

/** The firm's bank accounts, each with its open lines counted and its last file imported. Owner, office and the accountant. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, async (f) => {
    const accounts = await f.tx.select({
      id: bankAccounts.id, name: bankAccounts.name, hasLayout: sql<boolean>`${bankAccounts.csvLayout} is not null`,
      open: sql<number>`(select count(*) from ${bankLines} l where l.firm_id = ${bankAccounts.firmId} and l.account_id = ${bankAccounts.id} and l.state = 'open')::int`,
    }).from(bankAccounts).where(f.where(bankAccounts)).orderBy(asc(bankAccounts.name))
    const files = await f.tx.select({
      accountId: bankStatements.accountId, fileName: bankStatements.fileName, linesNew: bankStatements.linesNew, linesAlready: bankStatements.linesAlready, importedAt: bankStatements.createdAt,
    }).from(bankStatements).where(f.where(bankStatements)).orderBy(desc(bankStatements.createdAt)).limit(50)
    return { accounts: accounts.map(a => ({ ...a, lastFile: files.find(s => s.accountId === a.id) ?? null })) }
  })
})

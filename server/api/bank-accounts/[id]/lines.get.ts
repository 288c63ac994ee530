import { eq } from 'drizzle-orm'
import { bankAccounts } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { bankLinesQuery } from '#shared/schemas/bank'

/** An account's statement lines, newest first (the newest `limit`: 200 unless asked, 5,000 at most), each open one with what it could be and why. Owner, office and the accountant (who reads). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const { state, limit } = await readQueryWith(event, bankLinesQuery)
  return withFirm(auth, async (f) => {
    const [account] = await f.tx.select({ id: bankAccounts.id, name: bankAccounts.name }).from(bankAccounts).where(f.where(bankAccounts, eq(bankAccounts.id, id)))
    if (!account) notFound()
    return { account, state, lines: await linesWithProposals(f, id, state, limit) }
  })
})

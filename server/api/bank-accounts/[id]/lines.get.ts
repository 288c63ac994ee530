import { eq } from 'drizzle-orm'
import { bankAccounts } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { bankLinesQuery } from '#shared/schemas/bank'

/**
 * An account's statement lines, newest first (the newest `limit`: 200 unless asked, 5,000 at
 * most): the open ones with what each could be and why, the matched ones with what they were
 * matched to, or those set aside; and how many there are of each. Owner, office and the accountant
 * (who reads).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const { state, limit } = await readQueryWith(event, bankLinesQuery)
  return withFirm(auth, async (f) => {
    const [account] = await f.tx.select({ id: bankAccounts.id, name: bankAccounts.name }).from(bankAccounts).where(f.where(bankAccounts, eq(bankAccounts.id, id)))
    if (!account) notFound()
    return { account, state, counts: await lineCounts(f, id), ...await linesWithProposals(f, id, state, limit) }
  })
})

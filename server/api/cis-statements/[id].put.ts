import { and, eq, ne, sql } from 'drizzle-orm'
import { cisStatements } from '../../db/schema'
import { idParam } from '#shared/schemas/common'
import { cisStatementSchema } from '#shared/schemas/quarter'

/** Correct a recorded statement. 409 when moved onto a month already recorded for that contractor. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, cisStatementSchema)
  return withFirm(auth, async (f) => {
    await findOr404(f, cisStatements, id, { lock: true })
    await checkContractor(f, input.customerId)
    const [clash] = await f.tx.select({ id: cisStatements.id }).from(cisStatements)
      .where(f.where(cisStatements, and(eq(cisStatements.customerId, input.customerId), eq(cisStatements.taxMonthStart, input.taxMonthStart), ne(cisStatements.id, id))))
    if (clash) duplicateStatement()
    await f.tx.update(cisStatements).set({ ...input, updatedAt: sql`now()` }).where(f.where(cisStatements, eq(cisStatements.id, id)))
    await f.audit('cis-statement.changed', 'cis-statement', id, { fields: Object.keys(input) })
    return cisStatementDetail(f, id)
  })
})

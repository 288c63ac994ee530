import { cisStatements } from '../../db/schema'
import { cisStatementSchema } from '#shared/schemas/quarter'

/** Record a contractor's monthly CIS statement. 409 when that contractor's month is already recorded. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const input = await readBodyWith(event, cisStatementSchema)
  return withFirm(auth, async (f) => {
    await checkContractor(f, input.customerId)
    const [row] = await f.tx.insert(cisStatements).values(f.values({ ...input, createdBy: auth.userId }))
      .onConflictDoNothing({ target: [cisStatements.firmId, cisStatements.customerId, cisStatements.taxMonthStart] }).returning()
    if (!row) duplicateStatement()
    await f.audit('cis-statement.recorded', 'cis-statement', row.id, { customerId: input.customerId, taxMonthStart: input.taxMonthStart })
    setResponseStatus(event, 201)
    return cisStatementDetail(f, row.id)
  })
})

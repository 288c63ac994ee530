import { cisStatementListQuery } from '#shared/schemas/quarter'

/** Contractors' CIS statements as recorded, newest tax month first. Owner, office, accountant. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, cisStatementListQuery)
  return withFirm(auth, f => listCisStatements(f, q))
})

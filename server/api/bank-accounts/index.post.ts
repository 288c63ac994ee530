import { bankAccounts } from '../../db/schema'
import { bankAccountSchema } from '#shared/schemas/bank'

/** Add one of the firm's bank accounts (its name, as the firm calls it). 201; 409 when the firm has one of that name. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const body = await readBodyWith(event, bankAccountSchema)
  return withFirm(auth, async (f) => {
    const [row] = await f.tx.insert(bankAccounts).values(f.values({ name: body.name })).onConflictDoNothing().returning()
    if (!row) throw fieldError({ name: 'The firm already has an account of that name.' }, 409, 'Already there')
    await f.audit('bank.account-added', 'bank-account', row.id, { name: row.name })
    setResponseStatus(event, 201)
    return { id: row.id, name: row.name }
  })
})

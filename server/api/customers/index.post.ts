import { customers, sites } from '../../db/schema'
import { newCustomerSchema } from '#shared/schemas/customer'

/** A new customer, with their first site when given (often the billing address is where the work is). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const input = await readBodyWith(event, newCustomerSchema)
  const created = await withFirm(auth, async (f) => {
    const [c] = await f.tx.insert(customers).values(f.values(input.customer)).returning()
    let site = null
    if (input.site) [site] = await f.tx.insert(sites).values(f.values({ ...input.site, customerId: c!.id })).returning()
    await f.audit('customer.created', 'customer', c!.id, { name: c!.name })
    return { ...c!, sites: site ? [site] : [] }
  })
  setResponseStatus(event, 201)
  return created
})

import { customers, sites } from '../../../db/schema'
import { siteSchema } from '#shared/schemas/customer'
import { idParam } from '#shared/schemas/common'

/** Add a site (an address where work happens) to a customer. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, siteSchema)
  const site = await withFirm(auth, async (f) => {
    await findOr404(f, customers, id)
    const [s] = await f.tx.insert(sites).values(f.values({ ...input, customerId: id })).returning()
    await f.audit('site.created', 'site', s!.id, { customerId: id })
    return s!
  })
  setResponseStatus(event, 201)
  return site
})

import { z } from 'zod'
import { queryWholeNumber } from '#shared/schemas/common'

const query = z.object({
  pageSize: queryWholeNumber('A page size', 1, 200, 50),
})

/** Invoices and credit notes, drafts first then newest, each with its status worked out from its payments and dates; the newest `pageSize`. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { pageSize } = await readQueryWith(event, query)
  return withFirm(auth, f => listInvoices(f, undefined, { limit: pageSize }))
})

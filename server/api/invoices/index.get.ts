import { z } from 'zod'

const query = z.object({
  pageSize: z.coerce.number({ error: 'A page size is a number.' }).int().min(1).max(200).default(50),
})

/** Invoices and credit notes, drafts first then newest, each with its status worked out from its payments and dates; the newest `pageSize`. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { pageSize } = await readQueryWith(event, query)
  return withFirm(auth, f => listInvoices(f, undefined, { limit: pageSize }))
})

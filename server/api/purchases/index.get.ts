import { purchaseListQuery } from '#shared/schemas/purchase'

/** Purchases, newest first, for a date range or a job. The accountant reads them. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, purchaseListQuery)
  return withFirm(auth, f => listPurchases(f, q))
})

import { profitQuerySchema } from '#shared/schemas/profit'
/**
 * Is the work paying? Each job whose last worked day falls in the period (at most 366 days),
 * optionally for one kind of customer: its price against its costs and the days it took, with the
 * totals and the firm's target day rate (server/utils/profit-table.ts). Each job still on site is
 * marked `provisional` and left out of the totals unless `onSite=include`. Owner, office and
 * accountant; crew never see money.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, profitQuerySchema)
  const table = await withFirm(auth, f => profitTable(f, q))
  return { from: q.from, to: q.to, customerKind: q.customerKind ?? null, ...table, caution: PROFIT_CAUTION }
})

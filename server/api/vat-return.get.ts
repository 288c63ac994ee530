import { periodQuery } from '#shared/schemas/quarter'

/**
 * The VAT return's boxes 1 to 9 for a VAT quarter (`quarterOf` any date in it, on the firm's
 * stagger) or a date range (`from`, `to`), on the invoice basis or the cash accounting scheme as
 * the firm is set up, with what makes up each box. Owner, office and the accountant.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, periodQuery)
  return withFirm(auth, async f => vatSummary(f, await periodOf(f, q)))
})

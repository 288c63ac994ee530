import { quoteTokenParam } from '#shared/schemas/links'
/**
 * Public: the customer's PDF of their quote, by the link they were sent (`/q/<token>/pdf`);
 * a wrong or expired link is the same 404 as the JSON view's.
 */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, quoteTokenParam)
  const view = await useDb().transaction(async (tx) => {
    const { f, quote, version } = await openQuoteByToken(tx, token)
    return quotePdfView(f, quote, version)
  })
  return sendQuotePdf(event, view)
})

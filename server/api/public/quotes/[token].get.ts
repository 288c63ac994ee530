import { quoteTokenParam } from '#shared/schemas/links'
/** Public: the customer's view of their quote, by the link they were sent. */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, quoteTokenParam)
  return useDb().transaction(async (tx) => {
    const { f, quote, version } = await openQuoteByToken(tx, token)
    return publicQuoteView(f, quote, version)
  })
})

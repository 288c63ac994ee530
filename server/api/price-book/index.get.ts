/** The firm's rates for pricing by measure, and its take-off rules. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => usePriceBook(f))
})

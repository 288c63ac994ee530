/** The Bank Rate table the claims use (seeded from published figures; the firm keeps it up to date). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => bankRateTable(f))
})

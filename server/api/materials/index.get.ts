/** The firm's materials catalogue (the generic one the first time). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => catalogueRows(f))
})

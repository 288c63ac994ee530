/** The firm's reminder schedule and words. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => reminderRulesFor(f))
})

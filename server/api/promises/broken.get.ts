/** The firm's promises to pay not kept, as next actions (Today lists the same, with the rest). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => brokenPromiseActions(f, todayIso()))
})

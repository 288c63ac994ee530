/** Make or reset the signed-in person's calendar feed for this firm; the old URL stops working. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  return withFirm(auth, async f => ({ url: await resetCalendarFeed(f, auth.userId) }))
})

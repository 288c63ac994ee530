/**
 * Today in one request, by role (server/utils/next-actions.ts): the owner's and the office's next
 * actions, most urgent first; the jobs on site today (once each, with their people) and the
 * visits to come; crew their own; the accountant the firms they serve with each quarter's dates.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:read')
  return withFirm(auth, f => todayFor(f, { role: auth.role, userId: auth.userId }, todayIso()))
})

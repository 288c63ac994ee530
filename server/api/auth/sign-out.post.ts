/** Ends this session: the row is revoked, so the cookie is worthless even if it was copied. */
export default defineEventHandler(async (event) => {
  await endSession(event)
  return { ok: true }
})

import { tokenParam } from '#shared/schemas/auth'

/** Follow the sign-up link: makes the firm and its owner and signs them in, once. 404 when used or expired. */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, tokenParam)
  const firmId = await confirmSignUp(event, token)
  return { ok: true, firmId }
})

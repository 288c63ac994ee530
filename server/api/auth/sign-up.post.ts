import { signUpSchema } from '#shared/schemas/auth'

/**
 * Sign-up: answers 202 "check your e-mail" whether or not the address has an account, and sets
 * no session (server/utils/sign-up.ts). The firm is made when the e-mailed link is followed.
 */
export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signUpSchema)
  await requestSignUp(event, input)
  setResponseStatus(event, 202)
  return SIGN_UP_ANSWER
})

import { eq, sql } from 'drizzle-orm'
import { users } from '../../db/schema'
import { signInSchema } from '#shared/schemas/auth'

// A real hash to verify against when the e-mail is unknown, so both failures take the same time.
let dummyHash: Promise<string> | undefined

const VAGUE = 'That e-mail and password do not match an account.'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signInSchema)
  const ip = getRequestIP(event) ?? '127.0.0.1'

  const retryAfter = await signInRetryAfter(input.email, ip)
  if (retryAfter > 0) {
    setResponseHeader(event, 'Retry-After', retryAfter)
    throw createError({ statusCode: 429, statusMessage: 'Too many attempts', data: { retryAfter, message: `Too many attempts. Try again in ${Math.ceil(retryAfter / 60)} minutes.` } })
  }

  const [user] = await useDb().select({ id: users.id, passwordHash: users.passwordHash })
    .from(users).where(eq(sql`lower(${users.email})`, input.email))
  dummyHash ??= hashPassword('not-a-password-anyone-has')
  const ok = await verifyPassword(user?.passwordHash ?? await dummyHash, input.password)
  if (!user || !ok) {
    await recordSignInFailure(input.email, ip)
    throw createError({ statusCode: 401, statusMessage: 'Sign-in failed', data: { message: VAGUE } })
  }

  const firmId = await useDb().transaction(async (tx) => {
    const firm = await defaultFirmFor(tx, user.id)
    if (firm) await startSession(event, tx, user.id, firm)
    return firm
  })
  if (!firmId) {
    // an account that belongs to no firm any more cannot work anywhere
    throw createError({ statusCode: 401, statusMessage: 'Sign-in failed', data: { message: 'This account is not part of any firm now. Ask a firm owner for an invitation.' } })
  }
  await clearSignInFailures(input.email, ip)
  return { ok: true }
})

import { eq, sql } from 'drizzle-orm'
import { users } from '../../db/schema'
import { signInSchema } from '#shared/schemas/auth'

// A real hash to verify against when the e-mail is unknown, so both failures take the same time.
let dummyHash: Promise<string> | undefined

const VAGUE = 'That e-mail and password do not match an account.'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signInSchema)
  // counted before the password is checked (one atomic step): a burst checks at most the limit
  const attempt = await limitPasswordCheck(event, input.email)

  const [user] = await useDb().select({ id: users.id, passwordHash: users.passwordHash })
    .from(users).where(eq(sql`lower(${users.email})`, input.email))
  dummyHash ??= hashPassword('not-a-password-anyone-has')
  const ok = await verifyPassword(user?.passwordHash ?? await dummyHash, input.password)
  if (!user || !ok) {
    throw createError({ statusCode: 401, statusMessage: 'Sign-in failed', data: { message: VAGUE } })
  }
  await passwordSucceeded(input.email, clientAddress(event), attempt)

  const firmId = await useDb().transaction(async (tx) => {
    const firm = await defaultFirmFor(tx, user.id)
    if (firm) await startSession(event, tx, user.id, firm)
    return firm
  })
  if (!firmId) {
    // an account that belongs to no firm any more cannot work anywhere
    throw createError({ statusCode: 401, statusMessage: 'Sign-in failed', data: { message: 'This account is not part of any firm now. Ask a firm owner for an invitation.' } })
  }
  return { ok: true }
})

// Sign-up that tells no one which e-mails have accounts (OWASP ASVS 5.0 V6). Every sign-up answers
// the same 202 "check your e-mail", with no session, after the same work (the password is hashed
// either way). A new address gets a link that makes the firm, its owner and a session when
// followed; an address with an account gets a note that someone tried, with a sign-in link.
// The link is like an invitation's: random, only its hash kept, single use, expiring.
import type { H3Event } from 'h3'
import { randomUUID } from 'node:crypto'
import { and, eq, gt, isNull, lt, sql } from 'drizzle-orm'
import { firms, memberships, pendingSignUps, users } from '../db/schema'
import { addFirmDefaults, referenceDefaults } from '../db/firm-defaults'
import type { SignUpInput } from '#shared/schemas/auth'
import { daysBefore } from '#shared/utils/dates'

export const SIGN_UP_LINK_HOURS = 24
/** Sign-up e-mails to one address in an hour: beyond this nothing is sent (the answer is the same). */
const SIGN_UP_MAILS_PER_HOUR = 5

export const SIGN_UP_ANSWER = { ok: true, message: 'Check your e-mail. We have sent a link to finish setting up your firm.' } as const

const appLink = (path: string) => `${useRuntimeConfig().appUrl.replace(/\/$/, '')}${path}`

/** Send, or 502 with the same words whichever mail it was. */
async function sendSignUpMail(mail: OutgoingMail) {
  try {
    await sendMail(mail)
  }
  catch (err) {
    console.error('[mail] sign-up mail not sent:', (err as Error).message)
    throw createError({ statusCode: 502, statusMessage: 'E-mail not sent', data: { message: 'We could not send the e-mail just now. Please try again in a few minutes.' } })
  }
}

/** Record the sign-up and send the right e-mail; the caller answers SIGN_UP_ANSWER whichever it was. */
export async function requestSignUp(event: H3Event, input: SignUpInput) {
  // both paths hash the password, so the time taken says nothing about the address
  const passwordHash = await hashPassword(input.password)
  const db = useDb()
  // a cap on mails to one address, so the form cannot be used to flood someone's inbox
  try {
    await takeLimits(event, [{ key: `sign-up-mail:${input.email}`, max: SIGN_UP_MAILS_PER_HOUR, windowSeconds: 3600 }], () => '')
  }
  catch (err) {
    if ((err as { statusCode?: number }).statusCode === 429) return
    throw err
  }
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(sql`lower(${users.email})`, input.email))
  if (existing) {
    await sendSignUpMail({
      to: input.email,
      subject: 'Someone tried to sign up to Setwell with your e-mail',
      text: [
        `Hello,`,
        ``,
        `Someone tried to set up a new firm on Setwell with this e-mail address, but it already has a Setwell account.`,
        `If it was you, sign in here instead:`,
        appLink('/sign-in'),
        ``,
        `Forgotten your password? Ask your firm's owner, or sign in and change it under Your account.`,
        `If it was not you, you need do nothing: no new account was made and nothing has changed.`,
      ].join('\n'),
    })
    return
  }
  const token = newToken()
  await db.delete(pendingSignUps).where(lt(pendingSignUps.expiresAt, daysBefore(new Date(), 7)))
  await db.insert(pendingSignUps).values({
    email: input.email, name: input.name, firmName: input.firmName, passwordHash,
    tokenHash: hashToken(token), expiresAt: new Date(Date.now() + SIGN_UP_LINK_HOURS * 3600_000),
  })
  await sendSignUpMail({
    to: input.email,
    subject: `Confirm your e-mail to set up ${input.firmName} on Setwell`,
    text: [
      `Hello ${input.name},`,
      ``,
      `To finish setting up ${input.firmName} on Setwell, open this link (it works once, for ${SIGN_UP_LINK_HOURS} hours):`,
      appLink(`/sign-up/${token}`),
      ``,
      `If you did not ask for this, ignore this e-mail: nothing is set up until the link is opened.`,
    ].join('\n'),
  })
}

/**
 * Follow a sign-up link: in one transaction, claim the pending sign-up (used once: the UPDATE
 * takes its row, so a second follower finds it used), make the person, the firm and its owner,
 * and sign them in. 404 for an unknown, used or expired link.
 */
export async function confirmSignUp(event: H3Event, token: string) {
  const firmId = randomUUID()
  try {
    await useDb().transaction(async (tx) => {
      const [pending] = await tx.update(pendingSignUps).set({ usedAt: sql`now()` })
        .where(and(eq(pendingSignUps.tokenHash, hashToken(token)), isNull(pendingSignUps.usedAt), gt(pendingSignUps.expiresAt, sql`now()`)))
        .returning()
      if (!pending) {
        throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This link has expired or was already used. Sign up again, or sign in if your firm is set up.' } })
      }
      const [user] = await tx.insert(users).values({ email: pending.email, name: pending.name, passwordHash: pending.passwordHash }).returning({ id: users.id })
      await scopeTransaction(tx, firmId, user!.id)
      const f = new FirmScope(tx, firmId, user!.id)
      await tx.insert(firms).values({ id: firmId, tradingName: pending.firmName, ...referenceDefaults(pending.firmName) })
      await tx.insert(memberships).values(f.values({ userId: user!.id, role: 'owner' as const }))
      // the price book, materials, reminders and Bank Rate a firm starts with: made now, never on a read
      await addFirmDefaults(tx, firmId, user!.id)
      await f.audit('firm.created', 'firm', firmId, { tradingName: pending.firmName })
      await startSession(event, tx, user!.id, firmId)
    })
  }
  catch (err) {
    // the same address confirmed twice from two sign-ups: the first made the account
    if (isUniqueViolation(err)) {
      throw createError({ statusCode: 409, statusMessage: 'Account exists', data: { message: 'Your account is already set up. Sign in to carry on.' } })
    }
    throw err
  }
  return firmId
}

// Limits on attempts (sign-in, invitation passwords, the public enquiry form), kept in PostgreSQL
// so they hold across restarts and several server processes. Each attempt is counted by one call
// of take_limits() (drizzle/0021_limits_function.sql): it locks every key it is given (an advisory
// lock per key, in one order), counts each key's rows in its window and, only when every key has
// room, inserts one row per key, all in one statement. However many requests arrive at once, at
// most the limit get through. The attempt is counted before the work it limits (a password check),
// so a burst cannot check more passwords than the limit; a success gives its slots back.
import type { H3Event } from 'h3'
import { randomUUID } from 'node:crypto'
import { sql } from 'drizzle-orm'
import { limitHits } from '../db/schema'

export interface Limit { key: string, max: number, windowSeconds: number }

/** 5 wrong passwords per account and address in 15 minutes (OWASP's "a handful"; a person who mistypes gets 5 goes). */
export const SIGN_IN_ACCOUNT_MAX = 5
/**
 * 30 wrong passwords per address in 15 minutes, whatever the account (runtime config
 * signInAddressMax): stops one address trying a common password on many accounts (spraying).
 * 30 is six people at one office or shared mobile address each getting all five of their own
 * tries wrong in the same quarter of an hour; a sprayer gets 30 guesses, not thousands.
 */
const signInAddressMax = () => Number(useRuntimeConfig().signInAddressMax) || 30
export const SIGN_IN_WINDOW_SECONDS = 15 * 60
/** 5 enquiries an hour from one address through the public form. */
export const PUBLIC_FORM_MAX = 5
export const PUBLIC_FORM_WINDOW_SECONDS = 60 * 60

/** The two limits a password check counts against: this account from this address, and this address. */
export function passwordLimits(email: string, ip: string): Limit[] {
  return [
    { key: `sign-in:${email.toLowerCase()}:${ip}`, max: SIGN_IN_ACCOUNT_MAX, windowSeconds: SIGN_IN_WINDOW_SECONDS },
    { key: `sign-in-address:${ip}`, max: signInAddressMax(), windowSeconds: SIGN_IN_WINDOW_SECONDS },
  ]
}

/**
 * The client's address as the socket saw it. X-Forwarded-For is not trusted (anyone can send it)
 * unless runtime config trustProxy says a proxy of ours sets it.
 */
export function clientAddress(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: useRuntimeConfig().trustProxy === true }) ?? 'unknown'
}

/**
 * Count one attempt against every limit, atomically. Returns the attempt's id when counted;
 * throws 429 with Retry-After (seconds) and `message` when any limit is full (nothing is counted).
 */
export async function takeLimits(event: H3Event, limits: Limit[], message: (minutes: number) => string): Promise<string> {
  const attempt = randomUUID()
  const list = (values: (string | number)[], type: string) => sql`array[${sql.join(values.map(v => sql`${v}`), sql`, `)}]::${sql.raw(type)}[]`
  const result = await useDb().execute<{ wait: number }>(sql`select take_limits(${list(limits.map(l => l.key), 'text')}, ${list(limits.map(l => l.max), 'int')}, ${list(limits.map(l => l.windowSeconds), 'int')}, ${attempt}::uuid) as wait`)
  const wait = Number(result.rows[0]?.wait ?? 0)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    const minutes = Math.ceil(wait / 60)
    throw createError({ statusCode: 429, statusMessage: 'Too many attempts', data: { retryAfter: wait, message: message(minutes) } })
  }
  return attempt
}

/** After a right password: forget this account's failures from this address, and give back this attempt's slots. */
export async function passwordSucceeded(email: string, ip: string, attempt: string) {
  const [account] = passwordLimits(email, ip)
  await useDb().delete(limitHits).where(sql`${limitHits.key} = ${account!.key} or ${limitHits.attempt} = ${attempt}`)
}

export const tooManyPasswords = (minutes: number) => `Too many attempts. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`

/** Count a password attempt for `email` from this request's address (429 when over either limit). */
export function limitPasswordCheck(event: H3Event, email: string) {
  return takeLimits(event, passwordLimits(email, clientAddress(event)), tooManyPasswords)
}

/** Count one public enquiry from this address: 429 past 5 an hour. */
export function limitPublicForm(event: H3Event) {
  return takeLimits(event, [{ key: `enquiry-form:${clientAddress(event)}`, max: PUBLIC_FORM_MAX, windowSeconds: PUBLIC_FORM_WINDOW_SECONDS }],
    minutes => `This enquiry has not been sent: too many have come from this connection in the last hour. What you typed is still here: please send it again in ${minutes >= 60 ? 'an hour' : `${minutes} minute${minutes === 1 ? '' : 's'}`}, or give us a ring.`)
}

// At most 5 failed sign-ins per account and address in 15 minutes; then 429 with Retry-After.
// Kept in PostgreSQL so it holds across restarts and several server processes.
import { and, eq, gt, lt, sql } from 'drizzle-orm'
import { signInFailures } from '../db/schema'

export const SIGN_IN_WINDOW_MS = 15 * 60_000
export const SIGN_IN_MAX_FAILURES = 5

/** Seconds until another attempt is allowed, or 0 when it is allowed now. */
export async function signInRetryAfter(email: string, ip: string): Promise<number> {
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MS)
  const rows = await useDb().select({ at: signInFailures.at }).from(signInFailures)
    .where(and(eq(signInFailures.email, email), eq(signInFailures.ip, ip), gt(signInFailures.at, since)))
    .orderBy(sql`${signInFailures.at} desc`).limit(SIGN_IN_MAX_FAILURES)
  if (rows.length < SIGN_IN_MAX_FAILURES) return 0
  // the oldest of the last five leaves the window first
  const oldest = rows[rows.length - 1]!.at.getTime()
  return Math.max(1, Math.ceil((oldest + SIGN_IN_WINDOW_MS - Date.now()) / 1000))
}

export async function recordSignInFailure(email: string, ip: string) {
  const db = useDb()
  await db.insert(signInFailures).values({ email, ip })
  // housekeeping: forget failures older than a day
  await db.delete(signInFailures).where(lt(signInFailures.at, new Date(Date.now() - 24 * 3600_000)))
}

export async function clearSignInFailures(email: string, ip: string) {
  await useDb().delete(signInFailures).where(and(eq(signInFailures.email, email), eq(signInFailures.ip, ip)))
}

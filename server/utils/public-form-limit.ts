import type { H3Event } from 'h3'
import { and, count, eq, gt, lt, min } from 'drizzle-orm'
import { publicFormHits } from '../db/schema'

export const PUBLIC_FORM_WINDOW_MS = 60 * 60_000
export const PUBLIC_FORM_MAX = 5

/** Count this submission against its address; throw 429 with Retry-After past 5 an hour. */
export async function limitPublicForm(event: H3Event, ip: string) {
  const db = useDb()
  const since = new Date(Date.now() - PUBLIC_FORM_WINDOW_MS)
  const [row] = await db.select({ n: count(), first: min(publicFormHits.at) }).from(publicFormHits)
    .where(and(eq(publicFormHits.ip, ip), gt(publicFormHits.at, since)))
  if ((row?.n ?? 0) >= PUBLIC_FORM_MAX) {
    const retryAfter = Math.max(1, Math.ceil(((row!.first?.getTime() ?? Date.now()) + PUBLIC_FORM_WINDOW_MS - Date.now()) / 1000))
    setResponseHeader(event, 'Retry-After', retryAfter)
    throw createError({ statusCode: 429, statusMessage: 'Too many enquiries', data: { message: 'Thank you, we have your enquiries. Please wait a while before sending another, or give us a ring.' } })
  }
  await db.insert(publicFormHits).values({ ip })
  await db.delete(publicFormHits).where(lt(publicFormHits.at, new Date(Date.now() - 24 * 3600_000)))
}

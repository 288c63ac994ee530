import { and, eq } from 'drizzle-orm'
import { calendarFeeds } from '../../db/schema'

/** Whether the person has a calendar feed (its URL is shown only when made: only its hash is kept). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  return withFirm(auth, async (f) => {
    const [feed] = await f.tx.select({ updatedAt: calendarFeeds.updatedAt }).from(calendarFeeds).where(f.where(calendarFeeds, and(eq(calendarFeeds.userId, auth.userId))))
    return { hasFeed: Boolean(feed), since: feed?.updatedAt ?? null }
  })
})

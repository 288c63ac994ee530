import { and, count, eq, isNull, ne, sql } from 'drizzle-orm'
import { calendarFeeds, firms, memberships, sessions } from '../db/schema'

/**
 * Lock the firm's row for a change to its people. Every change that could take away an owner
 * (a role change, a removal) takes this lock before it reads anything, so two owners demoting or
 * removing each other at once are run one after the other, and the second sees the first's change
 * when it counts the owners left.
 */
export async function lockTeam(f: FirmScope) {
  await f.tx.select({ id: firms.id }).from(firms).where(eq(firms.id, f.firmId)).for('update')
}

/** A firm keeps at least one owner: refuse (409) a change that would leave it with none. Call after lockTeam. */
export async function assertAnotherOwner(f: FirmScope, membershipId: string) {
  const [row] = await f.tx.select({ n: count() }).from(memberships)
    .where(f.where(memberships, eq(memberships.role, 'owner'), ne(memberships.id, membershipId)))
  if (!row || row.n === 0) {
    throw createError({ statusCode: 409, statusMessage: 'A firm needs an owner', data: { message: 'The firm needs at least one owner. Make someone else an owner first.' } })
  }
}

/**
 * Everything that lets a removed person in, gone in the removal's own transaction: their calendar
 * feeds for this firm are deleted and their sessions in this firm revoked. (The feed also needs a
 * live membership to answer, server/utils/calendar.ts, so a path that forgets this still leaks nothing.)
 */
export async function endAccessToFirm(f: FirmScope, userId: string) {
  await f.tx.delete(calendarFeeds).where(f.where(calendarFeeds, eq(calendarFeeds.userId, userId)))
  // sessions are the person's, not the firm's (keyed by user_id): those working in this firm now
  await f.tx.update(sessions).set({ revokedAt: sql`now()` })
    .where(and(eq(sessions.userId, userId), eq(sessions.currentFirmId, f.firmId), isNull(sessions.revokedAt)))
}

// Sessions and roles. The sealed cookie (nuxt-auth-utils) holds our session id and the person's
// (the session's key: sessions are keyed and spread by person, README "Scaling out"); every
// request looks the row up, with the person's membership of the current firm, so revoking a
// session, changing a password or removing a membership takes effect on the next request.
import type { H3Event } from 'h3'
import { and, eq, gt, inArray, isNull, sql } from 'drizzle-orm'
import { memberships, sessions, users } from '../db/schema'
import type { Permission, Role } from '#shared/utils/roles'

export interface SessionContext {
  sessionId: string
  userId: string
  name: string
  email: string
  firmId: string | null
}

export interface FirmContext extends SessionContext {
  firmId: string
  role: Role
  membershipId: string
}

declare module 'h3' {
  interface H3EventContext {
    auth?: FirmContext | null
  }
}

declare module '#auth-utils' {
  interface User { id: string }
  interface SecureSessionData { sid: string }
}

const UUID = /^[0-9a-f-]{36}$/i
const SESSION_DAYS = 14
export const SESSION_MAX_AGE_SECONDS = SESSION_DAYS * 24 * 60 * 60

function unauthorised(): never {
  throw createError({ statusCode: 401, statusMessage: 'Sign in to continue' })
}

/** Load the session row, the person and their membership of the current firm; null when any is gone. */
async function loadContext(event: H3Event): Promise<FirmContext | null> {
  const cookie = await getUserSession(event)
  const sid = cookie.secure?.sid
  const uid = cookie.user?.id
  if (!sid || !uid || !UUID.test(sid) || !UUID.test(uid)) return null
  return useDb().transaction(async (tx) => {
    const [row] = await tx.select({
      sessionId: sessions.id,
      userId: sessions.userId,
      firmId: sessions.currentFirmId,
      lastSeenAt: sessions.lastSeenAt,
      name: users.name,
      email: users.email,
    }).from(sessions)
      .innerJoin(users, eq(users.id, sessions.userId))
      .where(and(eq(sessions.userId, uid), eq(sessions.id, sid), isNull(sessions.revokedAt), gt(sessions.expiresAt, sql`now()`)))
    if (!row || !row.firmId) return null
    await scopeTransaction(tx, row.firmId, row.userId)
    const [m] = await tx.select({ id: memberships.id, role: memberships.role })
      .from(memberships)
      .where(and(eq(memberships.firmId, row.firmId), eq(memberships.userId, row.userId)))
    if (!m) {
      // the membership was removed: this session ends now
      await tx.update(sessions).set({ revokedAt: sql`now()` }).where(and(eq(sessions.userId, row.userId), eq(sessions.id, row.sessionId)))
      return null
    }
    if (Date.now() - row.lastSeenAt.getTime() > 5 * 60_000) {
      await tx.update(sessions).set({ lastSeenAt: sql`now()` }).where(and(eq(sessions.userId, row.userId), eq(sessions.id, row.sessionId)))
    }
    return { sessionId: row.sessionId, userId: row.userId, name: row.name, email: row.email, firmId: row.firmId, role: m.role, membershipId: m.id }
  })
}

/** The signed-in person in their current firm, or null. Cached on the event. */
export async function getAuth(event: H3Event): Promise<FirmContext | null> {
  if (event.context.auth !== undefined) return event.context.auth
  const ctx = await loadContext(event)
  if (!ctx) {
    const cookie = await getUserSession(event)
    if (cookie.secure?.sid || cookie.user) await clearUserSession(event)
  }
  event.context.auth = ctx
  return ctx
}

/** 401 unless signed in; 403 unless the role grants `permission`. Every protected route starts here. */
export async function requireAuth(event: H3Event, permission?: Permission): Promise<FirmContext> {
  const ctx = await getAuth(event)
  if (!ctx) unauthorised()
  if (permission && !can(ctx.role, permission)) {
    throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  }
  return ctx
}

/** Open a new session row and seal its id into the cookie (a fresh id at every sign-in). */
export async function startSession(event: H3Event, tx: Tx, userId: string, firmId: string) {
  const [row] = await tx.insert(sessions).values({
    userId,
    currentFirmId: firmId,
    expiresAt: new Date(Date.now() + SESSION_MAX_AGE_SECONDS * 1000),
    ip: getRequestIP(event) ?? null,
    userAgent: (getRequestHeader(event, 'user-agent') ?? '').slice(0, 300),
  }).returning({ id: sessions.id })
  // replace, not merge: nothing of an earlier session survives
  await replaceUserSession(event, { user: { id: userId }, secure: { sid: row!.id }, loggedInAt: Date.now() })
  event.context.auth = undefined
  return row!.id
}

export async function endSession(event: H3Event) {
  const cookie = await getUserSession(event)
  const sid = cookie.secure?.sid
  const uid = cookie.user?.id
  if (sid && uid && UUID.test(sid) && UUID.test(uid)) {
    await useDb().update(sessions).set({ revokedAt: sql`now()` }).where(and(eq(sessions.userId, uid), eq(sessions.id, sid)))
  }
  await clearUserSession(event)
  event.context.auth = null
}

/** The firm a person lands in at sign-in: the one they used last, else their oldest membership. */
export async function defaultFirmFor(tx: Tx, userId: string): Promise<string | null> {
  await scopeTransaction(tx, null, userId)
  // two queries, not a join: sessions are spread by person and memberships by firm (README "Scaling out")
  const mine = await tx.select({ firmId: memberships.firmId }).from(memberships)
    .where(eq(memberships.userId, userId)).orderBy(memberships.createdAt)
  if (!mine.length) return null
  const [last] = await tx.select({ firmId: sessions.currentFirmId }).from(sessions)
    .where(and(eq(sessions.userId, userId), inArray(sessions.currentFirmId, mine.map(m => m.firmId))))
    .orderBy(sql`${sessions.createdAt} desc`).limit(1)
  return last?.firmId ?? mine[0]!.firmId
}

// Sessions and roles. The sealed cookie (nuxt-auth-utils) holds our session id and the person's
// (the session's key: sessions are keyed and spread by person, README "Scaling out"); every
// request looks the row up, with the person's membership of the current firm, so revoking a
// session, changing a password or removing a membership takes effect on the next request.
import type { H3Event, H3EventContext } from 'h3'
import { and, eq, inArray, sql } from 'drizzle-orm'
import { memberships, sessions } from '../db/schema'
import { beginWith, holdRequestTx, isUuid, RequestTx, simpleQuery } from './db'
import { firmLetters } from '#shared/utils/references'
import type { Permission, Role } from '#shared/utils/roles'

/** The cookie nuxt-auth-utils seals the session id into (nuxt.config.ts runtimeConfig.session.name). */
const SESSION_COOKIE = 'setwell-session'

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
  /** The firm's letters for references, read with the session (firm-letters.ts). */
  firmLetters?: string
}

declare module 'h3' {
  interface H3EventContext {
    auth?: FirmContext | null
    /** While a page is rendered on the server: its API calls' session check, done once (see sharedAuth). */
    pageAuth?: { sealed: string, auth: Promise<FirmContext | null> }
  }
}

declare module '#auth-utils' {
  interface User { id: string }
  interface SecureSessionData { sid: string }
}

const SESSION_DAYS = 14
export const SESSION_MAX_AGE_SECONDS = SESSION_DAYS * 24 * 60 * 60
/** How stale sessions.last_seen_at may get before a request brings it up to date. */
const LAST_SEEN_EVERY_MS = 5 * 60_000

function unauthorised(): never {
  throw createError({ statusCode: 401, statusMessage: 'Sign in to continue' })
}

interface SessionRow {
  session_id: string
  user_id: string
  firm_id: string | null
  last_seen_at: Date
  name: string
  email: string
  membership_id: string | null
  role: Role | null
  reference_letters: string | null
  trading_name: string | null
}

/**
 * The session check as two statements sent together (a simple query, one round trip): the first
 * scopes the transaction to the session's firm and person (so row-level security shows their
 * membership), the second reads the session, the person, that membership and the firm's letters
 * (for references, shared/utils/references.ts). Both ids are uuids (checked by the caller):
 * nothing else is written into the text. On a distributed engine (README "Scaling out") sessions
 * and memberships live on different nodes, and this one statement would become two.
 */
function sessionCheckText({ sid, uid }: SessionKey) {
  const live = `s.user_id = '${uid}' and s.id = '${sid}' and s.revoked_at is null and s.expires_at > now()`
  return `select set_config('app.firm_id', coalesce(s.current_firm_id::text, ''), true), set_config('app.user_id', s.user_id::text, true) from sessions s where ${live};
select s.id as session_id, s.user_id, s.current_firm_id as firm_id, s.last_seen_at, u.name, u.email, m.id as membership_id, m.role, f.reference_letters, f.trading_name
  from sessions s join users u on u.id = s.user_id left join memberships m on m.firm_id = s.current_firm_id and m.user_id = s.user_id
  left join firms f on f.id = m.firm_id
  where ${live}`
}

/**
 * Cookies already unsealed, by their sealed text: unsealing (key derivation, a MAC and a
 * decryption in WebCrypto) cost more than the rest of a list's work (npm run bench). The text
 * carries its own MAC, so the same text always holds the same session id; the session row is
 * still checked on every request. Kept ten minutes, at most 10,000.
 */
const unsealed = new Map<string, SessionKey & { until: number }>()
const UNSEALED_MS = 10 * 60_000
const UNSEALED_MAX = 10_000

/** A session's key: its id and its person's (sessions are keyed and spread by person, README "Scaling out"). */
interface SessionKey { sid: string, uid: string }

/** The session's key sealed in the cookie, or null. */
async function sessionKeyOf(event: H3Event): Promise<SessionKey | null> {
  // h3 reads a session header before the cookie: with one, do as it does
  const sealed = getRequestHeader(event, `x-${SESSION_COOKIE}-session`) === undefined ? getCookie(event, SESSION_COOKIE) : undefined
  const known = sealed ? unsealed.get(sealed) : undefined
  if (known && known.until > Date.now()) return { sid: known.sid, uid: known.uid }
  const cookie = await getUserSession(event)
  const sid = cookie.secure?.sid
  const uid = cookie.user?.id
  if (!isUuid(sid) || !isUuid(uid)) return null
  if (sealed) {
    if (unsealed.size >= UNSEALED_MAX) unsealed.delete(unsealed.keys().next().value!)
    unsealed.set(sealed, { sid, uid, until: Date.now() + UNSEALED_MS })
  }
  return { sid, uid }
}

/**
 * Load the session row, the person and their membership of the current firm; null when any is
 * gone. A GET (or HEAD) keeps the transaction of the check open, scoped to the firm, for the
 * route's `withFirm` to carry on (RequestTx in server/utils/db.ts): one transaction a request.
 */
async function loadContext(event: H3Event): Promise<FirmContext | null> {
  const key = await sessionKeyOf(event)
  if (!key) return null
  const text = sessionCheckText(key)
  const hold = event.method === 'GET' || event.method === 'HEAD'
  let row: SessionRow | undefined
  let held: RequestTx | undefined
  if (hold) {
    const { client, results } = await beginWith(text)
    row = results[2]?.rows[0] as SessionRow | undefined
    if (row?.firm_id && row.membership_id) held = new RequestTx(client, row.firm_id, row.user_id)
    else await client.query('rollback').then(() => client.release(), err => client.release(err as Error))
  }
  else {
    row = (await simpleQuery(text))[1]?.rows[0] as SessionRow | undefined
  }
  if (!row || !row.firm_id) return null
  if (!row.membership_id || !row.role) {
    // the membership was removed: this session ends now
    await useDb().update(sessions).set({ revokedAt: sql`now()` }).where(and(eq(sessions.userId, row.user_id), eq(sessions.id, row.session_id)))
    return null
  }
  if (Date.now() - row.last_seen_at.getTime() > LAST_SEEN_EVERY_MS) {
    // its own statement, not waited for: a row lock on the session held to the end of the
    // request's transaction would make the person's other requests wait behind this one
    useDb().update(sessions).set({ lastSeenAt: sql`now()` }).where(and(eq(sessions.userId, row.user_id), eq(sessions.id, row.session_id)))
      .catch(err => console.error('[auth] last seen', (err as Error).message))
  }
  const ctx: FirmContext = {
    sessionId: row.session_id, userId: row.user_id, name: row.name, email: row.email, firmId: row.firm_id, role: row.role, membershipId: row.membership_id,
    firmLetters: row.reference_letters || firmLetters(row.trading_name ?? ''),
  }
  if (held) holdRequestTx(ctx, held)
  return ctx
}

/**
 * A page rendered on the server calls API routes in the same process (Nuxt's useFetch); each call
 * is a request of its own, with the page's cookie, whose context holds the page's context. The
 * first call's session check is kept there for the others: one check per page, not per call.
 * Keyed by the sealed cookie itself, so a call with any other cookie checks its own.
 */
function pageContextOf(event: H3Event): H3EventContext | undefined {
  const page = (event.node?.req as { __unenv__?: unknown } | undefined)?.__unenv__
  return page && typeof page === 'object' && page !== event.context ? page as H3EventContext : undefined
}

/** The signed-in person in their current firm, or null. Cached on the event (and for the page being rendered). */
export async function getAuth(event: H3Event): Promise<FirmContext | null> {
  if (event.context.auth !== undefined) return event.context.auth
  const page = pageContextOf(event)
  const sealed = page ? getCookie(event, SESSION_COOKIE) : undefined
  let ctx: FirmContext | null
  if (page && sealed && page.pageAuth?.sealed === sealed) {
    // a copy: the held transaction belongs to the call that made the check
    const shared = await page.pageAuth.auth
    ctx = shared ? { ...shared } : null
  }
  else {
    const loading = loadContext(event)
    if (page && sealed) {
      const entry = { sealed, auth: loading.then(c => (c ? { ...c } : null)) }
      page.pageAuth = entry
      entry.auth.catch(() => {
        if (page.pageAuth === entry) page.pageAuth = undefined
      })
    }
    ctx = await loading
  }
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

/** Forget a session check kept for this request and the page it belongs to (sign-in, sign-out, another firm). */
export function forgetAuth(event: H3Event) {
  event.context.auth = undefined
  const page = pageContextOf(event)
  if (page) page.pageAuth = undefined
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
  forgetAuth(event)
  return row!.id
}

export async function endSession(event: H3Event) {
  const key = await sessionKeyOf(event)
  if (key) await useDb().update(sessions).set({ revokedAt: sql`now()` }).where(and(eq(sessions.userId, key.uid), eq(sessions.id, key.sid)))
  await clearUserSession(event)
  forgetAuth(event)
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

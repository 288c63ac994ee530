import { asc, eq, gt, isNull } from 'drizzle-orm'
import { invitations, memberships, users } from '../../db/schema'

/** The firm's people and the invitations still open. Owner only. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'team:manage')
  return withFirm(auth, async (f) => {
    const people = await f.tx.select({
      id: memberships.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      joinedAt: memberships.createdAt,
    }).from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(f.where(memberships))
      .orderBy(asc(users.name))
    const open = await f.tx.select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    }).from(invitations)
      .where(f.where(invitations, isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
      .orderBy(asc(invitations.createdAt))
    return { people: people.map(p => ({ ...p, you: p.userId === auth.userId })), invitations: open }
  })
})

import { desc, eq } from 'drizzle-orm'
import { auditLog, users } from '../db/schema'
import { auditQuery } from '#shared/schemas/firm'

/** Who changed what in this firm, newest first. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'audit:read')
  const { limit } = await readQueryWith(event, auditQuery)
  return withFirm(auth, f => f.tx.select({
    id: auditLog.id,
    at: auditLog.at,
    action: auditLog.action,
    entity: auditLog.entity,
    entityId: auditLog.entityId,
    detail: auditLog.detail,
    actor: users.name,
  }).from(auditLog).leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(f.where(auditLog)).orderBy(desc(auditLog.at)).limit(limit))
})

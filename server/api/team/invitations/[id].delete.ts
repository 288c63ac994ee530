import { eq, isNull, sql } from 'drizzle-orm'
import { invitations } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Withdraw an invitation that has not been accepted. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'team:manage')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, async (f) => {
    const rows = await f.tx.update(invitations).set({ revokedAt: sql`now()` })
      .where(f.where(invitations, eq(invitations.id, id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .returning({ id: invitations.id })
    if (!rows.length) notFound()
    await f.audit('invitation.withdrawn', 'invitation', id)
  })
  setResponseStatus(event, 204)
  return null
})

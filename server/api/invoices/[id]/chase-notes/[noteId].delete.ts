import { eq } from 'drizzle-orm'
import { chaseEntryParam } from '#shared/schemas/chase'
import { chaseRemoval, CHASE_REMOVAL_WORDS } from '#shared/utils/chase'
import { chaseNotes } from '../../../../db/schema'

/**
 * Take an entry out of an invoice's chase log: the person who wrote it on the London day they wrote
 * it, or the owner any time; a reminder that was sent stays (409). The entry is read FOR UPDATE, so
 * removals at once run one after another: the first removes it and writes the audit log, the rest
 * find nothing (404). What was removed is kept in the audit entry.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id, noteId } = await readParamsWith(event, chaseEntryParam)
  await withFirm(auth, async (f) => {
    const [entry] = await f.tx.select().from(chaseNotes).where(f.where(chaseNotes, eq(chaseNotes.id, noteId), eq(chaseNotes.invoiceId, id))).for('update')
    if (!entry) notFound()
    const may = chaseRemoval(auth, entry)
    if (may === 'reminder') throw createError({ statusCode: 409, statusMessage: 'Reminder sent', data: { message: CHASE_REMOVAL_WORDS[may] } })
    if (may !== 'ok') throw createError({ statusCode: 403, statusMessage: 'Not yours to remove', data: { message: CHASE_REMOVAL_WORDS[may] } })
    await f.tx.delete(chaseNotes).where(f.where(chaseNotes, eq(chaseNotes.id, noteId)))
    const { firmId: _f, reminderKey: _k, sentAt: _s, ...removed } = entry
    await f.audit('invoice.chase-removed', 'chase_note', noteId, { invoiceId: id, removed })
  })
  setResponseStatus(event, 204)
  return null
})

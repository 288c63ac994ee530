import { idParam } from '#shared/schemas/common'
import { chaseEntrySchema } from '#shared/schemas/chase'
import { formatPence } from '#shared/utils/money'
import { chaseNotes, invoices } from '../../../db/schema'

/** Add to an invoice's chase log: a call, a message or a letter, how it went, and a promise to pay when there was one. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, chaseEntrySchema)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    if (!inv.issuedOn || inv.kind === 'credit-note') throw createError({ statusCode: 409, statusMessage: 'Not chased', data: { message: 'Only issued invoices are chased.' } })
    const owed = inv.amountDuePence - inv.settledPence
    if (input.promisedPence !== null && input.promisedPence > owed) {
      throw fieldError({ promisedPence: owed > 0 ? `That is more than the ${formatPence(owed)} still to pay.` : 'Nothing is still to pay on this invoice.' })
    }
    const [note] = await f.tx.insert(chaseNotes).values(f.values({ invoiceId: id, ...input, byUserId: f.userId })).returning({ id: chaseNotes.id })
    await f.audit('invoice.chased', 'invoice', id, { entryId: note!.id, kind: input.kind, outcome: input.outcome, promisedPence: input.promisedPence, promisedOn: input.promisedOn })
    setResponseStatus(event, 201)
    return invoiceDetail(f, id)
  })
})

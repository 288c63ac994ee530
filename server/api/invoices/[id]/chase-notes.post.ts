import { idParam } from '#shared/schemas/common'
import { chaseNoteSchema } from '#shared/schemas/invoice'
import { chaseNotes, invoices } from '../../../db/schema'

/** Add to an invoice's chase log: a call, a message, or a promise to pay by a date. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, chaseNoteSchema)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id)
    if (!inv.issuedOn || inv.kind === 'credit-note') throw createError({ statusCode: 409, statusMessage: 'Not chased', data: { message: 'Only issued invoices are chased.' } })
    await f.tx.insert(chaseNotes).values(f.values({ invoiceId: id, ...input, byUserId: f.userId }))
    await f.audit('invoice.chased', 'invoice', id, { kind: input.kind })
    setResponseStatus(event, 201)
    return invoiceDetail(f, id)
  })
})

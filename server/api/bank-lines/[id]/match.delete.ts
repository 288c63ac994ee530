import { idParam } from '#shared/schemas/common'

/** Undo a line's match: the payments made from it come off their invoices, and the line is open again. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const { purchaseKept } = await withFirm(auth, f => undoLine(f, id))
  return { id, state: 'open', purchaseKept }
})

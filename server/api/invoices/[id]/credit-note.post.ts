import { idParam } from '#shared/schemas/common'
import { invoices } from '../../../db/schema'

/** A draft credit note against an issued invoice, with its lines to start from (the whole invoice); change them and issue it. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    if (!inv.issuedOn || inv.kind === 'credit-note') throw createError({ statusCode: 409, statusMessage: 'Not creditable', data: { message: inv.kind === 'credit-note' ? 'A credit note is not credited: issue an invoice instead.' : 'A draft is changed or deleted, not credited.' } })
    const lines = await linesOf(f, id)
    const [note] = await f.tx.insert(invoices).values(f.values({
      kind: 'credit-note' as const, customerId: inv.customerId, siteId: inv.siteId, jobId: inv.jobId, creditsInvoiceId: inv.id,
      vat: inv.vat, vatReason: inv.vatReason, cisRatePercent: inv.cisRatePercent, notes: `Credit against ${inv.reference}.`, createdBy: f.userId,
    })).returning()
    await saveInvoiceLines(f, note!.id, lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, extraWork }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, extraWork })))
    await refreshInvoiceTotals(f, note!.id)
    await f.audit('invoice.credit-drafted', 'invoice', note!.id, { credits: inv.id })
    setResponseStatus(event, 201)
    return invoiceDetail(f, note!.id)
  })
})

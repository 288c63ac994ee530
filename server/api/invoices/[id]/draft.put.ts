import { eq, sql } from 'drizzle-orm'
import { invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { invoiceDraftSchema } from '#shared/schemas/invoice'

/** Change a draft: its lines, VAT treatment (with the reason when changed) and CIS rate. An issued invoice: 409. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, invoiceDraftSchema)
  return withFirm(auth, async (f) => {
    const inv = await findInvoice(f, id, true)
    if (inv.issuedOn) throw createError({ statusCode: 409, statusMessage: 'Issued', data: { message: 'This invoice has been issued; it stays as it is. Correct it with a credit note.' } })
    if (input.vat !== inv.vat && !input.vatReason) throw fieldError({ vatReason: 'Say why the VAT treatment is changed (it is kept with the invoice).' })
    const { lines, ...rest } = input
    await f.tx.update(invoices).set({ ...rest, updatedAt: sql`now()` }).where(f.where(invoices, eq(invoices.id, id)))
    await saveInvoiceLines(f, id, lines)
    await refreshInvoiceTotals(f, id)
    await f.audit('invoice.draft-saved', 'invoice', id, { vat: input.vat })
    return invoiceDetail(f, id)
  })
})

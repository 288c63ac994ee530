import { eq, sql } from 'drizzle-orm'
import { invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { invoiceDraftSchema } from '#shared/schemas/invoice'

const VAT_TREATMENT_WORDS = { 'standard': 'VAT at the usual rates', 'reverse-charge': 'the reverse charge', 'not-registered': 'no VAT (not registered)' } as const

/** Change a draft: its lines, VAT treatment (with a reason whenever it is not the suggested one) and CIS rate. An issued invoice: 409. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, invoiceDraftSchema)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    if (inv.issuedOn) throw createError({ statusCode: 409, statusMessage: 'Issued', data: { message: 'This invoice has been issued; it stays as it is. Correct it with a credit note.' } })
    // any treatment other than the one suggested for this firm and customer needs its reason, every save
    const suggested = await suggestedVatFor(f, inv.customerId)
    if (input.vat !== suggested && !input.vatReason) throw fieldError({ vatReason: `The suggested VAT treatment is ${VAT_TREATMENT_WORDS[suggested]}: say why this invoice differs (it is kept with the invoice).` })
    const { lines, ...rest } = input
    await f.tx.update(invoices).set({ ...rest, updatedAt: sql`now()` }).where(f.where(invoices, eq(invoices.id, id)))
    await saveInvoiceLines(f, id, lines)
    await refreshInvoiceTotals(f, id)
    // a job's invoices never claim more than its price but for lines marked as extra work
    if (inv.jobId && inv.kind !== 'credit-note') await assertWithinJobPrice(f, inv.jobId)
    await f.audit('invoice.draft-saved', 'invoice', id, { vat: input.vat })
    return invoiceDetail(f, id)
  })
})

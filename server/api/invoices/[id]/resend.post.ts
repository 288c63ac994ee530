import { eq, sql } from 'drizzle-orm'
import { customers, firms, invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * Send an issued invoice to the customer again, with a new link (only a link's hash is kept, so
 * the old link cannot be sent again; it stops working). The e-mail goes before the commit: when
 * it fails, nothing changes and the old link still works (502). Drafts and credit notes: 409.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    if (!inv.issuedOn || inv.kind === 'credit-note') {
      throw createError({ statusCode: 409, statusMessage: 'Not sent', data: { message: inv.issuedOn ? 'A credit note has no payment link to send.' : 'This invoice is a draft: issue it to send it.' } })
    }
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    if (!customer?.email) throw fieldError({ email: `${customer?.name ?? 'The customer'} has no e-mail address: add one on their page first.` })
    const [bank] = await f.tx.select({ takesTransfer: firms.takesTransfer, bankAccountName: firms.bankAccountName, bankSortCode: firms.bankSortCode, bankAccountNumber: firms.bankAccountNumber }).from(firms).where(eq(firms.id, f.firmId))
    const firm = await firmContact(f)
    const { token, hash } = newLinkToken(f.firmId)
    await f.tx.update(invoices).set({ tokenHash: hash, updatedAt: sql`now()` }).where(f.where(invoices, eq(invoices.id, id)))
    await f.audit('invoice.resent', 'invoice', id, { to: customer.email })
    try {
      await sendMail(invoiceMail({ customer, firm, bank, token, invoice: { ...inv, totals: inv.totals }, again: true }))
    }
    catch (err) {
      console.error('[mail] invoice not sent again:', (err as Error).message)
      throw createError({ statusCode: 502, statusMessage: 'E-mail not sent', data: { message: 'The e-mail did not go, so nothing changed (the link sent before still works). Try again in a few minutes.' } })
    }
    return invoiceDetail(f, id)
  })
})

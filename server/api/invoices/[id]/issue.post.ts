import { eq } from 'drizzle-orm'
import { customers, firms, invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * Issue a draft: it takes the firm's next number (no gaps, no duplicates), its date and due date,
 * and is frozen; the customer is e-mailed a link to view it, download the PDF and pay by card.
 * The e-mail goes after the commit: when it fails the invoice stays issued, and the answer says
 * so in `warning` (the page offers "Send again", POST /api/invoices/:id/resend).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const issued = await withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id)
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    if (inv.kind !== 'credit-note' && !customer!.email) throw fieldError({ email: `${customer!.name} has no e-mail address: add one on their page first.` })
    const { token } = await issueInvoice(f, id)
    const detail = await invoiceDetail(f, id)
    const [bank] = await f.tx.select({ takesTransfer: firms.takesTransfer, bankAccountName: firms.bankAccountName, bankSortCode: firms.bankSortCode, bankAccountNumber: firms.bankAccountNumber }).from(firms).where(eq(firms.id, f.firmId))
    return { detail, customer: customer!, token, firm: await firmContact(f), bank }
  })
  const d = issued.detail
  let warning: string | null = null
  if (d.kind !== 'credit-note') {
    try {
      await sendMail(invoiceMail({ customer: issued.customer, firm: issued.firm, bank: issued.bank, token: issued.token, invoice: { ...d, totals: d.totals as Record<string, number> } }))
    }
    catch (err) {
      console.error('[mail] invoice not sent:', (err as Error).message)
      warning = INVOICE_MAIL_FAILED
    }
  }
  return { ...d, warning }
})

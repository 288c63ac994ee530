import { eq } from 'drizzle-orm'
import { customers, firms } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * Issue a draft: it takes the firm's next number (no gaps, no duplicates), its date and due date,
 * and is frozen; the customer is e-mailed a link to view it, download the PDF and pay by card.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const issued = await withFirm(auth, async (f) => {
    const inv = await findInvoice(f, id)
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    if (inv.kind !== 'credit-note' && !customer!.email) throw fieldError({ email: `${customer!.name} has no e-mail address: add one on their page first.` })
    const { token } = await issueInvoice(f, id)
    const detail = await invoiceDetail(f, id)
    const [firm] = await f.tx.select({ tradingName: firms.tradingName }).from(firms).where(eq(firms.id, f.firmId))
    return { detail, customer: customer!, token, firmName: firm!.tradingName }
  })
  const d = issued.detail
  if (d.kind !== 'credit-note') {
    const link = `${useRuntimeConfig().appUrl.replace(/\/$/, '')}/i/${issued.token}`
    const t = d.totals as Record<string, number>
    await sendMail({
      to: issued.customer.email,
      subject: `Invoice ${d.reference} from ${issued.firmName}`,
      text: [
        `Hello ${issued.customer.contactName || issued.customer.name},`,
        '',
        `${issued.firmName} has sent you invoice ${d.reference} for ${formatPence(d.amountDuePence)}${t.cisDeductionPence ? ` (after the CIS deduction of ${formatPence(t.cisDeductionPence)})` : ''}${t.reverseChargeVatPence ? ' (reverse charge: you account for the VAT)' : ''}, due by ${d.dueOn}.`,
        'View it, download the PDF and pay by card here:',
        link,
        '',
        'The link is for you only; please do not forward it.',
      ].join('\n'),
    })
  }
  return d
})

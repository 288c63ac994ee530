// The e-mail that takes an invoice to the customer, with the link to view, download and pay it.
// Sent when the invoice is issued, and again (with a new link) from "Send again".
import type { customers } from '../db/schema'

export interface InvoiceMailInput {
  customer: Pick<typeof customers.$inferSelect, 'email' | 'name' | 'contactName'>
  firmName: string
  token: string
  invoice: { reference: string | null, amountDuePence: number, dueOn: string | null, totals: Record<string, number> }
  again?: boolean
}

export function invoiceMail({ customer, firmName, token, invoice: d, again = false }: InvoiceMailInput) {
  const link = `${useRuntimeConfig().appUrl.replace(/\/$/, '')}/i/${token}`
  const t = d.totals
  return {
    to: customer.email,
    subject: `Invoice ${d.reference} from ${firmName}`,
    text: [
      `Hello ${customer.contactName || customer.name},`,
      '',
      `${firmName} has ${again ? 'sent you again' : 'sent you'} invoice ${d.reference} for ${formatPence(d.amountDuePence)}${t.cisDeductionPence ? ` (after the CIS deduction of ${formatPence(t.cisDeductionPence)})` : ''}${t.reverseChargeVatPence ? ' (reverse charge: you account for the VAT)' : ''}, due by ${d.dueOn}.`,
      'View it, download the PDF and pay by card here:',
      link,
      '',
      again ? 'This link replaces the one sent before, which no longer works. It is for you only; please do not forward it.' : 'The link is for you only; please do not forward it.',
    ].join('\n'),
  }
}

/** What the invoice page shows when the invoice was issued but its e-mail did not go. */
export const INVOICE_MAIL_FAILED = 'Issued, but the e-mail did not go: check the customer\'s address and use "Send again".'

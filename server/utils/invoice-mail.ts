// The e-mail that takes an invoice to the customer, with the link to view, download and pay it.
// Sent when the invoice is issued, and again (with a new link) from "Send again". From the firm
// (server/utils/mail.ts firmMail): its name, its Reply-To, its phone; dates in words.
import type { customers } from '../db/schema'
import { hasBankAccount, bankAccountInline, type BankAccount } from '#shared/utils/bank-details'
import { fullDate } from '#shared/utils/dates'
import { formatPence } from '#shared/utils/money'
import { appLink, firmMail, type FirmContact } from './mail'

/** The firm's way to be paid by transfer, as its invoices offer it. */
export type FirmPayment = Partial<BankAccount> & { takesTransfer?: boolean }

/** "Or pay by bank transfer to …, quoting BP-12." when the firm takes transfers and its account is complete; else ''. */
export function transferSentence(bank: FirmPayment | null | undefined, reference: string | null): string {
  if (!bank?.takesTransfer || !hasBankAccount(bank)) return ''
  return `To pay by bank transfer: ${bankAccountInline(bank)}, quoting ${reference ?? 'the invoice number'}.`
}

export interface InvoiceMailInput {
  customer: Pick<typeof customers.$inferSelect, 'email' | 'name' | 'contactName'>
  firm: FirmContact
  bank?: FirmPayment | null
  token: string
  invoice: { reference: string | null, amountDuePence: number, dueOn: string | null, totals: Record<string, number> }
  again?: boolean
}

export function invoiceMail({ customer, firm, bank, token, invoice: d, again = false }: InvoiceMailInput) {
  const t = d.totals
  return firmMail(firm, {
    to: customer.email,
    subject: `Invoice ${d.reference} from ${firm.tradingName}`,
    text: [
      `Hello ${customer.contactName || customer.name},`,
      '',
      `${firm.tradingName} has ${again ? 'sent you again' : 'sent you'} invoice ${d.reference} for ${formatPence(d.amountDuePence)}${t.cisDeductionPence ? ` (after the CIS deduction of ${formatPence(t.cisDeductionPence)})` : ''}${t.reverseChargeVatPence ? ' (reverse charge: you account for the VAT)' : ''}${d.dueOn ? `, due by ${fullDate(d.dueOn)}` : ''}.`,
    ].join('\n'),
    links: [{ label: 'View the invoice, download the PDF and pay by card here', url: appLink(`/i/${token}`) }],
    after: [
      transferSentence(bank, d.reference),
      again ? 'This link replaces the one sent before, which no longer works. It is for you only; please do not forward it.' : 'The link is for you only; please do not forward it.',
    ].filter(Boolean).join('\n\n'),
  })
}

/** What the invoice page shows when the invoice was issued but its e-mail did not go. */
export const INVOICE_MAIL_FAILED = 'Issued, but the e-mail did not go: check the customer\'s address and use "Send again".'

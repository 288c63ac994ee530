// The PDF of an invoice or credit note, with the fields a VAT invoice carries (gov.uk "VAT record
// keeping: VAT invoices", DOMAIN.md): its unique number, the firm's name, address and VAT number,
// the date (the tax point), the customer's name and address, each line's description, quantity,
// unit price and VAT rate, the total without VAT and the VAT; the reverse-charge wording where it
// applies; and the CIS figures (gross, deduction, amount payable) where they apply. The lines are
// grouped and merged as the customer reads them (shared/utils/line-groups.ts); the firm's bank
// account is printed when it takes transfers; the invoice's own status is the firm's business and
// is not printed (a paid or overdue stamp is).
import type { H3Event } from 'h3'
import { formatPence } from '#shared/utils/money'
import { INVOICE_KIND_LABELS } from '#shared/utils/invoices'
import { AMBER, GREEN, formatUkDate, makePdf, sendPdf } from '../pdf/document'
import type { publicInvoiceView } from './public-invoice'

export type InvoicePdfView = Awaited<ReturnType<typeof publicInvoiceView>> & { credits?: string | null }

export async function renderInvoicePdf(view: InvoicePdfView): Promise<Buffer> {
  const label = INVOICE_KIND_LABELS[view.kind]
  const title = view.reference ? `${view.kind === 'credit-note' ? 'Credit note' : 'Invoice'} ${view.reference}` : `${label} (draft)`
  return makePdf({ title, subject: `${label} for ${view.customer.name}` }, (pdf) => {
    const firm = view.firm
    const stamp = !view.issuedOn
      ? { text: 'Draft: not issued', color: AMBER }
      : view.status === 'paid'
        ? { text: 'Paid, thank you', color: GREEN }
        : view.status === 'overdue' ? { text: `Overdue: ${formatPence(view.outstandingPence)} to pay`, color: AMBER } : null
    pdf.firmHeading(firm, title, [
      view.kind !== 'credit-note' && view.kind !== 'blank' ? label : '',
      view.issuedOn ? `Date and tax point ${formatUkDate(view.issuedOn)}` : '',
      view.dueOn ? `Due by ${formatUkDate(view.dueOn)}` : '',
      view.credits ? `Against invoice ${view.credits}` : '',
    ], stamp)
    pdf.party(view.kind === 'credit-note' ? 'Credit to' : 'Invoice to', view.customer.name, [
      [view.customer.billingLine1, view.customer.billingTown, view.customer.billingPostcode].filter(Boolean).join(', '),
      view.site ? `Site: ${[view.site.line1, view.site.town, view.site.postcode].filter(Boolean).join(', ')}` : '',
    ])
    pdf.heading(view.kind === 'credit-note' ? 'Credited' : 'The work')
    pdf.linesTable(view.groups, view.vat !== 'not-registered')
    pdf.totals({ vat: view.vat, cisRatePercent: view.cisRatePercent, totals: view.totals as Record<string, number> }, firm.tradingName, { totalLabel: view.kind === 'credit-note' ? 'Total credited' : 'Total' })
    if (view.kind !== 'credit-note' && view.issuedOn) {
      pdf.heading('Paying')
      if (view.paidPence > 0) pdf.para(`Received so far ${formatPence(view.paidPence)}; still to pay ${formatPence(view.outstandingPence)}.`)
      else pdf.para(`Amount to pay ${formatPence(view.amountDuePence)}${view.dueOn ? ` by ${formatUkDate(view.dueOn)}` : ''}.`)
      if (view.bank) {
        pdf.para(`Pay by card from the link in the e-mail we sent, or by bank transfer quoting ${view.reference}:`)
        for (const l of view.bank) pdf.para(l)
      }
      else pdf.para('Pay by card from the link in the e-mail we sent.')
    }
    if (view.notes) {
      pdf.heading('Notes')
      pdf.para(view.notes)
    }
    pdf.footer(title, firm.tradingName)
  })
}

export async function sendInvoicePdf(event: H3Event, view: InvoicePdfView) {
  return sendPdf(event, await renderInvoicePdf(view), view.reference && /^[\w/-]+$/.test(view.reference) ? view.reference.replace(/\//g, '-') : 'invoice')
}

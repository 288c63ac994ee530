// The customer's link to an invoice (/i/<token>): like the quote's, the token's hash makes that
// one invoice visible under RLS (app.invoice_token_hash), then the transaction is scoped to its firm.
import { and, eq } from 'drizzle-orm'
import { firms, invoices } from '../db/schema'
import { bankAccountLines, hasBankAccount } from '#shared/utils/bank-details'
import { groupLines } from '#shared/utils/line-groups'

export function openInvoiceByToken(tx: Tx, token: string) {
  return withSecretLink(tx, {
    setting: 'app.invoice_token_hash',
    secret: token,
    find: (tx, tokenHash, firmId) => tx.select({ firmId: invoices.firmId, id: invoices.id }).from(invoices).where(and(eq(invoices.tokenHash, tokenHash), inLinkFirm(invoices.firmId, firmId))),
    open: async (f, found) => ({ f, invoiceId: found.id }),
    gone: () => { throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This invoice link is not right. Ask the firm to send it again.' } }) },
  })
}

/** What the customer sees: their invoice, what is still owed, and how to pay. */
export async function publicInvoiceView(f: FirmScope, invoiceId: string) {
  const d = await invoiceDetail(f, invoiceId)
  // who it is from and to as issued (frozen); a draft, or one issued before they were kept: as now
  const parties = d.parties ?? await partiesNow(f, d)
  // how to reach and pay the firm stays current: these are not part of the VAT invoice
  const [contact] = await f.tx.select({ email: firms.email, phone: firms.phone, takesTransfer: firms.takesTransfer, bankAccountName: firms.bankAccountName, bankSortCode: firms.bankSortCode, bankAccountNumber: firms.bankAccountNumber })
    .from(firms).where(eq(firms.id, f.firmId))
  const { takesTransfer, bankAccountName, bankSortCode, bankAccountNumber, ...reach } = contact!
  const account = { bankAccountName, bankSortCode, bankAccountNumber }
  const { firm, customer, site } = parties
  return {
    reference: d.reference, kind: d.kind, issuedOn: d.issuedOn, dueOn: d.dueOn, vat: d.vat, cisRatePercent: d.cisRatePercent, notes: d.notes,
    totals: d.totals, amountDuePence: d.amountDuePence, status: d.status, paidPence: d.paidPence, outstandingPence: d.outstandingPence,
    firm: { tradingName: firm.tradingName, addressLine1: firm.addressLine1, town: firm.town, postcode: firm.postcode, vatNumber: firm.vatNumber, vatRegistered: firm.vatRegistered, ...reach },
    /** The firm's account, line by line, when it takes payment by transfer (a credit note pays nothing). */
    bank: takesTransfer && d.kind !== 'credit-note' && hasBankAccount(account) ? bankAccountLines(account) : null,
    customer: { name: customer.name, billingLine1: customer.billingLine1, billingTown: customer.billingTown, billingPostcode: customer.billingPostcode },
    site, credits: d.credits?.reference ?? null,
    lines: d.lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent })),
    /** The lines as the customer reads them: grouped by room and kind of work, identical lines merged. */
    groups: groupLines(d.lines),
  }
}

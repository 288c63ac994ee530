// The customer's link to an invoice (/i/<token>): like the quote's, the token's hash makes that
// one invoice visible under RLS (app.invoice_token_hash), then the transaction is scoped to its firm.
import { eq, sql } from 'drizzle-orm'
import { z } from 'zod'
import { customers, firms, invoices } from '../db/schema'

export const invoiceTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,60}$/, { error: 'Not found.' }) })

export async function openInvoiceByToken(tx: Tx, token: string) {
  const tokenHash = hashToken(token)
  await tx.execute(sql`select set_config('app.invoice_token_hash', ${tokenHash}, true)`)
  const [found] = await tx.select({ firmId: invoices.firmId, id: invoices.id }).from(invoices).where(eq(invoices.tokenHash, tokenHash))
  if (!found) throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This invoice link is not right. Ask the firm to send it again.' } })
  await scopeTransaction(tx, found.firmId, null)
  return { f: new FirmScope(tx, found.firmId, null), invoiceId: found.id }
}

/** What the customer sees: their invoice, what is still owed, and how to pay. */
export async function publicInvoiceView(f: FirmScope, invoiceId: string) {
  const d = await invoiceDetail(f, invoiceId)
  const [firm] = await f.tx.select({ tradingName: firms.tradingName, addressLine1: firms.addressLine1, town: firms.town, postcode: firms.postcode, email: firms.email, phone: firms.phone, vatNumber: firms.vatNumber, vatRegistered: firms.vatRegistered, bankDetails: firms.bankDetails })
    .from(firms).where(eq(firms.id, f.firmId))
  const [customer] = await f.tx.select({ name: customers.name, billingLine1: customers.billingLine1, billingTown: customers.billingTown, billingPostcode: customers.billingPostcode }).from(customers).where(f.where(customers, eq(customers.id, d.customerId)))
  return {
    reference: d.reference, kind: d.kind, issuedOn: d.issuedOn, dueOn: d.dueOn, vat: d.vat, cisRatePercent: d.cisRatePercent, notes: d.notes,
    totals: d.totals, amountDuePence: d.amountDuePence, status: d.status, paidPence: d.paidPence, outstandingPence: d.outstandingPence,
    firm: firm!, customer: customer!, site: d.site, credits: d.credits?.reference ?? null,
    lines: d.lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent })),
  }
}

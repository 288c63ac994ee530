import { eq, ne, sql } from 'drizzle-orm'
import { firms, invoices } from '../../db/schema'
import { firmSettingsSchema } from '#shared/schemas/firm'
import { prefixesClash } from '#shared/utils/invoices'
import { creditNotePrefixOf, invoicePrefixOf } from '#shared/utils/references'

/**
 * Firm settings: the owner only. Prefixes that would give an invoice and a credit note the same
 * reference are refused (a unique index on references is the last wall, at issue). The bank
 * account is kept as digits (firmSettingsSchema checks the sort code and account number).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  const input = await readBodyWith(event, firmSettingsSchema)
  return withFirm(auth, async (f) => {
    // locked, so issuing (which locks it too) never reads prefixes half changed
    const [now] = await f.tx.select().from(firms).where(eq(firms.id, f.firmId)).for('update')
    if (!now) notFound()
    const numbering = input.creditNoteNumbering ?? now.creditNoteNumbering
    // a blank prefix means the firm's letters then a dash (invoices, BP-12) or then -C (credit
    // notes, BP-C3): compared as they will read (shared/utils/references.ts)
    const letters = now.referenceLetters
    const invoicePrefix = invoicePrefixOf(letters, input.invoicePrefix)
    const creditNotePrefix = creditNotePrefixOf(letters, input.creditNotePrefix ?? now.creditNotePrefix)
    if (numbering === 'own') {
      if (prefixesClash(invoicePrefix, creditNotePrefix)) {
        throw fieldError({ creditNotePrefix: `Credit notes numbered on their own need a prefix unlike the invoices' (${invoicePrefix || 'none'}), or an invoice and a credit note could share a reference. Try CR-.` })
      }
      // nor may a series take up a prefix the other series' references already use (prefixes are
      // letters, digits, - and /, none of them special in a regular expression outside brackets)
      for (const [series, prefix, field] of [['invoice', invoicePrefix, 'invoicePrefix'], ['credit-note', creditNotePrefix, 'creditNotePrefix']] as const) {
        const [used] = await f.tx.select({ reference: invoices.reference }).from(invoices)
          .where(f.where(invoices, ne(invoices.series, series), sql`upper(${invoices.reference}) ~ ('^' || upper(${prefix}) || '[0-9]+$')`))
          .limit(1)
        if (used) throw fieldError({ [field]: `${used.reference} is already ${series === 'invoice' ? 'a credit note' : 'an invoice'} reference: pick a prefix that is not used by the ${series === 'invoice' ? 'credit notes' : 'invoices'}.` })
      }
    }
    const [firm] = await f.tx.update(firms).set(input).where(eq(firms.id, f.firmId)).returning()
    if (!firm) notFound()
    await f.audit('firm.updated', 'firm', f.firmId, { fields: Object.keys(input) })
    return { ...firm, enquiryFormKey: publicFormKey(firm.id, firm.enquiryFormKey) }
  })
})

import { eq, sql } from 'drizzle-orm'
import { customers, firms, quotes, quoteVersions } from '../../../db/schema'
import { quoteVersionSchema } from '#shared/schemas/quote'
import { idParam } from '#shared/schemas/common'

/**
 * Change the draft: lines, pricing, VAT, validity, terms. A sent version is never edited (409): revise it.
 * The VAT treatment is checked against the firm's registration and the customer's flags (400 on `vat`).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, quoteVersionSchema)
  return withFirm(auth, async (f) => {
    const quote = await findOr404(f, quotes, id, { lock: true })
    const version = await currentVersion(f, quote, true)
    if (version.status !== 'draft') {
      throw createError({ statusCode: 409, statusMessage: 'Quote already sent', data: { message: 'This version has been sent, so it stays as it is. Make a revision to change it.' } })
    }
    const { lines, ...rest } = input
    const [firm] = await f.tx.select({ dayRatePence: firms.dayRatePence, vatRegistered: firms.vatRegistered }).from(firms).where(eq(firms.id, f.firmId))
    // the VAT treatment must fit the firm's registration and the customer's flags (shared/utils/vat-treatment.ts)
    const [customer] = await f.tx.select({ kind: customers.kind, vatRegistered: customers.vatRegistered, paysUnderCis: customers.paysUnderCis, endUserNotified: customers.endUserNotified })
      .from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
    const vatProblem = vatTreatmentProblem(input.vat, firm!, customer!)
    if (vatProblem) throw fieldError({ vat: vatProblem })
    // checked before anything is written, so a fixed price below the materials is a 400 on that field
    customerLines({ ...rest, dayRatePence: firm!.dayRatePence }, lines)
    await f.tx.update(quoteVersions).set({ ...rest, dayRatePence: firm!.dayRatePence, updatedAt: sql`now()` }).where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    await saveLines(f, version.id, lines)
    await refreshTotals(f, version.id)
    await f.audit('quote.draft-saved', 'quote', id, { version: version.version })
    return quoteDetail(f, id)
  })
})

import { eq } from 'drizzle-orm'
import { customers, enquiries, firms, quotes, quoteVersions } from '../../db/schema'
import { newQuoteSchema } from '#shared/schemas/quote'
import { addDays, londonToday } from '#shared/utils/dates'

/**
 * Start a quote for a customer (and a site, an enquiry, a measured visit). Version 1 is a draft
 * with the VAT treatment and CIS rate suggested from the firm and the customer, valid for 30 days.
 * From a measured visit, its lines are the take-off priced from the price book.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const input = await readBodyWith(event, newQuoteSchema)
  const created = await withFirm(auth, async (f) => {
    const customer = await findOr404(f, customers, input.customerId).catch(() => badReference('customerId', 'Choose a customer of this firm.'))
    if (input.siteId) await findSite(f, input.siteId, customer.id).catch(() => badReference('siteId', 'Choose one of this customer\'s sites.'))
    if (input.enquiryId) {
      const e = await findOr404(f, enquiries, input.enquiryId).catch(() => badReference('enquiryId', 'That enquiry is not in this firm.'))
      if (e.customerId !== customer.id) badReference('enquiryId', 'That enquiry is for another customer.')
    }
    if (input.visitId) {
      const v = await findVisit(f, auth, input.visitId).catch(() => badReference('visitId', 'That visit is not in this firm.'))
      if (v.customerId !== customer.id) badReference('visitId', 'That visit is for another customer.')
    }
    const [firm] = await f.tx.select({ vatRegistered: firms.vatRegistered, paymentTermsDays: firms.paymentTermsDays }).from(firms).where(eq(firms.id, f.firmId))
    const number = await nextQuoteNumber(f)
    const [quote] = await f.tx.insert(quotes).values(f.values({ number, customerId: customer.id, siteId: input.siteId, enquiryId: input.enquiryId, visitId: input.visitId })).returning()
    const validUntil = addDays(londonToday(), 30)
    const draft = input.visitId ? await draftFromVisit(f, input.visitId) : { lines: [], rules: {}, estimatedDaysX100: 0, cautions: [] as string[], roomEstimates: [] }
    const [version] = await f.tx.insert(quoteVersions).values(f.values({
      quoteId: quote!.id,
      version: 1,
      vat: suggestedVat(firm!, customer),
      cisRatePercent: customer.paysUnderCis ? customer.cisRatePercent : null,
      validUntil,
      estimatedDaysX100: draft.estimatedDaysX100,
      rules: draft.rules,
      roomEstimates: draft.roomEstimates,
      cautions: [...draft.cautions, DRYING_CAUTION, RULE_OF_THUMB],
      terms: `Payment within ${firm!.paymentTermsDays} days of the invoice. Prices hold until the date above.`,
      createdBy: auth.userId,
    })).returning()
    await saveLines(f, version!.id, draft.lines)
    await refreshTotals(f, version!.id)
    await f.audit('quote.created', 'quote', quote!.id, { number })
    return quote!
  })
  setResponseStatus(event, 201)
  return created
})

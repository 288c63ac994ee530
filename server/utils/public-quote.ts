import { and, eq, gt, inArray } from 'drizzle-orm'
import { customers, firms, quotes, quoteVersions, sites } from '../db/schema'
import { groupLines } from '#shared/utils/line-groups'

const GONE = 'This quote link has expired or is not right. Ask the firm to send it again.'

/**
 * The quote version behind a customer's link, inside a transaction: only that version is
 * visible (app.quote_token_hash), then the transaction is scoped to its firm. 404 with a clear
 * message for a wrong or expired link; nothing else about the firm is readable.
 */
export function openQuoteByToken(tx: Tx, token: string, lock = false) {
  return withSecretLink(tx, {
    setting: 'app.quote_token_hash',
    secret: token,
    find: (tx, tokenHash, firmId) => tx.select({ firmId: quoteVersions.firmId, id: quoteVersions.id, quoteId: quoteVersions.quoteId }).from(quoteVersions)
      .where(and(eq(quoteVersions.tokenHash, tokenHash), inLinkFirm(quoteVersions.firmId, firmId), inArray(quoteVersions.status, ['sent', 'accepted', 'declined', 'superseded']), gt(quoteVersions.tokenExpiresAt, new Date()))),
    open: async (f, found) => {
      // an answer locks the quote, then the version, in the order the firm's own changes (revise, send)
      // lock them: an answer and a revision at the same moment go one after the other
      const quote = await findOr404(f, quotes, found.quoteId, { lock })
      const version = await findOr404(f, quoteVersions, found.id, { lock })
      return { f, version, quote }
    },
    gone: () => { throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: GONE } }) },
  })
}

/** What the customer sees: their quote and nothing else of the firm's. */
export async function publicQuoteView(f: FirmScope, quote: typeof quotes.$inferSelect, version: typeof quoteVersions.$inferSelect) {
  const [firm] = await f.tx.select({ tradingName: firms.tradingName, addressLine1: firms.addressLine1, town: firms.town, postcode: firms.postcode, email: firms.email, phone: firms.phone, vatNumber: firms.vatNumber, vatRegistered: firms.vatRegistered })
    .from(firms).where(eq(firms.id, f.firmId))
  const [customer] = await f.tx.select({ name: customers.name }).from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
  const [site] = quote.siteId ? await f.tx.select({ line1: sites.line1, town: sites.town, postcode: sites.postcode }).from(sites).where(f.where(sites, eq(sites.id, quote.siteId))) : []
  const lines = customerLinesOrWorking(version, await versionLines(f, version.id)).lines
  return {
    reference: quoteReference(await referenceLettersOf(f), quote.number),
    version: version.version,
    status: version.status,
    firm: firm!,
    customer: customer!,
    site: site ?? null,
    validUntil: version.validUntil,
    pricing: version.pricing,
    estimatedDaysX100: version.estimatedDaysX100,
    vat: version.vat,
    cisRatePercent: version.cisRatePercent,
    terms: version.terms,
    notes: version.notes,
    cautions: version.cautions,
    rules: version.rules,
    totals: version.totals,
    respondedAt: version.respondedAt,
    acceptedName: version.acceptedName,
    lines: lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation })),
    /** The lines as the customer reads them: grouped by room and kind of work, identical lines merged. */
    groups: groupLines(lines),
  }
}

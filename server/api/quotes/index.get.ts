import { and, desc, eq } from 'drizzle-orm'
import { customers, quotes, quoteVersions } from '../../db/schema'

/** Quotes, newest first, with the current version's status and total, and each one's reference (BP-Q12). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, async (f) => {
    const letters = await referenceLettersOf(f)
    const rows = await f.tx.select({
      id: quotes.id,
      number: quotes.number,
      version: quotes.currentVersion,
      status: quoteVersions.status,
      totals: quoteVersions.totals,
      sentAt: quoteVersions.sentAt,
      customer: { id: customers.id, name: customers.name },
      createdAt: quotes.createdAt,
    }).from(quotes)
      .innerJoin(quoteVersions, and(eq(quoteVersions.firmId, quotes.firmId), eq(quoteVersions.quoteId, quotes.id), eq(quoteVersions.version, quotes.currentVersion)))
      .innerJoin(customers, f.where(customers, eq(customers.id, quotes.customerId)))
      .where(f.where(quotes)).orderBy(desc(quotes.number)).limit(200)
    return rows.map(r => ({ ...r, reference: quoteReference(letters, r.number) }))
  })
})

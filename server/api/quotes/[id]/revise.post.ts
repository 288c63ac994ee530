import { eq, sql } from 'drizzle-orm'
import { quotes, quoteVersions } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * Start the next version from a sent or declined one (the sent one stays as the customer saw it,
 * but its link can no longer accept it). Refused once any version has been accepted.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const quote = await findOr404(f, quotes, id, { lock: true })
    const version = await currentVersion(f, quote, true)
    if (version.status === 'draft') throw createError({ statusCode: 409, statusMessage: 'Already a draft', data: { message: 'The current version is still a draft: change it directly.' } })
    if (version.status === 'accepted' || await anyAccepted(f, id)) throw createError({ statusCode: 409, statusMessage: 'Already accepted', data: { message: 'The customer accepted this quote; it is not revised. For more work, make a new quote.' } })
    // the version the customer holds is withdrawn now: their link shows that the quote was revised
    // and can no longer be accepted, so two versions can never both be accepted
    if (version.status === 'sent') await f.tx.update(quoteVersions).set({ status: 'superseded' }).where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    const lines = await versionLines(f, version.id)
    const { id: _id, firmId: _f, version: n, status: _s, sentAt: _sa, tokenHash: _th, tokenExpiresAt: _te, respondedAt: _ra, acceptedName: _an, respondedIp: _ri, declineReason: _dr, createdAt: _c, updatedAt: _u, ...content } = version
    const [next] = await f.tx.insert(quoteVersions).values(f.values({ ...content, version: n + 1, status: 'draft' as const, createdBy: auth.userId })).returning()
    await saveLines(f, next!.id, lines.map(({ id: _l, firmId: _lf, versionId: _v, ...l }) => l))
    await refreshTotals(f, next!.id)
    await f.tx.update(quotes).set({ currentVersion: n + 1, updatedAt: sql`now()` }).where(f.where(quotes, eq(quotes.id, id)))
    await f.audit('quote.revised', 'quote', id, { version: n + 1 })
    return quoteDetail(f, id)
  })
})

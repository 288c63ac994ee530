import { eq, sql } from 'drizzle-orm'
import { customers, enquiries, quoteVersions } from '../../../../db/schema'
import { fullDateAtTime } from '#shared/utils/dates'
import { acceptQuoteSchema } from '#shared/schemas/quote'
import { quoteTokenParam } from '#shared/schemas/links'

const REVISED = 'The firm has revised this quote since it was sent, so this version can no longer be accepted. They will send you the new version; if it has not arrived, give them a ring.'

/** Public: the customer accepts, typing their name; the time and address are kept. Once only (409 after). */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, quoteTokenParam)
  const { name } = await readBodyWith(event, acceptQuoteSchema)
  const ip = getRequestIP(event) ?? ''
  const result = await useDb().transaction(async (tx) => {
    const { f, quote, version } = await openQuoteByToken(tx, token, true)
    if (version.status !== 'sent') {
      throw createError({ statusCode: 409, statusMessage: 'Already answered', data: { message: version.status === 'accepted' ? 'You have already accepted this quote. Thank you.' : version.status === 'superseded' ? REVISED : 'This quote was declined.' } })
    }
    // one accepted version per quote: a unique index holds it even if a path forgot to check
    try {
      await tx.update(quoteVersions).set({ status: 'accepted', respondedAt: sql`now()`, acceptedName: name, respondedIp: ip })
        .where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    }
    catch (err) {
      if (isUniqueViolation(err)) throw createError({ statusCode: 409, statusMessage: 'Already accepted', data: { message: 'Another version of this quote has already been accepted. Thank you.' } })
      throw err
    }
    if (quote.enquiryId) {
      // the enquiry follows: quoted (if it was not yet), then won
      let status = (await findOr404(f, enquiries, quote.enquiryId, { lock: true })).status
      if (status !== 'quoted' && canMoveEnquiry(status, 'quoted')) {
        await moveEnquiry(f, quote.enquiryId, 'quoted', null)
        status = 'quoted'
      }
      if (canMoveEnquiry(status, 'won')) await moveEnquiry(f, quote.enquiryId, 'won', null)
    }
    await f.audit('quote.accepted', 'quote', quote.id, { version: version.version, name })
    const [v] = await tx.select().from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    const [customer] = await tx.select({ email: customers.email }).from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
    return { view: await publicQuoteView(f, quote, v!), to: await firmRecipients(f, ['owner', 'office']), customerEmail: customer?.email ?? '', at: v!.respondedAt ?? new Date() }
  })
  // to the firm's own people; a reply goes to the customer
  await sendMail({
    to: result.to.join(', '),
    ...(result.customerEmail ? { replyTo: result.customerEmail } : {}),
    subject: `Quote ${result.view.reference} accepted by ${result.view.customer.name}`,
    text: `${name} accepted quote ${result.view.reference} (version ${result.view.version}) for ${formatPence(result.view.totals.grossPence ?? 0)} on ${fullDateAtTime(result.at)}.${result.customerEmail ? `\n\nReply to this e-mail to write to ${result.view.customer.name} (${result.customerEmail}).` : ''}`,
  }).catch(err => console.error('[mail] acceptance notice not sent:', err.message))
  return result.view
})

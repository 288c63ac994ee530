import { eq, sql } from 'drizzle-orm'
import { customers, enquiries, quoteVersions } from '../../../../db/schema'
import { fullDateAtTime } from '#shared/utils/dates'
import { declineQuoteSchema } from '#shared/schemas/quote'
import { quoteTokenParam } from '#shared/schemas/links'

/** Public: the customer declines with a reason. Once only (409 after). */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, quoteTokenParam)
  const { reason } = await readBodyWith(event, declineQuoteSchema)
  const result = await useDb().transaction(async (tx) => {
    const { f, quote, version } = await openQuoteByToken(tx, token, true)
    if (version.status !== 'sent') throw createError({ statusCode: 409, statusMessage: 'Already answered', data: { message: 'This quote has already been answered.' } })
    await tx.update(quoteVersions).set({ status: 'declined', respondedAt: sql`now()`, declineReason: reason, respondedIp: getRequestIP(event) ?? '' })
      .where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    if (quote.enquiryId) {
      const e = await findOr404(f, enquiries, quote.enquiryId, { lock: true })
      if (canMoveEnquiry(e.status, 'lost')) await moveEnquiry(f, quote.enquiryId, 'lost', `Quote declined: ${reason}`)
    }
    await f.audit('quote.declined', 'quote', quote.id, { version: version.version })
    const [v] = await tx.select().from(quoteVersions).where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    const [customer] = await tx.select({ email: customers.email }).from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
    return { view: await publicQuoteView(f, quote, v!), to: await firmRecipients(f, ['owner', 'office']), customerEmail: customer?.email ?? '', at: v!.respondedAt ?? new Date() }
  })
  // to the firm's own people; a reply goes to the customer
  await sendMail({
    to: result.to.join(', '),
    ...(result.customerEmail ? { replyTo: result.customerEmail } : {}),
    subject: `Quote ${result.view.reference} declined by ${result.view.customer.name}`,
    text: `${result.view.customer.name} declined quote ${result.view.reference} on ${fullDateAtTime(result.at)}: ${reason}`,
  }).catch(err => console.error('[mail] decline notice not sent:', err.message))
  return result.view
})

import { and, eq, ne, sql } from 'drizzle-orm'
import { customers, enquiries, quotes, quoteVersions } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { fullDate } from '#shared/utils/dates'

/**
 * Send the draft: it becomes the version the customer sees, can no longer change, and gets a
 * link (an unguessable token, only its hash kept, expiring with the quote). Earlier sent
 * versions are superseded; the enquiry moves to "quoted".
 *
 * The e-mail goes before the transaction commits: if the mail server refuses it or cannot be
 * reached, nothing is written (the quote stays a draft, so it can be sent again) and the answer is
 * a 502 that says so. Should the commit itself fail after the e-mail went, the customer holds a link
 * that shows "this link does not work" until the quote is sent again: never a quote marked sent
 * that nobody received.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const { token, hash } = newLinkToken(auth.firmId)
  const sent = await withFirm(auth, async (f) => {
    const quote = await findOr404(f, quotes, id, { lock: true })
    const version = await currentVersion(f, quote, true)
    if (version.status !== 'draft') throw createError({ statusCode: 409, statusMessage: 'Already sent', data: { message: 'This version has already been sent.' } })
    if (await anyAccepted(f, id)) throw createError({ statusCode: 409, statusMessage: 'Already accepted', data: { message: 'The customer has accepted an earlier version of this quote, so this one is not sent. For more work, make a new quote.' } })
    const lines = await versionLines(f, version.id)
    if (!lines.length) throw fieldError({ lines: 'Add at least one line before sending.' })
    const [customer] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, quote.customerId)))
    if (!customer!.email) throw fieldError({ email: `${customer!.name} has no e-mail address: add one on their page first.` })
    const expires = new Date(`${version.validUntil}T23:59:59Z`)
    if (expires.getTime() < Date.now()) throw fieldError({ validUntil: 'The quote would already have expired: pick a later date.' })
    const totals = await refreshTotals(f, version.id)
    await f.tx.update(quoteVersions).set({ status: 'superseded' })
      .where(f.where(quoteVersions, eq(quoteVersions.quoteId, id), eq(quoteVersions.status, 'sent'), ne(quoteVersions.id, version.id)))
    await f.tx.update(quoteVersions).set({ status: 'sent', sentAt: sql`now()`, tokenHash: hash, tokenExpiresAt: expires })
      .where(f.where(quoteVersions, eq(quoteVersions.id, version.id)))
    if (quote.enquiryId) {
      const [e] = await f.tx.select({ status: enquiries.status }).from(enquiries).where(f.where(enquiries, and(eq(enquiries.id, quote.enquiryId))))
      if (e && canMoveEnquiry(e.status, 'quoted')) await moveEnquiry(f, quote.enquiryId, 'quoted', null)
    }
    await f.audit('quote.sent', 'quote', id, { version: version.version, totalPence: totals.grossPence })
    const detail = await quoteDetail(f, id)
    const firm = await firmContact(f)
    try {
      await sendFirmMail(firm, {
        to: customer!.email,
        subject: `Your quote ${detail.reference} from ${firm.tradingName}`,
        text: [
          `Hello ${customer!.contactName || customer!.name},`,
          '',
          `${firm.tradingName} has sent you quote ${detail.reference} for ${formatPence(totals.grossPence)}${totals.reverseChargeVatPence ? ' (reverse charge: you account for the VAT)' : ''}.`,
          `It is good until ${fullDate(version.validUntil)}.`,
        ].join('\n'),
        links: [{ label: 'Open it, download it, and accept or decline it here', url: appLink(`/q/${token}`) }],
        after: 'The link is for you only; please do not forward it. Any questions, reply to this e-mail.',
      })
    }
    catch (err) {
      console.error('[mail] quote not sent:', (err as Error).message)
      // thrown inside the transaction, so the quote stays a draft
      throw createError({ statusCode: 502, statusMessage: 'E-mail not sent', data: { message: `The e-mail to ${customer!.email} could not be sent, so the quote is still a draft. Check the address and try again in a few minutes.` } })
    }
    return { detail }
  })
  return sent.detail
})

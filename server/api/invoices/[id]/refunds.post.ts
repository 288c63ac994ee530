import { eq } from 'drizzle-orm'
import { invoices, payments } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { refundSchema } from '#shared/schemas/invoice'

/**
 * Refund a payment, in part or in full. A card payment is refunded through Stripe and recorded
 * when Stripe's charge.refunded event arrives (so it is counted once); a transfer, cash or cheque
 * refund is recorded now, as money out.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, refundSchema)
  const card = await withFirm(auth, async (f) => {
    await findOr404(f, invoices, id, { lock: true })
    const [p] = await f.tx.select().from(payments).where(f.where(payments, eq(payments.id, input.paymentId), eq(payments.invoiceId, id)))
    if (!p || p.amountPence <= 0) throw fieldError({ paymentId: 'Choose one of this invoice\'s payments.' })
    const refunded = (await f.tx.select().from(payments).where(f.where(payments, eq(payments.invoiceId, id))))
      .filter(r => r.amountPence < 0 && r.reference === (p.stripePaymentIntentId ?? `refund of ${p.id}`)).reduce((s, r) => s - r.amountPence, 0)
    if (input.amountPence > p.amountPence - refunded) throw fieldError({ amountPence: `At most ${formatPence(p.amountPence - refunded)} of this payment is left to refund.` })
    if (p.method === 'card') return { intent: p.stripePaymentIntentId!, refunded }
    await recordPayment(f, id, { method: p.method, amountPence: -input.amountPence, receivedOn: todayIso(), reference: `refund of ${p.id}` })
    return null
  })
  if (card) {
    try {
      await useStripe().refunds.create({ payment_intent: card.intent, amount: input.amountPence }, { idempotencyKey: input.requestId ? `refund-${input.requestId}` : `refund-${input.paymentId}-${input.amountPence}-${card.refunded}-${input.reference}` })
    }
    catch (err) {
      // Stripe said no (already refunded, too much, ...): a 400 with its reason; unreachable: a 502
      const e = err as { type?: string, statusCode?: number, message?: string }
      if (e.type === 'StripeInvalidRequestError' || (typeof e.statusCode === 'number' && e.statusCode >= 400 && e.statusCode < 500)) {
        throw createError({ statusCode: 400, statusMessage: 'Refund refused', data: { message: `The card company refused the refund: ${e.message}`, fields: { amountPence: `The card company refused the refund: ${e.message}` } } })
      }
      console.error('[stripe] refund not made:', e.message)
      throw createError({ statusCode: 502, statusMessage: 'Refund not made', data: { message: 'The card company could not be reached, so nothing was refunded. Try again in a few minutes.' } })
    }
  }
  setResponseStatus(event, card ? 202 : 201)
  return withFirm(auth, f => invoiceDetail(f, id))
})

import { count, eq } from 'drizzle-orm'
import { payments } from '../../../../db/schema'
import { invoiceTokenParam } from '#shared/schemas/links'

/** Stripe's smallest card charge in pounds sterling (Stripe's "minimum and maximum charge amounts", from memory). */
const MIN_CARD_PENCE = 30

/**
 * Public: pay what is owed by card. Makes a Stripe Checkout Session for the outstanding amount
 * (its metadata names the firm and the invoice, so the webhook can find them) and answers its URL.
 */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, invoiceTokenParam)
  const view = await useDb().transaction(async (tx) => {
    const { f, invoiceId } = await openInvoiceByToken(tx, token)
    // how many payments and refunds there have been: after a refund the amounts can be what they
    // were at the first checkout, and the same key would hand back that finished session
    const [moves] = await f.tx.select({ n: count() }).from(payments).where(f.where(payments, eq(payments.invoiceId, invoiceId)))
    return { firmId: f.firmId, invoiceId, moves: moves?.n ?? 0, ...(await publicInvoiceView(f, invoiceId)) }
  })
  if (view.outstandingPence <= 0) throw createError({ statusCode: 409, statusMessage: 'Nothing owed', data: { message: 'This invoice is paid: there is nothing to pay.' } })
  // Stripe takes no card payment under 30p (its minimum charge for GBP)
  if (view.outstandingPence < MIN_CARD_PENCE) throw createError({ statusCode: 409, statusMessage: 'Too little for a card', data: { message: `Only ${formatPence(view.outstandingPence)} is left to pay, less than the ${formatPence(MIN_CARD_PENCE)} a card payment can be: please pay it by bank transfer or ask the firm.` } })
  const appUrl = useRuntimeConfig().appUrl.replace(/\/$/, '')
  const metadata = { firmId: view.firmId, invoiceId: view.invoiceId }
  try {
    const session = await useStripe().checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: 'gbp', unit_amount: view.outstandingPence, product_data: { name: `Invoice ${view.reference} from ${view.firm.tradingName}` } } }],
      success_url: `${appUrl}/i/${token}?paid={CHECKOUT_SESSION_ID}`,
      cancel_url: `${appUrl}/i/${token}`,
      client_reference_id: view.invoiceId,
      metadata,
      payment_intent_data: { metadata },
    }, { idempotencyKey: `checkout-${view.invoiceId}-${view.outstandingPence}-${view.paidPence}-${view.moves}` })
    return { url: session.url }
  }
  catch (err) {
    console.error('[stripe] checkout session not made:', (err as Error).message)
    throw createError({ statusCode: 502, statusMessage: 'Card payments unavailable', data: { message: 'Card payments are not working just now. Try again later, or pay by bank transfer.' } })
  }
})

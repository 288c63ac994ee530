import type Stripe from 'stripe'
import { eq, lt, sql } from 'drizzle-orm'
import { customers, firms, invoices, payments, stripeEvents } from '../../db/schema'
import { stripePaymentMetadataSchema } from '#shared/schemas/invoice'
import { fullDate } from '#shared/utils/dates'
import type { FirmContact } from '../../utils/mail'

/**
 * Stripe's webhook. The raw body is checked against the Stripe-Signature header (400 otherwise,
 * nothing changed). The event id is recorded in the same transaction as its effect, so a
 * duplicate does nothing; the amount and currency are checked against the invoice; a payment is
 * recorded once per PaymentIntent whichever event brings it first; a refund lowers what was paid
 * (a refund that arrives before its payment is answered 409, so Stripe sends it again).
 * Status follows from payments, so a late or repeated event never moves an invoice backwards.
 */
export default defineEventHandler(async (event) => {
  const raw = await readRawBody(event, false)
  const signature = getHeader(event, 'stripe-signature')
  if (!raw || !signature) throw createError({ statusCode: 400, statusMessage: 'Not signed' })
  let evt: Stripe.Event
  try {
    evt = useStripe().webhooks.constructEvent(raw, signature, useRuntimeConfig().stripeWebhookSecret, 300)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'Bad signature' })
  }
  const obj = evt.data.object as unknown as { metadata?: Record<string, string> }
  const meta = stripePaymentMetadataSchema.safeParse(obj.metadata ?? {})
  if (!meta.success) return { received: true, outcome: 'not ours' }
  const { firmId, invoiceId } = meta.data

  let receipt: { to: string, name: string, reference: string, amountPence: number, firm: FirmContact } | null = null
  const outcome = await withFirm({ firmId, userId: null }, async (f) => {
    const [firm] = await f.tx.select({ tradingName: firms.tradingName }).from(firms).where(eq(firms.id, firmId))
    if (!firm) return 'not ours'
    const [fresh] = await f.tx.insert(stripeEvents).values({ firmId, eventId: evt.id, type: evt.type }).onConflictDoNothing().returning()
    if (!fresh) return 'duplicate'
    const done = (o: string) => f.tx.update(stripeEvents).set({ outcome: o }).where(f.where(stripeEvents, eq(stripeEvents.eventId, evt.id))).then(() => o)
    const [inv] = await f.tx.select().from(invoices).where(f.where(invoices, eq(invoices.id, invoiceId))).for('update')
    if (!inv || !inv.issuedOn) return done('no such invoice')

    let intentId: string | null = null
    let amount = 0
    let currency = ''
    if (evt.type === 'checkout.session.completed') {
      const s = evt.data.object
      if (s.payment_status !== 'paid') return done('not paid')
      intentId = typeof s.payment_intent === 'string' ? s.payment_intent : s.payment_intent?.id ?? null
      amount = s.amount_total ?? 0
      currency = s.currency ?? ''
    }
    else if (evt.type === 'payment_intent.succeeded') {
      const pi = evt.data.object
      intentId = pi.id
      amount = pi.amount_received || pi.amount
      currency = pi.currency
    }
    else if (evt.type === 'charge.refunded') {
      const ch = evt.data.object
      const pi = typeof ch.payment_intent === 'string' ? ch.payment_intent : ch.payment_intent?.id
      if (!pi) return done('no payment intent')
      const [paid] = await f.tx.select().from(payments).where(f.where(payments, eq(payments.stripePaymentIntentId, pi)))
      // the refund came before its payment (Stripe does not keep events in order): refuse it, so
      // the event row rolls back with this transaction and Stripe delivers it again later
      if (!paid) throw createError({ statusCode: 409, statusMessage: 'Payment not recorded yet', data: { message: 'The payment this refund belongs to has not arrived yet; send the event again later.' } })
      const [already] = await f.tx.select({ total: sql<number>`coalesce(-sum(${payments.amountPence}), 0)::int` }).from(payments)
        .where(f.where(payments, eq(payments.invoiceId, invoiceId), eq(payments.method, 'card'), lt(payments.amountPence, 0), sql`${payments.reference} = ${pi}`))
      // never more than the payment itself, whatever the event says (a refund is of this payment only)
      const refundedNow = Math.min(Number(ch.amount_refunded) || 0, paid.amountPence)
      if ((Number(ch.amount_refunded) || 0) > paid.amountPence) {
        await f.audit('payment.refund-mismatch', 'invoice', invoiceId, { eventId: evt.id, amountRefunded: ch.amount_refunded, paymentPence: paid.amountPence })
      }
      const more = refundedNow - Number(already?.total ?? 0)
      if (more <= 0) return done('refund already recorded')
      await recordPayment(f, invoiceId, { method: 'card', amountPence: -more, receivedOn: todayIso(), reference: pi, stripeRefundId: `${evt.id}` })
      return done('refund recorded')
    }
    else {
      return done('ignored')
    }
    if (!intentId) return done('no payment intent')
    const [seen] = await f.tx.select({ id: payments.id }).from(payments).where(f.where(payments, eq(payments.stripePaymentIntentId, intentId)))
    if (seen) return done('payment already recorded')
    if (currency.toLowerCase() !== 'gbp' || !(amount > 0) || amount > inv.amountDuePence) {
      await f.audit('payment.mismatch', 'invoice', invoiceId, { eventId: evt.id, amount, currency, amountDuePence: inv.amountDuePence })
      return done('amount or currency does not match')
    }
    await recordPayment(f, invoiceId, { method: 'card', amountPence: amount, receivedOn: todayIso(), reference: intentId, stripePaymentIntentId: intentId })
    const [customer] = await f.tx.select({ email: customers.email, name: customers.name, contactName: customers.contactName }).from(customers).where(f.where(customers, eq(customers.id, inv.customerId)))
    if (customer?.email) receipt = { to: customer.email, name: customer.contactName || customer.name, reference: inv.reference ?? '', amountPence: amount, firm: await firmContact(f) }
    return done('payment recorded')
  })
  // the receipt goes once: only the delivery that recorded the payment gets here with one
  if (receipt) {
    const r = receipt as { to: string, name: string, reference: string, amountPence: number, firm: FirmContact }
    await sendFirmMail(r.firm, {
      to: r.to,
      subject: `Receipt: ${formatPence(r.amountPence)} for invoice ${r.reference}`,
      text: [`Hello ${r.name},`, '', `Thank you: ${r.firm.tradingName} has received ${formatPence(r.amountPence)} by card for invoice ${r.reference} on ${fullDate(todayIso())}.`].join('\n'),
    }).catch(err => console.error('[mail] receipt not sent:', (err as Error).message))
  }
  return { received: true, outcome }
})

// The Stripe client. Locally (and in the tests) it talks to our own fake on loopback
// (scripts/lib/stripe-fake.mjs) through the SDK's host/port/protocol settings; going live is
// configuration only: a real secret key, the real webhook secret and NUXT_STRIPE_API_BASE empty.
import Stripe from 'stripe'

/** The webhook secret the local fake signs with (nuxt.config.ts, scripts/lib/dev-services.mjs): never a live one. */
export const LOCAL_WEBHOOK_SECRET = 'whsec_setwell_local'

/**
 * What is wrong with the Stripe settings, in words, or null. A live key with the local webhook
 * secret (anyone who has read this repository could sign webhooks) or with a loopback API base
 * (our fake, which refuses live keys) is a half-done switch to live: refused at startup
 * (server/plugins/stripe-config.ts) and whenever the client is made.
 */
export function stripeConfigProblem(c: { stripeSecretKey: string, stripeWebhookSecret: string, stripeApiBase: string }): string | null {
  if (!c.stripeSecretKey.startsWith('sk_live_') && !c.stripeSecretKey.startsWith('rk_live_')) return null
  if (!c.stripeWebhookSecret || c.stripeWebhookSecret === LOCAL_WEBHOOK_SECRET) {
    return 'NUXT_STRIPE_SECRET_KEY is a live key but NUXT_STRIPE_WEBHOOK_SECRET is the local default: set the signing secret of your endpoint from Stripe\'s dashboard (whsec_...).'
  }
  if (c.stripeApiBase && /^https?:\/\/(127\.|localhost|\[::1\])/i.test(c.stripeApiBase)) {
    return 'NUXT_STRIPE_SECRET_KEY is a live key but NUXT_STRIPE_API_BASE points at the local Stripe fake: set NUXT_STRIPE_API_BASE to an empty value to reach Stripe.'
  }
  return null
}

let client: Stripe | null = null
let clientFor = ''

export function useStripe(): Stripe {
  const { stripeSecretKey, stripeApiBase } = useRuntimeConfig()
  const key = `${stripeSecretKey}|${stripeApiBase}`
  if (client && clientFor === key) return client
  const problem = stripeConfigProblem(useRuntimeConfig())
  if (problem) throw new Error(`[stripe] ${problem}`)
  const base = stripeApiBase ? new URL(stripeApiBase) : null
  client = new Stripe(stripeSecretKey, {
    maxNetworkRetries: 2,
    timeout: 10_000,
    telemetry: false,
    ...(base ? { host: base.hostname, port: Number(base.port || (base.protocol === 'https:' ? 443 : 80)), protocol: base.protocol.replace(':', '') as 'http' | 'https' } : {}),
  })
  clientFor = key
  return client
}

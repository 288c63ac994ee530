// The Stripe client. Locally (and in the tests) it talks to our own fake on loopback
// (scripts/lib/stripe-fake.mjs) through the SDK's host/port/protocol settings; going live is
// configuration only: a real secret key, the real webhook secret and NUXT_STRIPE_API_BASE empty.
import Stripe from 'stripe'

let client: Stripe | null = null
let clientFor = ''

export function useStripe(): Stripe {
  const { stripeSecretKey, stripeApiBase } = useRuntimeConfig()
  const key = `${stripeSecretKey}|${stripeApiBase}`
  if (client && clientFor === key) return client
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

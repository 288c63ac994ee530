// Refuse to start with a half-done switch to live card payments (server/utils/stripe.ts
// stripeConfigProblem): a live key with the local webhook secret, or pointed at the local fake.
export default defineNitroPlugin(() => {
  const problem = stripeConfigProblem(useRuntimeConfig())
  if (problem) {
    console.error(`[stripe] ${problem}`)
    throw new Error(`[stripe] ${problem}`)
  }
})

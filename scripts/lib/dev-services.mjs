// What `npm start` and `npm run dev` both need before the app runs: the dev database (created,
// migrated and seeded once), the local mail catcher and the local Stripe fake, on loopback.
import { profile, urls } from './env.mjs'
import { bootstrap, migrate, startCluster } from './pg.mjs'
import { background, bin, isPortFree, run } from './run.mjs'

export const SMTP_PORT = Number(process.env.SETWELL_MAIL_SMTP_PORT ?? 1025)
export const MAIL_WEB_PORT = Number(process.env.SETWELL_MAIL_WEB_PORT ?? 1080)
export const STRIPE_FAKE_PORT = Number(process.env.SETWELL_STRIPE_FAKE_PORT ?? 12111)

/** `appPort`: where the app will listen (npm start's PORT), so the fake's webhooks reach it. */
export async function prepareDevServices({ appPort = Number(process.env.PORT ?? 3000) } = {}) {
  const p = profile('dev')
  await startCluster(p)
  await bootstrap(p)
  await migrate(p)
  run(bin('tsx'), ['seeds/index.ts'], { env: { ...process.env, NUXT_DATABASE_OWNER_URL: urls(p).owner } })
  if (await isPortFree(SMTP_PORT) && await isPortFree(MAIL_WEB_PORT)) {
    background(bin('maildev'), ['--ip', '127.0.0.1', '--web-ip', '127.0.0.1', '--smtp', String(SMTP_PORT), '--web', String(MAIL_WEB_PORT), '--silent'], { stdio: 'ignore' })
  }
  else {
    console.log(`[setup] ports ${SMTP_PORT}/${MAIL_WEB_PORT} are in use: assuming a mail catcher is already running there`)
  }
  // card payments go to our own Stripe fake; its webhooks come back to the app on its port, on loopback (secret as in nuxt.config.ts)
  if (await isPortFree(STRIPE_FAKE_PORT)) {
    background('node', ['scripts/lib/stripe-fake.mjs', '--port', String(STRIPE_FAKE_PORT), '--webhook-url', `http://127.0.0.1:${appPort}/api/webhooks/stripe`, '--webhook-secret', 'whsec_setwell_local'], { stdio: 'ignore' })
  }
  else {
    console.log(`[setup] port ${STRIPE_FAKE_PORT} is in use: assuming the Stripe fake is already running there`)
  }
  return p
}

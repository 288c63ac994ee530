// What `npm start` and `npm run dev` both need before the app runs: the dev database (created,
// migrated and seeded once) and the local mail catcher on loopback.
import { profile, urls } from './env.mjs'
import { bootstrap, migrate, startCluster } from './pg.mjs'
import { background, bin, isPortFree, run } from './run.mjs'

export const SMTP_PORT = Number(process.env.SETWELL_MAIL_SMTP_PORT ?? 1025)
export const MAIL_WEB_PORT = Number(process.env.SETWELL_MAIL_WEB_PORT ?? 1080)

export async function prepareDevServices() {
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
  return p
}

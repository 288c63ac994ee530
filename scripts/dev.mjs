// npm run dev: the development server with hot reload, on the same database and mail catcher as npm start.
import { ensureDependencies } from './lib/run.mjs'

ensureDependencies()

const { profile, serverEnv, urls } = await import('./lib/env.mjs')
const { bootstrap, migrate, startCluster } = await import('./lib/pg.mjs')
const { background, bin, isPortFree, run } = await import('./lib/run.mjs')

const p = profile('dev')
await startCluster(p)
await bootstrap(p)
await migrate(p)
run(bin('tsx'), ['seeds/index.ts'], { env: { ...process.env, NUXT_DATABASE_OWNER_URL: urls(p).owner } })
if (await isPortFree(1025) && await isPortFree(1080)) {
  background(bin('maildev'), ['--ip', '127.0.0.1', '--web-ip', '127.0.0.1', '--smtp', '1025', '--web', '1080', '--silent'], { stdio: 'ignore' })
}
const env = serverEnv(p, { NODE_ENV: 'development', NUXT_TELEMETRY_DISABLED: '1', NUXT_APP_URL: 'http://127.0.0.1:3000' })
const dev = background(bin('nuxt'), ['dev', '--host', '127.0.0.1', '--port', '3000'], { env })
dev.on('exit', code => process.exit(code ?? 0))

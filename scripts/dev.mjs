// npm run dev: the development server with hot reload, on the same database and mail catcher as npm start.
import { ensureDependencies } from './lib/run.mjs'

ensureDependencies()

const { serverEnv } = await import('./lib/env.mjs')
const { prepareDevServices } = await import('./lib/dev-services.mjs')
const { background, bin } = await import('./lib/run.mjs')

const p = await prepareDevServices({ appPort: 3000 })
const env = serverEnv(p, { NODE_ENV: 'development', NUXT_TELEMETRY_DISABLED: '1', NUXT_APP_URL: 'http://127.0.0.1:3000' })
const dev = background(bin('nuxt'), ['dev', '--host', '127.0.0.1', '--port', '3000'], { env })
dev.on('exit', code => process.exit(code ?? 0))

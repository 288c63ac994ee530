// npm start: everything on a fresh machine. Installs dependencies, starts PostgreSQL (installing
// Debian's package when root and missing), migrates, seeds the demo firm on first run, starts the
// local mail catcher, builds the app and serves it on http://127.0.0.1:3000.
import { ensureDependencies } from './lib/run.mjs'

ensureDependencies()

const { serverEnv } = await import('./lib/env.mjs')
const { MAIL_WEB_PORT, SMTP_PORT, prepareDevServices } = await import('./lib/dev-services.mjs')
const { background, bin, isPortFree, nuxtBuild, waitForHttp } = await import('./lib/run.mjs')
const { execFileSync } = await import('node:child_process')
// the demo sign-ins live in seeds/demo.ts (TypeScript): read them through tsx
const { DEMO_PEOPLE, SECOND_FIRM } = JSON.parse(execFileSync(bin('tsx'), ['-e', 'import("./seeds/demo.ts").then(m => console.log(JSON.stringify({ DEMO_PEOPLE: m.DEMO_PEOPLE, SECOND_FIRM: m.SECOND_FIRM })))'], { encoding: 'utf8' }))

const HOST = process.env.HOST ?? '127.0.0.1'
const PORT = Number(process.env.PORT ?? 3000)
if (!(await isPortFree(PORT))) {
  console.error(`[start] port ${PORT} is in use. Stop what is using it, or run PORT=3001 npm start.`)
  process.exit(1)
}
const p = await prepareDevServices({ appPort: PORT })

nuxtBuild()

const appUrl = `http://${HOST}:${PORT}`
const server = background('node', ['.output/server/index.mjs'], {
  env: serverEnv(p, {
    HOST, PORT: String(PORT), NITRO_HOST: HOST, NITRO_PORT: String(PORT),
    NUXT_APP_URL: process.env.NUXT_APP_URL ?? appUrl,
    NUXT_SMTP_HOST: process.env.NUXT_SMTP_HOST ?? '127.0.0.1',
    NUXT_SMTP_PORT: process.env.NUXT_SMTP_PORT ?? String(SMTP_PORT),
  }),
})
server.on('exit', code => process.exit(code ?? 0))
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => server.kill('SIGTERM'))

await waitForHttp(`${appUrl}/api/health`)
const pad = s => s.padEnd(12)
console.log(`
  Setwell is running at ${appUrl}
  Mail sent by the app:  http://127.0.0.1:${MAIL_WEB_PORT}/index.html

  Demo sign-ins (firm: Brackenridge Plastering):
${DEMO_PEOPLE.map(d => `    ${pad(d.role)} ${d.email.padEnd(42)} ${d.password}`).join('\n')}
    The accountant also serves ${SECOND_FIRM.tradingName} (owner ${SECOND_FIRM.owner.email} / ${SECOND_FIRM.owner.password}).

  Ctrl+C stops the app; PostgreSQL keeps running (npm run db:stop stops it, npm run db:reset starts over).
`)

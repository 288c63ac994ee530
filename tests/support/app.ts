// Start the built server (.output) against the test database, with an in-process SMTP server
// that catches what it sends. One per test file: each gets its own ports and its own mailbox.
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
// @ts-expect-error plain JavaScript, no types
import { startStripeFake } from '../../scripts/lib/stripe-fake.mjs'
import { createServer } from 'node:net'
import { setTimeout as sleep } from 'node:timers/promises'
import { simpleParser, type ParsedMail } from 'mailparser'
import { SMTPServer } from 'smtp-server'

/** The parts of scripts/lib/stripe-fake.mjs the tests use (it is plain JavaScript). */
export interface StripeFake {
  url: string
  webhookSecret: string
  state: { deliveries: { eventId: string, type: string, attempt: number, statusCode?: number, ok?: boolean }[] } & Record<string, unknown>
  switches: Record<string, unknown>
  setSwitches(patch: Record<string, unknown>): Record<string, unknown>
  reset(): void
  waitForDeliveries(predicate: number | ((d: StripeFake['state']['deliveries']) => boolean), options?: { timeoutMs?: number }): Promise<StripeFake['state']['deliveries']>
  idle(): Promise<void>
  close(): Promise<void>
}

export interface TestApp {
  url: string
  /** This server's own Stripe fake (webhooks go back to this server). */
  stripe: StripeFake
  mails: ParsedMail[]
  /** Wait for a message to this address (matching `subject` when given), among those caught after the first `after` (default all). */
  waitForMail(to: string, subject?: RegExp, timeoutMs?: number, after?: number): Promise<ParsedMail>
  /** Server output so far, for debugging a failure. */
  output(): string
  stop(): Promise<void>
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer()
    s.on('error', reject)
    s.listen(0, '127.0.0.1', () => {
      const address = s.address()
      const port = typeof address === 'object' && address ? address.port : 0
      s.close(() => resolve(port))
    })
  })
}

export function requiredEnv(name: string): string {
  const v = process.env[name]
  if (!v) throw new Error(`${name} is not set: run the tests with npm test (scripts/test.mjs prepares the database and the build)`)
  return v
}

/** The apps this test process started, by URL, so a helper given only the URL can read its mail (signUpFirm). */
export const runningApps = new Map<string, TestApp>()

export async function startApp(extraEnv: Record<string, string> = {}): Promise<TestApp> {
  const mails: ParsedMail[] = []
  const waiters: (() => void)[] = []
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream).then((mail) => {
        mails.push(mail)
        waiters.splice(0).forEach(w => w())
        callback()
      }, callback)
    },
  })
  const smtpPort = await freePort()
  await new Promise<void>(resolve => smtp.listen(smtpPort, '127.0.0.1', resolve))

  const port = await freePort()
  const url = `http://127.0.0.1:${port}`
  // a Stripe of our own for this server, delivering its webhooks back to it
  const stripeSecret = `whsec_test_${port}`
  const stripe = await startStripeFake({ port: 0, webhookUrl: `${url}/api/webhooks/stripe`, webhookSecret: stripeSecret }) as StripeFake
  stripe.setSwitches({ retryDelayMs: 50 })
  let out = ''
  const child: ChildProcess = spawn('node', [`${process.env.SETWELL_OUTPUT_DIR ?? '.output'}/server/index.mjs`], {
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      NITRO_HOST: '127.0.0.1',
      NITRO_PORT: String(port),
      NUXT_DATABASE_URL: requiredEnv('SETWELL_TEST_DATABASE_URL'),
      NUXT_SESSION_PASSWORD: requiredEnv('SETWELL_TEST_SESSION_PASSWORD'),
      NUXT_APP_URL: url,
      NUXT_STRIPE_API_BASE: stripe.url,
      NUXT_STRIPE_WEBHOOK_SECRET: stripeSecret,
      NUXT_STRIPE_SECRET_KEY: 'sk_test_setwell_tests',
      NUXT_SMTP_HOST: '127.0.0.1',
      NUXT_SMTP_PORT: String(smtpPort),
      // every test file sends from 127.0.0.1 to one database, so the cap on wrong passwords per
      // address across accounts would be shared by all of them: tests/reliability/access-rules.test.ts
      // starts its app with the real figure and tests it from addresses of its own
      NUXT_SIGN_IN_ADDRESS_MAX: '100000',
      // photos of the test run stay with the test database, not in the dev folder
      ...(process.env.SETWELL_TEST_STORAGE_DIR ? { NUXT_STORAGE_DIR: process.env.SETWELL_TEST_STORAGE_DIR } : {}),
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stdout!.on('data', (d) => {
    out += d
  })
  child.stderr!.on('data', (d) => {
    out += d
  })

  const until = Date.now() + 30_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}:\n${out}`)
    try {
      const res = await fetch(`${url}/api/health`)
      if (res.ok) break
    }
    catch { /* not listening yet */ }
    if (Date.now() > until) throw new Error(`server did not start:\n${out}`)
    await sleep(100)
  }

  const app: TestApp = {
    url,
    stripe,
    mails,
    output: () => out,
    async waitForMail(to, subject, timeoutMs = 10_000, after = 0) {
      const find = () => mails.slice(after).find(m => [m.to].flat().some(a => a?.text.toLowerCase().includes(to.toLowerCase())) && (!subject || subject.test(m.subject ?? '')))
      const until = Date.now() + timeoutMs
      for (;;) {
        const found = find()
        if (found) return found
        if (Date.now() > until) throw new Error(`no mail to ${to} within ${timeoutMs} ms (got ${mails.length})`)
        await new Promise<void>((resolve) => {
          waiters.push(resolve)
          setTimeout(resolve, 200)
        })
      }
    },
    async stop() {
      runningApps.delete(url)
      if (child.exitCode === null) {
        child.kill('SIGTERM')
        await new Promise(resolve => child.once('exit', resolve))
      }
      await new Promise<void>(resolve => smtp.close(() => resolve()))
      await stripe.close()
      // the server's own output, for reading after a failure (tests/artefacts is wiped each run)
      if (out.trim()) {
        mkdirSync('tests/artefacts', { recursive: true })
        writeFileSync(`tests/artefacts/server-${port}.log`, out)
      }
    },
  }
  runningApps.set(url, app)
  return app
}

// Helpers for the browser journeys: Debian's Chromium through playwright-core, one persistent
// context per person (each in its own temporary profile), and a few waiting assertions, since
// playwright-core has no `expect` of its own.
import { mkdirSync } from 'node:fs'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core'
import { afterAll, afterEach, beforeAll, expect } from 'vitest'
import { startApp, type TestApp } from '../support/app'

export const PHONE = { width: 390, height: 844 }
export const DESKTOP = { width: 1280, height: 800 }

/** How long a single wait may take. Well under vitest's 60 s so a failure says what it waited for. */
const WAIT_MS = 10_000

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--lang=en-GB']

export interface Person {
  context: BrowserContext
  page: Page
  /** Uncaught exceptions in the page (pageerror). A journey ends by checking there were none. */
  pageErrors: string[]
  /** console.error lines, for the failure report. */
  consoleErrors: string[]
  /** Requests to anything but the app on loopback; they are refused, and a journey checks there were none. */
  offHostRequests: string[]
  close(): Promise<void>
}

/** `alsoAllow`: other loopback origins the page may reach (the app's own Stripe fake, standing in for Stripe's pay page). */
export interface OpenOptions { desktop?: boolean, alsoAllow?: string[] }

/** A fresh browser profile: nobody signed in, no cookies shared with any other person. */
export async function openPerson(appUrl: string, options: OpenOptions = {}): Promise<Person> {
  const dir = await mkdtemp(join(tmpdir(), 'setwell-e2e-'))
  let context: BrowserContext
  try {
    context = await chromium.launchPersistentContext(dir, {
      executablePath: '/usr/bin/chromium',
      headless: true,
      viewport: options.desktop ? DESKTOP : PHONE,
      isMobile: !options.desktop,
      hasTouch: !options.desktop,
      locale: 'en-GB',
      args: CHROMIUM_ARGS,
    })
  }
  catch (err) {
    await rm(dir, { recursive: true, force: true })
    throw err
  }
  context.setDefaultTimeout(WAIT_MS)
  context.setDefaultNavigationTimeout(WAIT_MS * 2)

  const origins = [appUrl, ...(options.alsoAllow ?? [])].map(u => new URL(u).origin)
  const offHostRequests: string[] = []
  await context.route('**/*', (route) => {
    const url = route.request().url()
    if (origins.some(origin => url.startsWith(`${origin}/`) || url === origin)) return route.continue()
    offHostRequests.push(url)
    return route.abort('blockedbyclient')
  })

  const page = context.pages()[0] ?? await context.newPage()
  const pageErrors: string[] = []
  const consoleErrors: string[] = []
  page.on('pageerror', err => pageErrors.push(String(err?.stack ?? err)))
  page.on('console', (msg) => {
    if (msg.type() === 'error') consoleErrors.push(msg.text())
  })

  let closed = false
  return {
    context,
    page,
    pageErrors,
    consoleErrors,
    offHostRequests,
    async close() {
      if (closed) return
      closed = true
      try {
        await context.close()
      }
      finally {
        await rm(dir, { recursive: true, force: true })
      }
    },
  }
}

/**
 * Nuxt renders on the server first; typing before Vue has hydrated the page is lost (or the form
 * submits natively). Wait until the app is mounted and hydration is over. Call after every full
 * page load (goto, reload); client-side navigations need nothing.
 * The app marks <html data-hydrated> when it is ready (app/plugins/hydrated.client.ts).
 */
export async function waitForHydration(page: Page) {
  await page.waitForSelector('html[data-hydrated="true"]', { state: 'attached', timeout: WAIT_MS })
}

export async function visit(page: Page, url: string) {
  await page.goto(url)
  await waitForHydration(page)
}

export async function reload(page: Page) {
  await page.reload()
  await waitForHydration(page)
}

/** The path the page is on now, once it is `path` (waits for it). */
export async function expectPath(page: Page, path: string) {
  await page.waitForURL(u => u.pathname === path, { timeout: WAIT_MS }).catch(() => { /* the assertion below says where we are */ })
  expect(new URL(page.url()).pathname, `expected to be on ${path}`).toBe(path)
}

/** The element's visible text (whitespace collapsed), once it is visible. */
export async function textOf(locator: Locator): Promise<string> {
  await locator.waitFor({ state: 'visible' })
  return (await locator.innerText()).replace(/\s+/g, ' ').trim()
}

/** Waits until the locator is visible and its text matches (a string must be contained). */
export async function expectText(locator: Locator, expected: string | RegExp) {
  await locator.waitFor({ state: 'visible' })
  await expect.poll(async () => (await locator.innerText()).replace(/\s+/g, ' ').trim(), { timeout: WAIT_MS }).toMatch(expected)
}

export async function expectVisible(locator: Locator) {
  await locator.waitFor({ state: 'visible' })
  expect(await locator.isVisible()).toBe(true)
}

/** Waits until nothing matches the locator (or nothing visible). */
export async function expectAbsent(locator: Locator) {
  await locator.waitFor({ state: 'hidden' })
  expect(await locator.isVisible()).toBe(false)
}

/**
 * The shell's section menu the person can see: the bottom bar on a phone, the sidebar on a wide
 * screen. The DOM holds both; a role query only finds the one that is displayed (and fails if
 * both were).
 */
export function sectionsNav(page: Page) {
  return page.getByRole('navigation', { name: 'Sections' })
}

export async function menuLabels(page: Page): Promise<string[]> {
  const nav = sectionsNav(page)
  await nav.waitFor({ state: 'visible' })
  const links = nav.getByRole('link')
  await links.first().waitFor({ state: 'visible' })
  return (await links.allInnerTexts()).map(t => t.replace(/\s+/g, ' ').trim())
}

export async function signIn(page: Page, appUrl: string, email: string, password: string) {
  await visit(page, `${appUrl}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** Sign in and wait for the dashboard. */
export async function signInToDashboard(page: Page, appUrl: string, email: string, password: string) {
  await signIn(page, appUrl, email, password)
  await expectPath(page, '/')
  await expectVisible(page.getByTestId('dashboard-heading'))
}

function artefactsDir() {
  const dir = process.env.SETWELL_ARTEFACTS ?? join(process.cwd(), 'tests/artefacts')
  mkdirSync(dir, { recursive: true })
  return dir
}

export async function screenshot(page: Page, name: string) {
  const path = join(artefactsDir(), `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/**
 * Script errors the page logged. Vue hands errors in rendering to its error handler, which logs
 * them instead of throwing, so they never reach pageerror. A refused request ("Failed to load
 * resource: ... 401") is the app working as meant and is left out.
 */
export function scriptErrors(person: Person): string[] {
  return person.consoleErrors.filter(m => !/^Failed to load resource\b/.test(m))
}

/** What a person's browser went through: no script errors and nothing fetched off the machine. */
export function expectCleanRun(person: Person) {
  expect(person.pageErrors, 'uncaught errors in the page').toEqual([])
  expect(scriptErrors(person), 'script errors logged in the page').toEqual([])
  expect(person.offHostRequests, 'requests to hosts other than the app').toEqual([])
}

/**
 * One server per test file (started in beforeAll, stopped in afterAll), and the people opened in
 * a test, closed after it. When a test fails, each open page is screenshotted to the artefacts
 * and the page errors and the end of the server's output are printed.
 */
export function useE2E(extraEnv: Record<string, string> = {}) {
  let app: TestApp | undefined
  const people: Person[] = []

  beforeAll(async () => {
    app = await startApp(extraEnv)
  })

  afterEach(async (ctx) => {
    const open = people.splice(0)
    try {
      if (ctx.task.result?.state === 'fail') {
        const slug = ctx.task.name.replace(/[^\w]+/g, '-').replace(/^-|-$/g, '').slice(0, 60)
        const report: string[] = [`--- e2e failure: ${ctx.task.name}`]
        for (const [i, p] of open.entries()) {
          let shot = '(no screenshot)'
          try {
            shot = await screenshot(p.page, `FAILED-${slug}-${i + 1}`)
          }
          catch { /* the page may be gone */ }
          report.push(`person ${i + 1} at ${p.page.url()}; screenshot ${shot}`)
          if (p.pageErrors.length) report.push(`  page errors:\n    ${p.pageErrors.join('\n    ')}`)
          if (p.consoleErrors.length) report.push(`  console errors:\n    ${p.consoleErrors.join('\n    ')}`)
          if (p.offHostRequests.length) report.push(`  refused off-host requests:\n    ${p.offHostRequests.join('\n    ')}`)
        }
        report.push(`--- server output (last 6000 characters):\n${app?.output().slice(-6000) ?? '(server not started)'}`)
        console.error(report.join('\n'))
      }
    }
    finally {
      await Promise.allSettled(open.map(p => p.close()))
    }
  })

  afterAll(async () => {
    await Promise.allSettled(people.splice(0).map(p => p.close()))
    await app?.stop()
  })

  return {
    get app(): TestApp {
      if (!app) throw new Error('the app did not start (see beforeAll)')
      return app
    },
    get url(): string {
      return this.app.url
    },
    /** A new person with a browser of their own, closed after the test. */
    async open(options: OpenOptions = {}): Promise<Person> {
      const person = await openPerson(this.app.url, { ...options, alsoAllow: [this.app.stripe.url, ...(options.alsoAllow ?? [])] })
      people.push(person)
      return person
    },
  }
}

/**
 * The keys the app keeps in one of its IndexedDB stores on the phone (app/utils/idb.ts): the
 * outbox ('setwell-outbox', 'items') or room drafts ('setwell-rooms', 'drafts'). Opens the
 * database as idb-keyval does (creating the store if it is new), so the app can still open it.
 */
export async function phoneKeys(page: Page, db: string, store: string): Promise<string[]> {
  return page.evaluate(([dbName, storeName]) => new Promise<string[]>((resolve, reject) => {
    const req = indexedDB.open(dbName!)
    req.onupgradeneeded = () => req.result.createObjectStore(storeName!)
    req.onerror = () => reject(req.error)
    req.onsuccess = () => {
      const d = req.result
      const all = d.transaction(storeName!, 'readonly').objectStore(storeName!).getAllKeys()
      all.onsuccess = () => {
        d.close()
        resolve(all.result.map(String))
      }
      all.onerror = () => reject(all.error)
    }
  }), [db, store])
}

// Lighthouse 12 in the bench (`npm run bench`, section 8): how a page loads on a phone on a weak
// signal, as Core Web Vitals are judged. Lighthouse's default settings: the mobile form factor
// (a mid-range phone's screen) and its default simulated throttling (slow 4G: 150 ms round trip,
// 1.6 Mbit/s down, the CPU 4 times slower). Each run in a Chromium of its own (a fresh profile: a
// first visit, no HTTP cache, no service worker): Lighthouse's own storage reset left the service
// worker a signed-in page registers in charge of the next page, and the worker's requests do not
// carry the cookie Lighthouse adds as a header, so that page fell back to sign-in. Debian's
// Chromium, started by chrome-launcher (which Lighthouse itself uses); nothing is downloaded.
// lighthouse is pinned to 12.2.3: 13 needs Node 22.
//
// For each page: the largest contentful paint and the bytes sent over the wire (every request of
// the load, as transferred: compressed when the server compressed it), against the budgets
// (LCP under 1.5 s, under 150 KB). Signed-in pages carry the session cookie of a demo person.
import { launch } from 'chrome-launcher'
import lighthouse, { type Flags } from 'lighthouse'

export interface LighthousePage {
  name: string
  path: string
  /** Send the session cookie (the sign-in page is measured signed out: signed in, it leads to Today). */
  signedIn: boolean
}

/** A row of the bench table (scripts/bench.ts `add`). */
export interface LighthouseRow { group: string, name: string, value: number, unit: string, budget?: string, met?: boolean, note?: string }

export const LCP_BUDGET_MS = 1500
export const TRANSFER_BUDGET_KB = 150

/**
 * Run Lighthouse on each page (`runs` times each; the figures of the run with the median LCP) and
 * return two rows a page: LCP and transfer size, each with its budget, met or missed.
 */
export async function lighthouseRows(origin: string, cookie: string, pages: LighthousePage[], runs = Number(process.env.SETWELL_BENCH_LIGHTHOUSE_RUNS ?? 3)): Promise<LighthouseRow[]> {
  const rows: LighthouseRow[] = []
  for (const page of pages) {
    const results: { lcp: number, bytes: number, requests: number, score: number, fcp: number, unusedJsKb: number }[] = []
    let problem = ''
    for (let i = 0; i < runs; i++) {
      const chrome = await launch({
        chromePath: process.env.CHROME_PATH ?? '/usr/bin/chromium',
        chromeFlags: ['--headless=new', '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
        logLevel: 'silent',
      })
      const flags: Flags = {
        port: chrome.port,
        output: 'json',
        logLevel: 'error',
        onlyCategories: ['performance'],
        extraHeaders: page.signedIn ? { Cookie: cookie } : undefined,
      }
      const result = await lighthouse(`${origin}${page.path}`, flags).finally(() => chrome.kill())
      const lhr = result?.lhr
      if (!lhr || lhr.runtimeError) {
        problem = lhr?.runtimeError?.message ?? 'no result'
        continue
      }
      // the page asked for must be the page measured: a signed-in page that fell back to the
      // sign-in page (a lost cookie) would measure the wrong thing
      if (new URL(lhr.finalDisplayedUrl).pathname !== new URL(`${origin}${page.path}`).pathname) {
        problem = `ended on ${lhr.finalDisplayedUrl}`
        continue
      }
      const audit = (id: string) => lhr.audits[id]?.numericValue ?? Number.NaN
      const requests = (lhr.audits['network-requests']?.details as { items?: unknown[] } | undefined)?.items?.length ?? 0
      const unused = (lhr.audits['unused-javascript']?.details as { overallSavingsBytes?: number } | undefined)?.overallSavingsBytes ?? 0
      results.push({ lcp: audit('largest-contentful-paint'), fcp: audit('first-contentful-paint'), bytes: audit('total-byte-weight'), requests, score: (lhr.categories.performance?.score ?? 0) * 100, unusedJsKb: unused / 1024 })
    }
    if (!results.length) {
      rows.push({ group: 'lighthouse', name: `${page.name}: largest contentful paint`, value: Number.NaN, unit: 'ms', budget: `< ${LCP_BUDGET_MS} ms`, met: false, note: `Lighthouse failed: ${problem}` })
      continue
    }
    results.sort((a, b) => a.lcp - b.lcp)
    const r = results[Math.floor(results.length / 2)]!
    const kb = r.bytes / 1024
    const spread = results.length > 1 ? `, LCP ${results.map(x => (x.lcp / 1000).toFixed(2)).join('/')} s over ${results.length} runs` : ''
    rows.push({ group: 'lighthouse', name: `${page.name}: largest contentful paint (mobile, slow 4G)`, value: r.lcp, unit: 'ms', budget: `< ${LCP_BUDGET_MS} ms`, met: r.lcp < LCP_BUDGET_MS, note: `first contentful paint ${r.fcp.toFixed(0)} ms, performance score ${r.score.toFixed(0)}${spread}` })
    rows.push({ group: 'lighthouse', name: `${page.name}: transfer size`, value: kb, unit: 'KB', budget: `< ${TRANSFER_BUDGET_KB} KB`, met: kb < TRANSFER_BUDGET_KB, note: `${r.requests} requests; unused JavaScript ${r.unusedJsKb.toFixed(0)} KB` })
  }
  return rows
}

/// <reference lib="webworker" />
// Setwell's service worker (built by @vite-pwa/nuxt with the injectManifest strategy, so this file
// is ours and Workbox supplies the parts). What it does, for a phone inside a house with no signal:
// - the app's code, styles, fonts and icons are precached at install (the list is made at build);
// - each page opened with a signal is kept as the server drew it (stamped with when); a page opened
//   with no signal is the kept copy, or else the app shell (the app with no server-side data, which
//   draws the page from the data below), never the browser's "no internet" page;
// - GET /api/… answers are network first: each good answer is kept, stamped with when it was kept
//   (x-setwell-saved-at), and handed back when the network fails or takes too long, so the page can
//   say how old it is;
// - a 401 (signed out, or the session ended) empties the kept answers: a signed-out phone shows
//   nothing from the cache. Sign-out in the app empties them too (app/utils/offline-cache.ts).
// Writes are not handled here: they go through the outbox (app/stores/outbox.ts), which keeps them
// in IndexedDB and sends them in order.
import { cleanupOutdatedCaches, precacheAndRoute } from 'workbox-precaching'
import { registerRoute } from 'workbox-routing'
import { NetworkFirst } from 'workbox-strategies'
import type { WorkboxPlugin } from 'workbox-core'
import { APP_SHELL_URL, DATA_CACHE, NETWORK_WAIT_SECONDS, PAGES_CACHE, PUBLIC_PAGES, SAVED_AT_HEADER, SAVED_AT_META, SHELL_CACHE } from '../utils/offline-names'

declare let self: ServiceWorkerGlobalScope

precacheAndRoute(self.__WB_MANIFEST)
cleanupOutdatedCaches()

/** Keep the app shell (fetched again at every install: it names the current build's scripts). */
async function keepShell() {
  const cache = await caches.open(SHELL_CACHE)
  const res = await fetch(APP_SHELL_URL, { credentials: 'same-origin', cache: 'no-store' })
  if (res.ok) await cache.put(APP_SHELL_URL, res)
}

self.addEventListener('install', (event) => {
  event.waitUntil(keepShell().then(() => self.skipWaiting()))
})
self.addEventListener('activate', (event) => {
  // pages kept by an older build name scripts this one no longer has
  event.waitUntil(caches.delete(PAGES_CACHE).then(() => self.clients.claim()))
})

// Pages: the network when it answers (a good page is kept, stamped with when); with no signal, the
// page as kept, else the app shell, which draws the page from kept data.
registerRoute(
  ({ request, url }) => request.mode === 'navigate' && url.origin === self.location.origin && !url.pathname.startsWith('/api/'),
  async ({ request, event }) => {
    let res: Response
    try {
      res = await fetchWithin(request, NETWORK_WAIT_SECONDS * 1000)
    }
    catch {
      const kept = await caches.match(request.url, { cacheName: PAGES_CACHE, ignoreVary: true })
      const shell = kept ?? await caches.match(APP_SHELL_URL, { cacheName: SHELL_CACHE })
      return shell ?? Response.error()
    }
    // kept while the page is already on its way to the screen
    ;(event as ExtendableEvent).waitUntil(keepPage(request.url, res.clone()))
    return res
  },
)

/** Keep a page as the server drew it, with when (a meta tag the app reads), for use with no signal. */
async function keepPage(url: string, res: Response) {
  const path = new URL(url).pathname
  // sent to sign in: the session is over, and nothing kept may be shown again
  if (res.redirected && new URL(res.url).pathname === '/sign-in') return forgetData()
  if (res.status !== 200 || res.redirected || PUBLIC_PAGES.some(p => path.startsWith(p)) || !(res.headers.get('content-type') ?? '').includes('text/html')) return
  const html = await res.text()
  const stamped = html.replace('<head>', `<head><meta name="${SAVED_AT_META}" content="${new Date().toISOString()}">`)
  const cache = await caches.open(PAGES_CACHE)
  await cache.put(url, new Response(stamped, { status: 200, headers: { 'content-type': 'text/html;charset=utf-8' } }))
}

/** A fetch that gives up after ms (a phone showing one bar can hang for a minute). */
async function fetchWithin(request: Request, ms: number): Promise<Response> {
  const ctrl = new AbortController()
  const timer = setTimeout(() => ctrl.abort(), ms)
  try {
    return await fetch(request, { signal: ctrl.signal })
  }
  finally {
    clearTimeout(timer)
  }
}

async function forgetData() {
  await Promise.all([caches.delete(DATA_CACHE), caches.delete(PAGES_CACHE)])
}

const stampAndGuard: WorkboxPlugin = {
  // only whole, good answers are kept, each with the moment it was kept
  cacheWillUpdate: async ({ response }) => {
    if (response.status !== 200) return null
    const headers = new Headers(response.headers)
    headers.set(SAVED_AT_HEADER, new Date().toISOString())
    // the body kept is the decoded one: the server's compression (and length) no longer describe it
    headers.delete('content-encoding')
    headers.delete('content-length')
    return new Response(await response.blob(), { status: 200, statusText: response.statusText, headers })
  },
  // signed out (or the session ended): nothing kept may be shown again
  fetchDidSucceed: async ({ response }) => {
    if (response.status === 401) await forgetData()
    return response
  },
}

// Data: network first, the kept answer when there is no signal. Not the session routes, customers'
// pages' data, exports or downloads (large, and never needed on site).
registerRoute(
  ({ request, url }) => request.method === 'GET' && url.origin === self.location.origin && url.pathname.startsWith('/api/')
    && !['/api/auth/', '/api/_auth/', '/api/public/'].some(p => url.pathname.startsWith(p)) && !url.pathname.includes('/export'),
  new NetworkFirst({ cacheName: DATA_CACHE, networkTimeoutSeconds: NETWORK_WAIT_SECONDS, plugins: [stampAndGuard] }),
)

/**
 * Keep pages and data the person may need with no signal, fetched now (their jobs for the next
 * days and the visits booked for them, chosen by the app: app/utils/offline-cache.ts). Stops at the
 * first failure (no signal: the app asks again later). Answers on the message's port: how many kept.
 */
async function keepUrls(urls: string[]): Promise<number> {
  let kept = 0
  for (const url of urls) {
    const href = new URL(url, self.location.origin).href
    let res: Response
    try {
      res = await fetchWithin(new Request(href, { credentials: 'same-origin' }), 20_000)
    }
    catch {
      break
    }
    if (res.status === 401) {
      await forgetData()
      break
    }
    if (new URL(href).pathname.startsWith('/api/')) {
      const stamped = await stampAndGuard.cacheWillUpdate!({ response: res } as Parameters<NonNullable<WorkboxPlugin['cacheWillUpdate']>>[0])
      if (stamped) await (await caches.open(DATA_CACHE)).put(href, stamped)
    }
    else {
      await keepPage(href, res)
    }
    kept++
  }
  return kept
}

// The app asks: keep these (for no signal), or drop everything kept (sign-out, another firm chosen).
self.addEventListener('message', (event) => {
  const msg = event.data as { type?: string, urls?: unknown } | null
  if (msg?.type === 'forget-data') event.waitUntil(forgetData().then(() => event.ports[0]?.postMessage({ ok: true })))
  if (msg?.type === 'keep' && Array.isArray(msg.urls)) {
    const urls = msg.urls.filter((u): u is string => typeof u === 'string' && u.startsWith('/'))
    event.waitUntil(keepUrls(urls).then(kept => event.ports[0]?.postMessage({ kept })))
  }
})

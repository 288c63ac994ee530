// The phone side of working with no signal (DEVELOPERS.md "Offline"):
// - every answer the service worker hands back from what the phone kept carries when it was kept;
//   the shell says so (ShellOffline);
// - once someone of a firm is signed in: the service worker is registered, their jobs for the next
//   7 days and the visits booked for them are kept (at start, when the signal returns, and hourly
//   while Setwell is on screen: app/utils/offline-start.ts), and writes waiting in the outbox and
//   rooms waiting on the phone go when the signal returns. That part is loaded only then (after the page has loaded): the sign-in page and
//   customers' pages do without it.
import { SAVED_AT_HEADER } from '~/utils/offline-names'

export default defineNuxtPlugin((nuxtApp) => {
  const offline = useOfflineStore()
  const shell = useShellStore()

  const base = globalThis.$fetch
  globalThis.$fetch = base.create({
    onResponse({ response }) {
      const at = response.headers.get(SAVED_AT_HEADER)
      if (at) offline.noteSavedAt(at)
      // the service worker's own "no signal" answer (503) is not the server
      else if (response.status !== 503) offline.unreachable = false
    },
    onRequestError() {
      offline.unreachable = true
    },
  }) as typeof base

  offline.readPageMeta()
  useRouter().beforeEach((to, from) => {
    if (to.path !== from.path) offline.pageSavedAt = null
  })

  let started = false
  async function start() {
    if (started || !shell.me) return
    started = true
    const { startOffline } = await import('~/utils/offline-start')
    startOffline()
  }
  // on a page load, once the page is in and the phone is idle: the service worker's first download
  // (the app's files) and what is kept for no signal never compete with the page's own first paint;
  // on a sign-in within the app, at once
  nuxtApp.hook('app:mounted', () => {
    const idle = () => ('requestIdleCallback' in window ? requestIdleCallback(() => void start(), { timeout: 2000 }) : setTimeout(() => void start(), 0))
    if (document.readyState === 'complete') idle()
    else window.addEventListener('load', idle, { once: true })
  })
  watch(() => shell.me?.user.id, () => void start())
})

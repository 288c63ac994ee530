// The phone side of working with no signal (DEVELOPERS.md "Offline"):
// - every answer the service worker hands back from what the phone kept carries when it was kept;
//   the shell says so (ShellOffline);
// - with a signal, this person's jobs for the next 7 days and the visits booked for them are kept,
//   at start, when the signal returns and every 15 minutes;
// - writes waiting in the outbox and rooms waiting on the phone go when the signal returns.
import { useEventListener, useIntervalFn } from '@vueuse/core'
import { keepUrls, urlsToKeep } from '~/utils/offline-cache'
import { SAVED_AT_HEADER } from '~/utils/offline-names'

const KEEP_EVERY_MS = 15 * 60_000

export default defineNuxtPlugin((nuxtApp) => {
  const offline = useOfflineStore()
  const shell = useShellStore()
  const outbox = useOutboxStore()
  const rooms = useVisitDraftStore()

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

  let keeping = false
  async function keep(force = false) {
    const me = shell.me
    if (!me || !navigator.onLine || keeping || !('serviceWorker' in navigator)) return
    const key = `setwell:kept:${me.user.id}:${me.firm.id}`
    const last = Number(localStorage.getItem(key) ?? 0)
    offline.keptAt = last || null
    if (!force && Date.now() - last < KEEP_EVERY_MS) return
    keeping = true
    try {
      const urls = await urlsToKeep(me)
      if (await keepUrls(urls) === urls.length) {
        localStorage.setItem(key, String(Date.now()))
        offline.keptAt = Date.now()
      }
    }
    catch { /* no signal after all: next time */ }
    finally {
      keeping = false
    }
  }

  nuxtApp.hook('app:mounted', () => {
    void outbox.load().then(() => outbox.flush())
    rooms.restore()
    void keep()
  })
  // is the server there? (an answer from it, not from the phone, puts "No signal" away)
  const probe = () => $fetch('/api/health').catch(() => null)
  useIntervalFn(() => {
    if (offline.unreachable && navigator.onLine) void probe()
  }, 20_000)
  useEventListener(window, 'online', () => {
    void probe()
    void outbox.flush()
    void rooms.sendWaiting()
    void keep(true)
  })
  useIntervalFn(() => void keep(), KEEP_EVERY_MS)
  // signed in (or into another firm): keep that person's work
  watch(() => shell.me && `${shell.me.user.id}:${shell.me.firm.id}`, (now, before) => {
    if (now && now !== before) void keep(true)
  })
})

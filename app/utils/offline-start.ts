// The signed-in part of app/plugins/offline.client.ts, loaded only once someone of a firm is signed
// in (a separate chunk: the outbox, room drafts and IndexedDB stay off the sign-in page).
import { useEventListener, useIntervalFn } from '@vueuse/core'
import { keepUrls, urlsToKeep } from '~/utils/offline-cache'
import { KEEP_EVERY_MS, keepDue } from '#shared/utils/offline-plan'

export function startOffline() {
  const offline = useOfflineStore()
  const shell = useShellStore()
  const outbox = useOutboxStore()
  const rooms = useVisitDraftStore()

  // the service worker, for people of a firm only (never a customer on a quote link)
  function register() {
    if (!('serviceWorker' in navigator)) return
    navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => { /* not on plain http off localhost: Setwell still works online */ })
  }

  let keeping = false
  async function keep(force = false) {
    const me = shell.me
    if (!me || !navigator.onLine || keeping || !('serviceWorker' in navigator)) return
    const key = `setwell:kept:${me.user.id}:${me.firm.id}`
    const last = Number(localStorage.getItem(key) ?? 0)
    offline.keptAt = last || null
    if (!keepDue(Date.now(), last, force, document.visibilityState === 'hidden')) return
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

  register()
  void outbox.load().then(() => outbox.flush())
  void rooms.restore()
  void keep()

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
  useEventListener(document, 'visibilitychange', () => {
    if (document.visibilityState === 'visible') void keep()
  })
  // signed in as someone else, or into another firm: keep that person's work
  watch(() => shell.me && `${shell.me.user.id}:${shell.me.firm.id}`, (now, before) => {
    if (now && now !== before) void keep(true)
  })
}

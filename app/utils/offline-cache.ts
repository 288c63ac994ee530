// What the phone keeps for no signal, and forgetting it. The service worker does the keeping
// (app/service-worker/sw.ts); the app chooses what: the signed-in person's jobs for the next 7
// days (with their set plans, day sheets and set log page) and the visits booked for them.
import type { Me } from '~/stores/shell'
import { addDays, londonToday } from '#shared/utils/dates'
import { KEEP_DAYS, pathsToKeep, type KeepDay, type KeepVisit } from '#shared/utils/offline-plan'
import { DATA_CACHE, PAGES_CACHE } from '~/utils/offline-names'

/** The pages and data to keep for this person (paths), found with a signal. */
export async function urlsToKeep(me: Me, now = new Date()): Promise<string[]> {
  const from = londonToday(now)
  const to = addDays(from, KEEP_DAYS - 1)
  const allowed = new Set(me.permissions)
  const days = allowed.has('jobs:read-assigned') ? await $fetch<KeepDay[]>('/api/diary', { query: { from, to } }) : []
  const visits = allowed.has('ledger:write') || allowed.has('jobs:read-assigned') ? await $fetch<KeepVisit[]>('/api/visits', { query: { limit: 200 } }) : []
  return pathsToKeep({ userId: me.user.id, canLog: allowed.has('work:log') }, days, visits, from, to)
}

/** Ask the service worker to keep these; resolves with how many it kept (0 with no worker). */
export async function keepUrls(urls: string[]): Promise<number> {
  const reg = await navigator.serviceWorker?.ready
  const worker = reg?.active
  if (!worker) return 0
  return new Promise<number>((resolve) => {
    const channel = new MessageChannel()
    const timer = setTimeout(() => resolve(0), 120_000)
    channel.port1.onmessage = (e: MessageEvent<{ kept?: number }>) => {
      clearTimeout(timer)
      resolve(e.data?.kept ?? 0)
    }
    worker.postMessage({ type: 'keep', urls }, [channel.port2])
  })
}

/** Drop every page and answer kept on this phone (signing out, or another firm chosen). */
export async function forgetKept() {
  if (typeof caches === 'undefined') return
  await Promise.all([caches.delete(DATA_CACHE), caches.delete(PAGES_CACHE)])
}

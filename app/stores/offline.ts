import { defineStore } from 'pinia'
import { SAVED_AT_META } from '~/utils/offline-names'

/**
 * What the shell says about the signal: whether the page on screen came from what the phone kept
 * (and from when: the oldest part of it), and when this person's jobs and visits were last kept.
 */
export const useOfflineStore = defineStore('offline', () => {
  /** The oldest kept part of the page on screen (ISO), or null when all of it came from the server. */
  const pageSavedAt = ref<string | null>(null)
  /** When the phone last kept this person's jobs and visits for no signal (ms), per person and firm. */
  const keptAt = ref<number | null>(null)

  /**
   * The server did not answer the last time it was asked (the answer came from the phone, or none
   * came). Phones often say they are online with no real signal (one bar, a captive network), so
   * the shell does not trust navigator.onLine alone.
   */
  const unreachable = ref(false)

  function noteSavedAt(iso: string) {
    unreachable.value = true
    if (!pageSavedAt.value || iso < pageSavedAt.value) pageSavedAt.value = iso
  }

  /** A page the service worker handed back as kept carries the time in its head. */
  function readPageMeta() {
    const at = document.querySelector(`meta[name="${SAVED_AT_META}"]`)?.getAttribute('content')
    if (at) noteSavedAt(at)
  }

  /** The person switched firm: what was said about the first firm's kept pages is not true of the next. */
  function forgetFirm() {
    pageSavedAt.value = null
    keptAt.value = null
  }

  return { pageSavedAt, keptAt, unreachable, noteSavedAt, readPageMeta, forgetFirm }
})

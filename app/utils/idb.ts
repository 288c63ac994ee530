// The phone's own storage for work not yet sent (IndexedDB through idb-keyval): it survives a
// reload and the phone being switched off, unlike memory, and holds photos, unlike localStorage.
import { clear, createStore, del, entries, set, type UseStore } from 'idb-keyval'

let outbox: UseStore | undefined
let rooms: UseStore | undefined
/** Writes waiting to be sent (app/stores/outbox.ts), and what the server answered for those a later one needs (a log's id for its photo). */
export const outboxStore = () => (outbox ??= createStore('setwell-outbox', 'items'))
/** Rooms being measured on a visit (app/stores/visitDraft.ts). */
export const roomStore = () => (rooms ??= createStore('setwell-rooms', 'drafts'))

export async function readAll<T>(store: UseStore): Promise<[string, T][]> {
  try {
    return (await entries<string, T>(store))
  }
  catch {
    return [] // private browsing or storage blocked: the app still works, nothing is kept
  }
}
export async function keep(store: UseStore, key: string, value: unknown) {
  try {
    await set(key, value, store)
  }
  catch (err) {
    // storage full or blocked: the item still lives in memory
    console.warn('Setwell could not keep this on the phone:', err)
  }
}
export async function drop(store: UseStore, key: string) {
  try {
    await del(key, store)
  }
  catch { /* as above */ }
}
export async function dropAll(store: UseStore) {
  try {
    await clear(store)
  }
  catch { /* as above */ }
}

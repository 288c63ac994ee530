import { defineStore } from 'pinia'
import { useEventListener, useIntervalFn } from '@vueuse/core'
import type { FetchError } from 'ofetch'
import { drop, dropAll, keep, outboxStore, readAll } from '~/utils/idb'
import { formErrors } from '~/utils/errors'
import { newId } from '~/utils/ids'

// The outbox: writes made on the phone (a set log, its photos, a problem found, a visit marked
// done) that go to the server in the order they were made. With a signal a write goes at once and
// the page gets the answer as usual; with none (or no answer) it is kept in IndexedDB, counted in
// the shell as "waiting to send", and sent by itself when the signal returns. Each write carries
// an id made on the phone (its `id`, sent as clientId), so a resend after a lost answer is stored
// once by the server. A write the server refuses is never dropped silently: it stays, with the
// server's words, until the person sends it again or lets it go. (Rooms measured on a visit have
// their own store, app/stores/visitDraft.ts, which merges changes; its waiting rooms are counted
// with these.)

export type OutboxKind = 'set-log' | 'problem' | 'photo' | 'visit-done'
/** waiting: not sent yet; sending; conflict: someone changed the same thing (409); failed: refused for another reason. */
export type OutboxState = 'waiting' | 'sending' | 'conflict' | 'failed'

export interface OutboxPhoto {
  blob: Blob
  name: string
  caption: string
  /** What it belongs to, as the upload route names it (setLogId, visitId, …). */
  target: Record<string, string>
  /** The outbox item (a set log) whose server id goes in target.setLogId once it is sent. */
  setLogOf?: string
}

export interface OutboxItem {
  /** Made on the phone; sent as clientId so a resend is stored once. */
  id: string
  /** Only sent while the same person is signed in to the same firm. */
  owner: string
  kind: OutboxKind
  /** In words, for the list of what is waiting ("Set 1 on job 12"). */
  label: string
  /** The page it came from, to go back to it. */
  link: string
  method: 'POST' | 'PUT' | 'PATCH'
  url: string
  body?: Record<string, unknown>
  photo?: OutboxPhoto
  state: OutboxState
  /** What the server said when it refused (conflict or failed). */
  message?: string
  createdAt: number
  /** Sent in this order. */
  seq: number
}

export interface OutboxResult<T = unknown> { queued: boolean, data?: T }

/** What the server answered for a write that another one needs (a set log's id, for its photo). */
interface Done { logId?: string, photoId?: string }

/** $fetch with the URL as a plain string: the queue's URLs are made at run time, so Nitro's typed routes cannot help. */
const send$ = (url: string, options: { method: string, body: unknown, timeout: number }) => ($fetch as unknown as (u: string, o: typeof options) => Promise<unknown>)(url, options)

const RETRY_MS = 20_000
const SEND_TIMEOUT_MS = 30_000
const itemKey = (id: string) => `item:${id}`
const doneKey = (id: string) => `done:${id}`

function isItem(v: unknown): v is OutboxItem {
  const i = v as OutboxItem
  return Boolean(i && typeof i === 'object' && typeof i.id === 'string' && typeof i.url === 'string' && typeof i.seq === 'number')
}

/** No answer at all: no signal, a dead connection, a timeout, or the service worker's "no signal" answer. */
export function noAnswer(err: unknown): boolean {
  const fe = err as FetchError
  return !fe?.response || fe.response.status === 503 || fe.response.status === 504
}

export const useOutboxStore = defineStore('outbox', () => {
  const items = ref<OutboxItem[]>([])
  const done = ref<Record<string, Done>>({})
  const loaded = ref(false)
  const running = ref(false)
  let counter = 0

  const shell = useShellStore()
  const owner = computed(() => (shell.me ? `${shell.me.user.id}:${shell.me.firm.id}` : ''))
  /** This person's items, in the order they go. */
  const mine = computed(() => items.value.filter(i => i.owner === owner.value).sort((a, b) => a.seq - b.seq))
  const waiting = computed(() => mine.value.filter(i => i.state === 'waiting' || i.state === 'sending'))
  const needsYou = computed(() => mine.value.filter(i => i.state === 'conflict' || i.state === 'failed'))

  async function load() {
    if (!import.meta.client || loaded.value) return
    loaded.value = true
    for (const [key, value] of await readAll<unknown>(outboxStore())) {
      if (key.startsWith('item:') && isItem(value)) {
        if (value.state === 'sending') value.state = 'waiting' // cut off by a closed page: it goes again
        if (!items.value.some(i => i.id === value.id)) items.value.push(value)
      }
      else if (key.startsWith('done:')) {
        done.value[key.slice(5)] = value as Done
      }
    }
    counter = Math.max(0, ...items.value.map(i => i.seq))
  }

  /** IndexedDB keeps plain data only (a Vue proxy in a body would make the write fail): the body as JSON, the photo's Blob as it is. */
  function save(item: OutboxItem) {
    const plain: OutboxItem = { ...toRaw(item), body: item.body ? JSON.parse(JSON.stringify(item.body)) : undefined, photo: item.photo ? { ...toRaw(item.photo), target: { ...item.photo.target } } : undefined }
    return keep(outboxStore(), itemKey(item.id), plain)
  }

  async function remove(id: string) {
    items.value = items.value.filter(i => i.id !== id)
    await drop(outboxStore(), itemKey(id))
  }

  function make(input: Omit<OutboxItem, 'owner' | 'state' | 'createdAt' | 'seq' | 'id'> & { id?: string }): OutboxItem {
    // a copy of the body as sent: the form it came from may change after
    const body = input.body ? JSON.parse(JSON.stringify(input.body)) as Record<string, unknown> : undefined
    return { ...input, body, id: input.id ?? newId(), owner: owner.value, state: 'waiting', createdAt: Date.now(), seq: Date.now() * 1000 + (++counter % 1000) }
  }

  /** One request for an item: the server's answer, or the error as thrown. */
  async function request<T>(item: OutboxItem): Promise<T> {
    if (item.kind === 'photo' && item.photo) {
      const fd = new FormData()
      const target = { ...item.photo.target }
      if (item.photo.setLogOf) {
        const logId = done.value[item.photo.setLogOf]?.logId
        if (!logId) throw new Error('The set log it belongs to has not been sent yet.')
        target.setLogId = logId
      }
      for (const [k, v] of Object.entries(target)) fd.append(k, v)
      fd.append('clientId', item.id)
      if (item.photo.caption) fd.append('caption', item.photo.caption)
      fd.append('file', item.photo.blob, item.photo.name)
      return await send$(item.url, { method: 'POST', body: fd, timeout: SEND_TIMEOUT_MS }) as T
    }
    return await send$(item.url, { method: item.method, body: { ...item.body, clientId: item.id }, timeout: SEND_TIMEOUT_MS }) as T
  }

  async function settle(item: OutboxItem, data: unknown) {
    const answer = data as { logId?: string, id?: string } | null
    if (item.kind === 'set-log' || item.kind === 'problem') {
      done.value[item.id] = { logId: answer?.logId }
      await keep(outboxStore(), doneKey(item.id), { logId: answer?.logId })
    }
    await remove(item.id)
  }

  /** Waits until the item a photo belongs to has been sent (false while it is still on the phone). */
  function ready(item: OutboxItem): boolean {
    const after = item.photo?.setLogOf
    return !after || Boolean(done.value[after]?.logId)
  }

  /**
   * Send a write: at once when there is a signal (the page gets the server's answer, or its error
   * to show on the form); kept on the phone when there is none. Earlier waiting items go first.
   */
  async function send<T>(input: Parameters<typeof make>[0]): Promise<OutboxResult<T>> {
    await load()
    const made = make(input)
    const earlier = waiting.value.some(i => i.seq < made.seq)
    // marked as on its way before anything else can run, so a flush already going leaves it alone
    made.state = 'sending'
    items.value.push(made)
    const item = items.value[items.value.length - 1]!
    if (!navigator.onLine || earlier) {
      item.state = 'waiting'
      await save(item)
      void flush()
      return { queued: true }
    }
    await save(item)
    try {
      const data = await request<T>(item)
      await settle(item, data)
      return { queued: false, data }
    }
    catch (err) {
      if (noAnswer(err)) {
        item.state = 'waiting'
        await save(item)
        return { queued: true }
      }
      // refused while the person is looking at the form: it shows there, nothing is kept
      await remove(item.id)
      throw err
    }
  }

  /** Keep a write to go in its turn (a photo after its set log); never throws: a refusal is kept, to show on /waiting. */
  async function enqueue(input: Parameters<typeof make>[0]): Promise<OutboxItem> {
    await load()
    items.value.push(make(input))
    const item = items.value[items.value.length - 1]!
    await save(item)
    void flush()
    return item
  }

  /** Send what is waiting, in order. Stops at the first write with no answer (the signal went again). */
  async function flush() {
    if (!import.meta.client || running.value || !navigator.onLine || !owner.value) return
    running.value = true
    try {
      await load()
      for (const item of [...mine.value]) {
        if (item.state !== 'waiting' || !ready(item)) continue
        item.state = 'sending'
        try {
          await settle(item, await request(item))
        }
        catch (err) {
          if (noAnswer(err)) {
            item.state = 'waiting'
            break
          }
          const fe = err as FetchError
          item.state = fe.statusCode === 409 ? 'conflict' : 'failed'
          item.message = formErrors(err).message
          await save(item)
        }
      }
    }
    finally {
      running.value = false
    }
  }

  /** Try a refused write again (after the person has read why), at the end of the queue. */
  async function retry(id: string) {
    const item = items.value.find(i => i.id === id)
    if (!item) return
    item.state = 'waiting'
    item.message = undefined
    item.seq = Date.now() * 1000 + (++counter % 1000)
    await save(item)
    await flush()
  }

  /** Let a refused write go (the person chose the server's version). */
  const letGo = (id: string) => remove(id)

  /** Everything of this phone's, gone (signing out). */
  async function forget() {
    items.value = []
    done.value = {}
    await dropAll(outboxStore())
  }

  if (import.meta.client) {
    useEventListener(window, 'online', () => void flush())
    // a phone can claim to be online with no real signal, so waiting writes are also retried now and then
    useIntervalFn(() => {
      if (waiting.value.length) void flush()
    }, RETRY_MS)
  }

  return { items, mine, waiting, needsYou, load, send, enqueue, flush, retry, letGo, forget }
})

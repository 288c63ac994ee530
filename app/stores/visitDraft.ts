import { defineStore } from 'pinia'
import { useEventListener, useIntervalFn } from '@vueuse/core'
import type { FetchError } from 'ofetch'
import type { Room } from '#shared/schemas/room'
import type { Background, ConditionKind, CornerKind, OpeningKind, SurfaceKind } from '#shared/utils/ledger'
import { formatSquareMetres, parseMetres, parseSquareMetres } from '#shared/utils/measure'
import { roomTotals, type RoomTotals } from '#shared/utils/room-area'
import { formErrors, type FormErrors } from '~/utils/errors'
import { drop, dropAll, keep, readAll, roomStore } from '~/utils/idb'
import { newId } from '~/utils/ids'

// The rooms being measured on a visit, as typed: kept in IndexedDB on every change (one key
// per visit and room), so nothing is lost when the signal drops, the phone locks or is switched
// off, or the page is reloaded (drafts an older Setwell kept in localStorage are moved over).
// "Save room" sends the room whole; with no signal it waits and goes by itself when the phone is
// back online. A draft is cleared once the server has it.

/** A room as the server answers it (GET /api/visits/:id/rooms, PUT …/rooms/:roomId). */
export type SavedRoom = Room & { id: string, visitId: string, updatedAt: string, totals: RoomTotals }

// Figures stay the strings people type until they are sent: "2.4" must not turn into "2.40" under their thumb.
/** fromLeft / fromFloor: where it is, when known (empty: drawn centred); drafts kept before they existed have none. */
export interface DraftOpening { id: string, kind: OpeningKind, width: string, height: string, fromLeft?: string, fromFloor?: string }
export interface DraftCondition { id: string, kind: ConditionKind, area: string, length: string, outOfTrue: string, scrimmed: boolean, notes: string }
export interface DraftSurface {
  id: string
  kind: SurfaceKind
  label: string
  length: string
  second: string
  background: Background
  notes: string
  openings: DraftOpening[]
  conditions: DraftCondition[]
}
export interface DraftCorner { id: string, surfaceAId: string, surfaceBId: string, kind: CornerKind, length: string, returnWidth: string, needsBead: boolean, packedOut: boolean }
export interface DraftRoom { id: string, visitId: string, revision: number, name: string, position: number, notes: string, surfaces: DraftSurface[], corners: DraftCorner[] }

/**
 * editing: on the phone, not sent (shown as "Not sent yet" once changed); waiting: Save was
 * pressed with no signal, it goes by itself; sending; conflict: the room changed elsewhere
 * (`conflict` holds the saved room, or null when it was deleted); failed: the server refused it.
 */
export type DraftState = 'editing' | 'waiting' | 'sending' | 'conflict' | 'failed'

export interface DraftEntry {
  key: string
  room: DraftRoom
  state: DraftState
  /** Changed since it was opened from the saved room (a draft nobody changed is dropped on close). */
  dirty: boolean
  /** Bumped on every change: an edit made while a send is on its way is kept. */
  version: number
  errors: FormErrors
  conflict?: SavedRoom | null
  changedAt: number
}

export type SendResult = 'sent' | 'waiting' | 'invalid' | 'conflict' | 'refused' | 'busy'

const PREFIX = 'setwell:room-draft:'
const RETRY_MS = 20_000
const SEND_TIMEOUT_MS = 20_000
const noErrors = (): FormErrors => ({ message: '', fields: {} })

export const draftKey = (visitId: string, roomId: string) => `${PREFIX}${visitId}:${roomId}`

/** Millimetres as the metres a person would have typed: 2400 -> '2.40', 2405 -> '2.405'. Exact, unlike formatMetres. */
export function metresInput(mm: number | null | undefined): string {
  if (mm === null || mm === undefined) return ''
  const s = `${Math.floor(mm / 1000)}.${String(mm % 1000).padStart(3, '0')}`
  return s.endsWith('0') ? s.slice(0, -1) : s
}

const CONDITION_FIELDS: Record<ConditionKind, { area?: boolean, length?: boolean, outOfTrue?: boolean, scrim?: boolean }> = {
  'patch-undercoat': { area: true },
  'patch-masonry': { area: true },
  'crack': { length: true, scrim: true },
  'frame-gap': { length: true, scrim: true },
  'out-of-true': { outOfTrue: true },
  'damaged-corner': { length: true },
  'textured-coating': { area: true },
}
/** Which figures each kind of finding records (the others are sent empty). */
export const conditionFields = (kind: ConditionKind) => CONDITION_FIELDS[kind]

function wholeMm(input: string): number | null {
  const t = input.trim()
  return /^\d{1,4}$/.test(t) ? Number(t) : null
}

export function blankRoom(visitId: string, position: number): DraftRoom {
  return { id: newId(), visitId, revision: 0, name: '', position, notes: '', surfaces: [], corners: [] }
}

export function blankSurface(kind: SurfaceKind): DraftSurface {
  return { id: newId(), kind, label: '', length: '', second: '', background: 'sound-plaster', notes: '', openings: [], conditions: [] }
}

export function fromSaved(saved: SavedRoom): DraftRoom {
  return {
    id: saved.id,
    visitId: saved.visitId,
    revision: saved.revision,
    name: saved.name,
    position: saved.position,
    notes: saved.notes,
    surfaces: saved.surfaces.map(s => ({
      id: s.id,
      kind: s.kind,
      label: s.label,
      length: metresInput(s.lengthMm),
      second: metresInput(s.secondMm),
      background: s.background,
      notes: s.notes,
      openings: s.openings.map(o => ({ id: o.id, kind: o.kind, width: metresInput(o.widthMm), height: metresInput(o.heightMm), fromLeft: metresInput(o.fromLeftMm), fromFloor: metresInput(o.fromFloorMm) })),
      conditions: s.conditions.map(c => ({
        id: c.id,
        kind: c.kind,
        area: c.areaCm2 === null ? '' : formatSquareMetres(c.areaCm2),
        length: metresInput(c.lengthMm),
        outOfTrue: c.outOfTrueMm === null ? '' : String(c.outOfTrueMm),
        scrimmed: c.scrimmed,
        notes: c.notes,
      })),
    })),
    corners: saved.corners.map(c => ({
      id: c.id,
      surfaceAId: c.surfaceAId,
      surfaceBId: c.surfaceBId,
      kind: c.kind,
      length: metresInput(c.lengthMm),
      returnWidth: metresInput(c.returnWidthMm),
      needsBead: c.needsBead,
      packedOut: c.packedOut,
    })),
  }
}

/** The body for PUT, before validation: a figure that does not read as metres is sent as null, which roomSchema names. */
export function toBody(room: DraftRoom) {
  const m = (s: string) => (s.trim() === '' ? null : parseMetres(s))
  // an optional distance: empty is null (not known); one that does not read as metres is -1, which roomSchema names
  const optional = (s: string | undefined) => (!s?.trim() ? null : parseMetres(s) ?? -1)
  return {
    revision: room.revision,
    name: room.name,
    position: room.position,
    notes: room.notes,
    surfaces: room.surfaces.map(s => ({
      id: s.id,
      kind: s.kind,
      label: s.label,
      lengthMm: m(s.length),
      secondMm: m(s.second),
      background: s.background,
      notes: s.notes,
      openings: s.openings.map(o => ({ id: o.id, kind: o.kind, widthMm: m(o.width), heightMm: m(o.height), fromLeftMm: optional(o.fromLeft), fromFloorMm: optional(o.fromFloor) })),
      conditions: s.conditions.map((c) => {
        const f = CONDITION_FIELDS[c.kind]
        return {
          id: c.id,
          kind: c.kind,
          areaCm2: f.area && c.area.trim() ? parseSquareMetres(c.area) ?? -1 : null,
          lengthMm: f.length && c.length.trim() ? m(c.length) ?? -1 : null,
          outOfTrueMm: f.outOfTrue && c.outOfTrue.trim() ? wholeMm(c.outOfTrue) ?? -1 : null,
          scrimmed: Boolean(f.scrim && c.scrimmed),
          notes: c.notes,
        }
      }),
    })),
    corners: room.corners.map(c => ({
      id: c.id,
      surfaceAId: c.surfaceAId,
      surfaceBId: c.surfaceBId,
      kind: c.kind,
      lengthMm: m(c.length),
      returnWidthMm: c.returnWidth.trim() ? m(c.returnWidth) ?? -1 : null,
      needsBead: c.needsBead,
      packedOut: c.needsBead && c.packedOut,
    })),
  }
}

/**
 * The room's schema (and zod), loaded when a room is opened for editing, not with the store: the
 * store comes with every signed-in page (app/utils/offline-start.ts), a room is edited on a visit.
 * Loaded once; a failed load (no signal before the service worker kept the file) is tried again.
 */
const loadRoomChecks = () => Promise.all([import('#shared/schemas/room'), import('#shared/schemas/common')])
  .then(([{ roomSchema }, { fieldErrors }]) => ({ roomSchema, fieldErrors }))
let roomChecksLoading: ReturnType<typeof loadRoomChecks> | undefined
function roomChecks() {
  roomChecksLoading ??= loadRoomChecks().catch((err) => {
    roomChecksLoading = undefined
    throw err
  })
  return roomChecksLoading
}
type RoomSchema = Awaited<ReturnType<typeof loadRoomChecks>>['roomSchema']

/** The same room, whatever the revision: what this draft would save is what is saved. */
export function sameRoom(draft: DraftRoom, saved: SavedRoom, roomSchema: RoomSchema): boolean {
  const a = roomSchema.safeParse(toBody(draft))
  const b = roomSchema.safeParse(toBody(fromSaved(saved)))
  if (!a.success || !b.success) return false
  return JSON.stringify({ ...a.data, revision: 0 }) === JSON.stringify({ ...b.data, revision: 0 })
}

/** The running total of a draft, as typed (figures not yet readable count as 0). */
export function draftTotals(room: DraftRoom): RoomTotals {
  return roomTotals(room.surfaces.map(s => ({
    kind: s.kind,
    lengthMm: parseMetres(s.length),
    secondMm: parseMetres(s.second),
    openings: s.openings.map(o => ({ widthMm: parseMetres(o.width), heightMm: parseMetres(o.height) })),
  })))
}

function isEntry(v: unknown): v is DraftEntry {
  const e = v as DraftEntry
  return Boolean(e && typeof e === 'object' && typeof e.key === 'string' && e.room && Array.isArray(e.room.surfaces) && Array.isArray(e.room.corners))
}

export const useVisitDraftStore = defineStore('visitDraft', () => {
  const entries = ref<Record<string, DraftEntry>>({})
  /** The last room the server accepted, so a page can refresh its list (sends also happen on their own). */
  const lastSaved = ref<{ key: string, room: SavedRoom, at: number } | null>(null)
  /** The phone's storage has been read (restore). */
  const restored = ref(false)

  function write(e: DraftEntry) {
    // a plain copy: IndexedDB cannot store Vue's reactive proxies
    void keep(roomStore(), e.key, JSON.parse(JSON.stringify(e)))
  }

  // every change goes to the phone's storage at once
  if (import.meta.client) {
    watch(entries, (all) => {
      for (const e of Object.values(all)) write(e)
    }, { deep: true })
  }

  function forVisit(visitId: string): DraftEntry[] {
    return Object.values(entries.value).filter(e => e.room.visitId === visitId)
  }

  /** Drafts an older Setwell kept in localStorage, moved to IndexedDB (once). */
  async function moveFromLocalStorage() {
    const keys = Array.from({ length: localStorage.length }, (_, i) => localStorage.key(i)).filter(k => k?.startsWith(PREFIX)) as string[]
    for (const key of keys) {
      try {
        const e = JSON.parse(localStorage.getItem(key) ?? 'null') as unknown
        if (isEntry(e) && e.key === key) await keep(roomStore(), key, e)
      }
      catch { /* damaged: leave it */ }
      localStorage.removeItem(key)
    }
  }

  /**
   * Bring back what this phone kept for the visit (or for every visit, with no id: for an app-wide
   * plugin that sends waiting rooms whatever page is open). A send cut off by a closed page waits again.
   */
  async function restore(visitId?: string) {
    if (!import.meta.client) return
    await moveFromLocalStorage()
    const prefix = visitId ? `${PREFIX}${visitId}:` : PREFIX
    for (const [key, e] of await readAll<unknown>(roomStore())) {
      if (!key.startsWith(prefix) || entries.value[key]) continue
      if (!isEntry(e) || e.key !== key) continue
      // an untouched copy of a saved room is worth nothing: the server's is newer or the same
      if (!e.dirty && e.state === 'editing') {
        void drop(roomStore(), key)
        continue
      }
      if (e.state === 'sending') e.state = 'waiting'
      e.errors ??= noErrors()
      entries.value[key] = e
    }
    restored.value = true
  }

  function add(room: DraftRoom, dirty: boolean): string {
    // the checks a save needs, fetched now, while there may still be a signal
    if (import.meta.client) roomChecks().catch(() => {})
    const key = draftKey(room.visitId, room.id)
    entries.value[key] = { key, room, state: 'editing', dirty, version: 0, errors: noErrors(), changedAt: Date.now() }
    return key
  }

  /** A new room (nothing typed yet). */
  function create(visitId: string, position: number): string {
    return add(blankRoom(visitId, position), false)
  }

  /** Edit a saved room: the draft on this phone if it holds changes, else a fresh copy of the room as saved now. */
  function open(saved: SavedRoom): string {
    const key = draftKey(saved.visitId, saved.id)
    const e = entries.value[key]
    if (e && (e.dirty || e.state !== 'editing')) return key
    return add(fromSaved(saved), false)
  }

  /** Something was typed. */
  function touch(key: string) {
    const e = entries.value[key]
    if (!e) return
    e.dirty = true
    e.version++
    e.changedAt = Date.now()
  }

  function discard(key: string) {
    const { [key]: _gone, ...rest } = entries.value
    entries.value = rest
    if (import.meta.client) void drop(roomStore(), key)
  }

  /** Every draft on this phone, gone (signing out). */
  async function forget() {
    entries.value = {}
    await dropAll(roomStore())
  }

  /** Rooms saved with no signal, not yet sent (counted in the shell with the outbox). */
  const waiting = computed(() => Object.values(entries.value).filter(e => e.state === 'waiting' || e.state === 'sending'))
  /** Rooms that need the person (changed elsewhere, or refused). */
  const needsYou = computed(() => Object.values(entries.value).filter(e => e.state === 'conflict' || e.state === 'failed'))
  /** Rooms typed on this phone and not sent, whatever their state (warned about at sign-out). */
  const unsent = computed(() => Object.values(entries.value).filter(e => e.dirty || e.state !== 'editing'))

  /** Leaving the editor: a draft nobody changed is not worth keeping. */
  function close(key: string) {
    const e = entries.value[key]
    if (e && !e.dirty && e.state === 'editing') discard(key)
  }

  async function send(key: string): Promise<SendResult> {
    // first, so nothing waits between the checks below and marking it sending (a double tap sends once)
    const checks = await roomChecks().catch(() => null)
    const e = entries.value[key]
    if (!e) return 'refused'
    if (e.state === 'sending') return 'busy'
    if (!checks) {
      // the checks could not be fetched (no signal, and not kept yet): kept, checked and sent later
      e.state = 'waiting'
      return 'waiting'
    }
    const { roomSchema, fieldErrors } = checks
    const check = roomSchema.safeParse(toBody(e.room))
    if (!check.success) {
      e.errors = { message: 'Check the highlighted fields.', fields: fieldErrors(check.error.issues) }
      if (e.state === 'waiting') e.state = 'editing'
      return 'invalid'
    }
    e.errors = noErrors()
    if (!navigator.onLine) {
      e.state = 'waiting'
      return 'waiting'
    }
    const version = e.version
    e.state = 'sending'
    try {
      const saved = await $fetch<SavedRoom>(`/api/visits/${e.room.visitId}/rooms/${e.room.id}`, { method: 'PUT', body: check.data, timeout: SEND_TIMEOUT_MS })
      const now = entries.value[key]
      if (now && now.version !== version) {
        // typed while it was on its way: keep the newer draft, on top of what was saved
        now.room.revision = saved.revision
        now.state = 'editing'
      }
      else {
        discard(key)
      }
      lastSaved.value = { key, room: saved, at: Date.now() }
      return 'sent'
    }
    catch (err) {
      const now = entries.value[key]
      if (!now) return 'refused'
      const fe = err as FetchError<{ data?: { message?: string, current?: SavedRoom | null } }>
      if (!fe.response) {
        // no answer at all (no signal, a dead connection, a timeout): try again later
        now.state = 'waiting'
        return 'waiting'
      }
      const data = fe.data?.data
      if (fe.statusCode === 409 && data?.current && now.version === version && sameRoom(now.room, data.current, roomSchema)) {
        // our own earlier send got there and only its answer was lost: the room as saved is this draft
        discard(key)
        lastSaved.value = { key, room: data.current, at: Date.now() }
        return 'sent'
      }
      if (fe.statusCode === 409 && data && 'current' in data) {
        now.state = 'conflict'
        now.conflict = data.current ?? null
        now.errors = { message: data.message ?? 'This room was changed elsewhere.', fields: {} }
        return 'conflict'
      }
      now.errors = formErrors(err)
      now.state = fe.statusCode === 400 ? 'editing' : 'failed'
      return 'refused'
    }
  }

  /** Send every draft that is waiting for a signal. */
  async function sendWaiting() {
    if (!import.meta.client || !navigator.onLine) return
    for (const e of Object.values(entries.value)) {
      if (e.state === 'waiting') await send(e.key)
    }
  }

  /** Changed elsewhere, keep mine: send it again over the room as it is saved now (or again as new, if it was deleted). */
  function keepMine(key: string) {
    const e = entries.value[key]
    if (!e) return Promise.resolve<SendResult>('refused')
    e.room.revision = e.conflict?.revision ?? 0
    e.conflict = undefined
    e.state = 'editing'
    return send(key)
  }

  /** Changed elsewhere, take theirs: drop this phone's draft. Returns the saved room to show (null if it was deleted). */
  function takeTheirs(key: string): SavedRoom | null {
    const theirs = entries.value[key]?.conflict ?? null
    discard(key)
    return theirs
  }

  if (import.meta.client) {
    useEventListener(window, 'online', () => {
      void sendWaiting()
    })
    // a phone can claim to be online with no real signal, so waiting drafts are also retried now and then
    useIntervalFn(() => {
      if (Object.values(entries.value).some(e => e.state === 'waiting')) void sendWaiting()
    }, RETRY_MS)
  }

  return { entries, lastSaved, restored, waiting, needsYou, unsent, forVisit, restore, create, open, touch, discard, forget, close, send, sendWaiting, keepMine, takeTheirs }
})

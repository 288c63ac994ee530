// The rooms of a visit as its page lists them: the saved rooms, shown as this phone has them when
// it holds changes, then rooms only on this phone; the visit's total area; how many rooms wait to send.
import type { RoomTotals } from '#shared/utils/room-area'
import { draftKey, draftTotals, type DraftEntry, type SavedRoom } from '~/stores/visitDraft'

export interface VisitListRoom {
  key: string
  id: string
  name: string
  totals: RoomTotals
  surfaces: number
  textured: boolean
  entry: DraftEntry | null
  saved: SavedRoom | null
}

type Surfaces = { surfaces: { conditions: { kind: string }[] }[] }
const isTextured = (room: Surfaces) => room.surfaces.some(s => s.conditions.some(c => c.kind === 'textured-coating'))

export function useVisitRoomList(visitId: Ref<string>, savedRooms: Ref<SavedRoom[]>) {
  const store = useVisitDraftStore()

  const list = computed<VisitListRoom[]>(() => {
    const items: VisitListRoom[] = savedRooms.value.map((r) => {
      const key = draftKey(r.visitId, r.id)
      const e = store.entries[key] ?? null
      const mine = e?.dirty ? e.room : null
      return { key, id: r.id, name: mine ? mine.name : r.name, totals: mine ? draftTotals(mine) : r.totals, surfaces: (mine ?? r).surfaces.length, textured: isTextured(mine ?? r), entry: e, saved: r }
    })
    const savedIds = new Set(savedRooms.value.map(r => r.id))
    for (const e of store.forVisit(visitId.value)) {
      if (savedIds.has(e.room.id) || !e.dirty) continue
      items.push({ key: e.key, id: e.room.id, name: e.room.name, totals: draftTotals(e.room), surfaces: e.room.surfaces.length, textured: isTextured(e.room), entry: e, saved: null })
    }
    return items
  })
  const totalCm2 = computed(() => list.value.reduce((sum, r) => sum + r.totals.totalCm2, 0))
  const waiting = computed(() => store.forVisit(visitId.value).filter(e => e.state === 'waiting').length)
  return { list, totalCm2, waiting }
}

// Random jobs of rooms as a visit records them, for the planner's tests and the benchmark
// (scripts/bench.ts, section 5). Seeded (mulberry32), so a run can be repeated exactly.
//
// Our own model of a room, not trade figures: walls round the room in a ring (4 walls, or 6 for an
// L shape; a chimney breast splits a wall into two parts with its two sides and its face between),
// a ceiling, now and then a window reveal or two; the corners of the ring are internal or external
// as they turn, an internal one difficult (narrow or out of true) now and then, an external one
// now and then a packed-out bead; patches, scrimmed gaps and surfaces back to masonry (undercoat
// all over) here and there. Sizes are a house's: walls 2 to 5.5 m by 2.4 to 2.7 m.
import type { PlanCorner, PlanOptions, PlanSurface } from '../../shared/utils/set-plan'

export interface RandomJob { surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, labels: Record<string, string> }

/** mulberry32: a small seeded generator of numbers in [0, 1). */
export function seeded(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296
  }
}

const ROOM_NAMES = ['Front bedroom', 'Back bedroom', 'Living room', 'Kitchen', 'Hall', 'Landing', 'Box room', 'Dining room']

/** A job of 1 to 4 rooms. */
export function randomJob(rand: () => number): RandomJob {
  const between = (lo: number, hi: number) => lo + rand() * (hi - lo)
  const int = (lo: number, hi: number) => Math.floor(between(lo, hi + 1))
  const chance = (p: number) => rand() < p
  const m2 = (x: number) => Math.round(x * 100) / 100
  const surfaces: PlanSurface[] = []
  const corners: PlanCorner[] = []
  const labels: Record<string, string> = {}
  const rooms = int(1, 4)
  for (let r = 0; r < rooms; r++) {
    const room = ROOM_NAMES[r]!
    const height = between(2.4, 2.7)
    const extras = (s: PlanSurface): PlanSurface => {
      if (chance(0.1)) return { ...s, undercoatBags: m2(s.areaM2 * 0.37) > 0 ? Math.ceil(s.areaM2 * 3.7) / 10 : 0.1 }
      if (chance(0.25)) {
        const patch = m2(between(0.1, 1.5))
        return { ...s, patches: [{ areaM2: patch }], ...(chance(0.5) ? { fillBags: Math.ceil(patch * 3.7) / 10 } : {}) }
      }
      return s
    }
    const add = (s: PlanSurface, label: string): string => {
      surfaces.push(extras({ ...s, room }))
      labels[s.id] = `${room} · ${label}`
      return s.id
    }
    const ring: { id: string, areaM2: number }[] = []
    const walls = chance(0.7) ? 4 : 6
    const breast = chance(0.3)
    for (let w = 0; w < walls; w++) {
      const length = between(2, 5.5)
      if (w === 0 && breast) {
        const part = (length - 1.2) / 2
        for (const [id, label, len] of [[`r${r}w0a`, 'Wall 1 (left of the breast)', part], [`r${r}cs1`, 'Chimney side 1', 0.35], [`r${r}cf`, 'Chimney breast', 1.2], [`r${r}cs2`, 'Chimney side 2', 0.35], [`r${r}w0b`, 'Wall 1 (right of the breast)', part]] as const) {
          const areaM2 = m2(len * height)
          add({ id, areaM2, kind: label.startsWith('Wall') ? 'wall' : 'chimney-breast' }, label)
          ring.push({ id, areaM2 })
        }
        continue
      }
      const id = `r${r}w${w}`
      const areaM2 = m2(length * height)
      add({ id, areaM2, kind: 'wall' }, `Wall ${w + 1}`)
      ring.push({ id, areaM2 })
    }
    // the ring's corners: round the breast they turn out, in, in, out; elsewhere an L room has one external corner
    for (let i = 0; i < ring.length; i++) {
      const a = ring[i]!
      const b = ring[(i + 1) % ring.length]!
      const external = (breast && (a.id.endsWith('cs1') || a.id.endsWith('cf'))) || (walls === 6 && i === ring.length - 2)
      if (external) {
        corners.push({ a: a.id, b: b.id, kind: 'external', ...(chance(0.25) ? { packedBead: { face: b.areaM2 > a.areaM2 ? b.id : a.id } } : {}) })
      }
      else {
        corners.push({ a: a.id, b: b.id, kind: 'internal', ...(chance(0.2) ? { dryCorner: true } : {}) })
      }
    }
    const ceiling = add({ id: `r${r}c`, areaM2: m2(between(6, 20)), kind: 'ceiling' }, 'Ceiling')
    // a bulkhead now and then: a packed-out bead between the ceiling and a wall (the wall its face)
    if (chance(0.05)) corners.push({ a: ring[0]!.id, b: ceiling, kind: 'external', packedBead: { face: ring[0]!.id } })
    // a window reveal or two, beside a wall, its gap round the frame scrimmed now and then
    for (let v = int(0, 2); v > 0; v--) {
      const id = `r${r}v${v}`
      const wall = ring[int(0, ring.length - 1)]!
      add({ id, areaM2: m2(between(0.3, 1.2)), kind: 'reveal', ...(chance(0.4) ? { scrimmedGap: true } : {}) }, `Window reveal ${v}`)
      corners.push({ a: wall.id, b: id, kind: 'external', ...(chance(0.2) ? { packedBead: { face: wall.id } } : {}) })
    }
  }
  const options: PlanOptions = {
    people: int(1, 3),
    bagsPerPersonPerSet: int(2, 5),
    coverageM2PerBag: Math.round(between(8, 12) * 10) / 10,
    ...(chance(0.15) ? { ceilingsFirst: false } : {}),
  }
  return { surfaces, corners, options, labels }
}

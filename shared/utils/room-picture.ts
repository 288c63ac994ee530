// The picture of a room's sets: each room's surfaces unfolded side by side, to scale, in
// millimetres, as plain data (boxes, texts, marks, a viewBox) for app/components/job/PlanPicture.vue
// to draw as SVG and for tests/unit/room-picture.test.ts to check. Pure: no Vue, no DOM.
//
// How a room is laid out (our own layout):
// - walls are elevations (length x height) in a row, in the order they were measured, standing
//   on one floor line; a chimney breast, reveal or strip goes beside the surface it joins by a
//   recorded corner (a breast's return after the alcove wall, its face after the return), else
//   at the end of the row;
// - a long row is wrapped like a line of text, into as many rows as make the drawing biggest on
//   the screen it is drawn for (a phone 390 px wide by default): a room of four 4 m walls is
//   easier to read as two rows of two than as one thin strip;
// - the ceiling is a plan (length x width) above the rows;
// - openings at their size and where they were measured (from the left end, from the floor),
//   else centred across, a door on the floor, a window 900 mm up, a void centred;
// - findings (patches, scrimmed gaps) and the tasks before the skim (fill, tight coats,
//   undercoat) with their set numbers are small labelled marks in a tidy row inside the surface
//   (positions are not recorded), kept clear of the openings and the set number;
// - the set number is written large inside the surface, or under it when the surface is too
//   narrow to hold it; each surface's name is written under it;
// - corners between surfaces are marked at their shared edge, with their kind above the row
//   when it matters to the order (a difficult corner: narrow return or out of true; a packed-out
//   bead; a bead).
// Text sizes are given in millimetres worked out from the screen width, so that on the screen
// they come out at a fixed size in pixels, whatever the size of the room.
import type { PlanCorner, SetPlan } from './set-plan'

/** A room as the job's plan carries it (server/utils/jobs.ts PlanPictureRoom fits this). */
export interface PictureRoom {
  name: string
  surfaces: PictureRoomSurface[]
  corners: PictureRoomCorner[]
}
export interface PictureRoomSurface {
  id: string
  kind: 'wall' | 'ceiling' | 'chimney-breast' | 'reveal' | 'strip'
  label: string
  lengthMm: number
  secondMm: number
  openings: { kind: string, widthMm: number, heightMm: number, fromLeftMm: number | null, fromFloorMm: number | null }[]
  conditions: { kind: string, areaCm2: number | null, lengthMm: number | null, scrimmed: boolean }[]
}
export interface PictureRoomCorner {
  surfaceAId: string
  surfaceBId: string
  kind: 'internal' | 'external'
  returnWidthMm: number | null
  needsBead: boolean
  packedOut: boolean
}

export interface Box { x: number, y: number, w: number, h: number }
export interface PictureText { text: string, x: number, y: number, size: number, anchor: 'start' | 'middle' | 'end' }

export type MarkKind = 'patch' | 'scrim' | 'task'
export interface PictureMark {
  kind: MarkKind
  /** What it says: "Patch 0.40 m²", "Undercoat". */
  label: string
  /** Its second line, the sets of the tasks it takes before the skim: "fill: set 1", "tight coats: sets 1, 2". */
  detail: string
  /** The chip, icon and text inside it. */
  box: Box
  /** The task(s) before the skim it stands for ('fill', 'tight-coat', 'undercoat'), and their sets. */
  action?: string
  setNumbers: number[]
  /** Drawn under the surface, because the surface had no room left for it. */
  outside: boolean
}
export interface PictureOpening { kind: string, label: string, box: Box }
export interface PictureSurface {
  id: string
  kind: PictureRoomSurface['kind']
  /** "Wall 1 (Window wall)": the plan's name without the room. */
  name: string
  /** What is written under it: the plasterer's own label, else "Wall 1". */
  caption: PictureText
  box: Box
  /** The set its skim is in (as shown, after moves); null when the plan has no skim for it. */
  setNumber: number | null
  /** Where the set number is written; `outside` when under the surface in a badge. */
  number: PictureText & { outside: boolean, box: Box }
  openings: PictureOpening[]
  marks: PictureMark[]
  /** Row it sits in (-1 for a ceiling's plan). */
  row: number
}
export type CornerStyle = 'difficult' | 'packed' | 'bead' | 'plain'
export interface PictureCorner {
  aId: string
  bId: string
  style: CornerStyle
  /** "Narrow return 70 mm", "Out of true", "Packed-out bead", "Bead", "Corner". */
  label: string
  /** The mark(s) along the shared edge (two when the surfaces are not drawn side by side). */
  lines: { x1: number, y1: number, x2: number, y2: number }[]
  /** The label above the row, with a leader down to the mark; none for a plain corner. */
  tag: (PictureText & { box: Box, leader: { x1: number, y1: number, x2: number, y2: number } }) | null
}
export interface RoomPicture {
  name: string
  viewBox: Box
  /** Millimetres per CSS pixel when the picture fills the width it was laid out for. */
  unit: number
  surfaces: PictureSurface[]
  corners: PictureCorner[]
  /** The set numbers the picture shows, in order (for the key). */
  sets: number[]
  rows: number
}

export interface PictureOptions {
  /** The plan's names for surfaces ("Living room · Wall 1 (Window wall)"); else made here. */
  labels?: Record<string, string>
  /** The planner's corners: `dryCorner` says a corner is difficult by the firm's own figures. */
  corners?: PlanCorner[]
  /** The width the picture is drawn at, in CSS px (a 390 px phone less the card's padding). */
  widthPx?: number
  /** The most height it should take at that width, in CSS px. */
  maxHeightPx?: number
}

// Sizes on the screen, in CSS px.
const PX = {
  margin: 6,
  number: 26,
  numberMin: 16,
  badge: 22,
  caption: 11,
  chip: 15,
  chipText: 10,
  tag: 11,
  line: 15,
  pad: 3,
  gapBetweenRows: 10,
}
/** The gap drawn between two surfaces side by side (mm): where their corner is marked. */
const GAP_MM = 160
/** Between ceilings, and between groups not joined by a corner (mm). */
const WIDE_GAP_MM = 300
const WINDOW_SILL_MM = 900

const KIND_NAMES: Record<PictureRoomSurface['kind'], string> = { 'wall': 'Wall', 'ceiling': 'Ceiling', 'chimney-breast': 'Chimney breast', 'reveal': 'Reveal', 'strip': 'Narrow strip' }
const OPENING_NAMES: Record<string, string> = { door: 'Door', window: 'Window', void: 'Void' }
const TASK_NAMES: Record<string, string> = { 'fill': 'Fill', 'tight-coat': 'Tight coat', 'undercoat': 'Undercoat' }

/** The first place, top to bottom then left to right, where a w x h box fits inside `box` clear of `obstacles`. */
function freeSpot(box: Box, obstacles: Box[], w: number, h: number, pad: number): Box | null {
  const ys = [box.y + pad, ...obstacles.map(o => o.y + o.h + pad)].filter(y => y >= box.y + pad && y + h <= box.y + box.h - pad).sort((p, q) => p - q)
  for (const y of ys) {
    const xs = [box.x + pad, ...obstacles.map(o => o.x + o.w + pad)].filter(x => x >= box.x + pad && x + w <= box.x + box.w - pad).sort((p, q) => p - q)
    for (const x of xs) {
      const spot = { x, y, w, h }
      if (!obstacles.some(o => overlaps(spot, { x: o.x - pad / 2, y: o.y - pad / 2, w: o.w + pad, h: o.h + pad }))) return spot
    }
  }
  return null
}

/** A rough width of a line of text: Atkinson Hyperlegible averages a little over half its size. */
export function textWidth(text: string, size: number): number {
  return text.length * size * 0.58
}

const metres = (mm: number) => `${(Math.round(mm / 10) / 100).toFixed(2)} m`
const squareMetres = (cm2: number) => `${(Math.round(cm2 / 100) / 100).toFixed(2)} m²`

/** "Wall 1 (Window wall)" from the plan's label, else made the way the plan makes it. */
function namesFor(room: PictureRoom, labels: Record<string, string>) {
  const total = new Map<string, number>()
  for (const s of room.surfaces) total.set(s.kind, (total.get(s.kind) ?? 0) + 1)
  const seen = new Map<string, number>()
  const prefix = `${room.name.trim()} · `
  return room.surfaces.map((s) => {
    const n = (seen.get(s.kind) ?? 0) + 1
    seen.set(s.kind, n)
    const kind = KIND_NAMES[s.kind] + ((total.get(s.kind) ?? 0) > 1 ? ` ${n}` : '')
    const own = s.label.trim()
    const ownShown = own && own.toLowerCase() !== KIND_NAMES[s.kind].toLowerCase() ? own : ''
    const planned = labels[s.id]
    const name = planned ? (planned.startsWith(prefix) ? planned.slice(prefix.length) : planned) : `${kind}${ownShown ? ` (${ownShown})` : ''}`
    return { name, caption: ownShown || kind }
  })
}

/** Each surface's skim set and the tasks before it, from the plan as shown. */
function setsOf(plan: SetPlan) {
  const skim = new Map<string, number>()
  const before = new Map<string, { action: string, setNumber: number }[]>()
  for (const set of plan.sets) {
    for (const t of set.tasks) {
      if (t.action === 'skim') {
        if (!skim.has(t.surfaceId)) skim.set(t.surfaceId, set.number)
      }
      else {
        const list = before.get(t.surfaceId) ?? []
        if (!list.some(x => x.action === t.action && x.setNumber === set.number)) list.push({ action: t.action, setNumber: set.number })
        before.set(t.surfaceId, list)
      }
    }
  }
  return { skim, before }
}

/** Surfaces in the order they are drawn in the row, in groups: a wall with what joins it. */
function rowGroups(room: PictureRoom): string[][] {
  const row = room.surfaces.filter(s => s.kind !== 'ceiling')
  const walls = row.filter(s => s.kind === 'wall')
  const groups: string[][] = walls.map(w => [w.id])
  const groupOf = new Map<string, string[]>(groups.map(g => [g[0]!, g]))
  const others = row.filter(s => s.kind !== 'wall').map(s => s.id)
  const joined = (a: string, b: string) => room.corners.some(c => (c.surfaceAId === a && c.surfaceBId === b) || (c.surfaceAId === b && c.surfaceBId === a))
  let progress = true
  while (progress) {
    progress = false
    for (const id of [...others]) {
      const next = [...groupOf.keys()].find(p => joined(p, id))
      if (!next) continue
      const g = groupOf.get(next)!
      g.splice(g.indexOf(next) + 1, 0, id)
      groupOf.set(id, g)
      others.splice(others.indexOf(id), 1)
      progress = true
    }
  }
  for (const id of others) groups.push([id])
  return groups
}

/** Split groups (widths in mm) into `n` rows in order, keeping the widest row as narrow as it can be. */
function splitRows(widths: number[], n: number): number[][] {
  const k = widths.length
  // best[i][r]: the narrowest widest row for the first i groups in r rows; cut[i][r]: where the last row starts
  const rowWidth = (a: number, b: number) => widths.slice(a, b).reduce((s, w) => s + w, 0) + WIDE_GAP_MM * Math.max(0, b - a - 1)
  const best: number[][] = Array.from({ length: k + 1 }, () => Array<number>(n + 1).fill(Infinity))
  const cut: number[][] = Array.from({ length: k + 1 }, () => Array<number>(n + 1).fill(0))
  best[0]![0] = 0
  for (let i = 1; i <= k; i++) {
    for (let r = 1; r <= Math.min(n, i); r++) {
      for (let j = r - 1; j < i; j++) {
        const v = Math.max(best[j]![r - 1]!, rowWidth(j, i))
        if (v < best[i]![r]!) {
          best[i]![r] = v
          cut[i]![r] = j
        }
      }
    }
  }
  const rows: number[][] = []
  let i = k
  for (let r = n; r >= 1; r--) {
    const j = cut[i]![r]!
    rows.unshift(Array.from({ length: i - j }, (_, x) => j + x))
    i = j
  }
  return rows
}

interface Interval { a: number, b: number }
function freeIntervals(from: number, to: number, blocked: Interval[]): Interval[] {
  const sorted = blocked.filter(x => x.b > from && x.a < to).sort((p, q) => p.a - q.a)
  const out: Interval[] = []
  let cur = from
  for (const x of sorted) {
    if (x.a > cur) out.push({ a: cur, b: x.a })
    cur = Math.max(cur, x.b)
  }
  if (cur < to) out.push({ a: cur, b: to })
  return out
}
const overlaps = (p: Box, q: Box) => p.x < q.x + q.w && q.x < p.x + p.w && p.y < q.y + q.h && q.y < p.y + p.h

/** Lines of labels under (or over) a row: each item goes on the first line where it fits. */
class Lanes {
  lines: Interval[][] = []
  constructor(private minX: number, private maxX: number, private space: number) {}
  /** The line number for an item of width w centred at cx, and its x centre (kept inside the picture). */
  place(cx: number, w: number): { line: number, cx: number } {
    const half = w / 2
    const x = Math.min(Math.max(cx, this.minX + half), this.maxX - half)
    for (let line = 0; ; line++) {
      const used = (this.lines[line] ??= [])
      if (used.every(u => x + half + this.space <= u.a || x - half - this.space >= u.b)) {
        used.push({ a: x - half, b: x + half })
        return { line, cx: x }
      }
    }
  }
}

/** Where an opening sits on its surface (mm from the surface's left end and from its bottom edge), kept inside it. */
export function openingPlace(surface: { kind: string, lengthMm: number, secondMm: number }, o: PictureRoomSurface['openings'][number]) {
  const w = Math.min(o.widthMm, surface.lengthMm)
  const h = Math.min(o.heightMm, surface.secondMm)
  const across = o.fromLeftMm ?? (surface.lengthMm - w) / 2
  const centredUp = (surface.secondMm - h) / 2
  const up = o.fromFloorMm ?? (surface.kind === 'ceiling' ? centredUp : o.kind === 'door' ? 0 : o.kind === 'window' ? Math.min(WINDOW_SILL_MM, surface.secondMm - h) : centredUp)
  return { left: Math.min(Math.max(across, 0), surface.lengthMm - w), up: Math.min(Math.max(up, 0), surface.secondMm - h), w, h }
}

/** The picture of one room with the plan as shown (after any moves). */
export function roomPicture(room: PictureRoom, plan: SetPlan, options: PictureOptions = {}): RoomPicture {
  const widthPx = options.widthPx ?? 358
  const maxHeightPx = options.maxHeightPx ?? 560
  const names = namesFor(room, options.labels ?? {})
  const byId = new Map(room.surfaces.map((s, i) => [s.id, { s, i }]))
  const { skim, before } = setsOf(plan)
  const ceilings = room.surfaces.filter(s => s.kind === 'ceiling')
  const groups = rowGroups(room)
  const groupWidth = (g: string[]) => g.reduce((sum, id) => sum + byId.get(id)!.s.lengthMm, 0) + GAP_MM * (g.length - 1)
  const widths = groups.map(groupWidth)
  const ceilingWidth = ceilings.reduce((sum, c) => sum + c.lengthMm, 0) + WIDE_GAP_MM * Math.max(0, ceilings.length - 1)
  const ceilingHeight = Math.max(0, ...ceilings.map(c => c.secondMm))
  const heightOf = (g: string[]) => Math.max(0, ...g.map(id => byId.get(id)!.s.secondMm))

  // how many rows: the one that draws the room biggest within the width and the height allowed
  let chosen = { rows: [] as number[][], scale: 0 }
  for (let n = 1; n <= Math.max(1, groups.length); n++) {
    const rows = groups.length ? splitRows(widths, n) : []
    const contentW = Math.max(ceilingWidth, ...rows.map(r => r.reduce((s, gi) => s + widths[gi]!, 0) + WIDE_GAP_MM * (r.length - 1)), 1)
    const contentH = ceilingHeight + rows.reduce((s, r) => s + Math.max(...r.map(gi => heightOf(groups[gi]!))), 0)
    const lanesPx = (ceilings.length ? 2 * PX.line + PX.gapBetweenRows : 0) + rows.length * (3 * PX.line + PX.gapBetweenRows + PX.line) + 2 * PX.margin
    const scale = Math.min((widthPx - 2 * PX.margin) / contentW, Math.max(1, maxHeightPx - lanesPx) / Math.max(contentH, 1))
    if (scale > chosen.scale * 1.02) chosen = { rows, scale }
  }
  const rowsOfGroups = chosen.rows
  const contentW = Math.max(ceilingWidth, ...rowsOfGroups.map(r => r.reduce((s, gi) => s + widths[gi]!, 0) + WIDE_GAP_MM * (r.length - 1)), 1)
  // millimetres per pixel when the picture fills widthPx
  const u = contentW / (widthPx - 2 * PX.margin)
  const margin = PX.margin * u
  const viewW = widthPx * u
  const px = (n: number) => n * u

  const surfaces: PictureSurface[] = []
  const corners: PictureCorner[] = []
  const place = new Map<string, PictureSurface>()
  /** Row order: surface id -> [row, index in the row]. */
  const order = new Map<string, [number, number, number]>()
  const tagAt = new Map<PictureRoomCorner, { text: string, x: number, y: number, size: number, row: number }>()
  rowsOfGroups.flatMap(r => r.flatMap(gi => groups[gi]!)).forEach((id, k) => order.set(id, [rowsOfGroups.findIndex(r => r.some(gi => groups[gi]!.includes(id))), 0, k]))
  let y = margin

  const makeSurface = (s: PictureRoomSurface, box: Box, row: number): PictureSurface => {
    const nm = names[byId.get(s.id)!.i]!
    const setNumber = skim.get(s.id) ?? null
    const openings: PictureOpening[] = s.openings.map((o) => {
      const p = openingPlace(s, o)
      return { kind: o.kind, label: OPENING_NAMES[o.kind] ?? o.kind, box: { x: box.x + p.left, y: box.y + box.h - p.up - p.h, w: p.w, h: p.h } }
    })
    const surface: PictureSurface = {
      id: s.id, kind: s.kind, name: nm.name, box, setNumber, openings, marks: [], row,
      caption: { text: nm.caption, x: box.x + box.w / 2, y: box.y + box.h, size: px(PX.caption), anchor: 'middle' },
      number: { text: setNumber === null ? '–' : String(setNumber), x: 0, y: 0, size: px(PX.number), anchor: 'middle', outside: false, box: { x: 0, y: 0, w: 0, h: 0 } },
    }
    placeInside(surface, s)
    return surface
  }

  /** The set number and the marks, inside the surface where there is room, clear of the openings. */
  const placeInside = (surface: PictureSurface, s: PictureRoomSurface) => {
    const { box } = surface
    const pad = px(PX.pad)
    const obstacles: Box[] = surface.openings.map(o => o.box)
    // the number: in the widest stretch clear of openings, at mid-height; else above them; else outside
    let size = px(PX.number)
    const fits = (w: number, h: number) => w >= textWidth(surface.number.text, size) + 2 * pad && h >= size + 2 * pad
    let numberBox: Box | null = null
    for (; size >= px(PX.numberMin) && !numberBox; size -= px(2)) {
      const nw = textWidth(surface.number.text, size) + 2 * pad
      const nh = size + 2 * pad
      const strips = freeIntervals(box.x, box.x + box.w, obstacles.map(o => ({ a: o.x, b: o.x + o.w }))).sort((p, q) => (q.b - q.a) - (p.b - p.a))
      const strip = strips[0]
      if (strip && fits(strip.b - strip.a, box.h)) numberBox = { x: (strip.a + strip.b) / 2 - nw / 2, y: box.y + box.h / 2 - nh / 2, w: nw, h: nh }
      else {
        const top = Math.min(box.y + box.h, ...obstacles.map(o => o.y))
        if (fits(box.w, top - box.y)) numberBox = { x: box.x + box.w / 2 - nw / 2, y: box.y + (top - box.y) / 2 - nh / 2, w: nw, h: nh }
      }
      if (numberBox) surface.number = { ...surface.number, size, x: numberBox.x + nw / 2, y: numberBox.y + nh / 2, box: numberBox }
    }
    if (numberBox) obstacles.push(numberBox)
    else surface.number = { ...surface.number, size: px(PX.badge * 0.6), outside: true }

    // the marks: each finding with the sets of the tasks it takes before the skim (a patch its
    // fill, a scrimmed gap its tight coats), then any other task before the skim (an undercoat)
    const tasks = [...(before.get(s.id) ?? [])].sort((p, q) => p.setNumber - q.setNumber)
    const setsFor = (action: string) => [...new Set(tasks.filter(t => t.action === action).map(t => t.setNumber))]
    const setWords = (n: number[]) => `${n.length > 1 ? 'sets' : 'set'} ${n.join(', ')}`
    const used = new Set<string>()
    const wanted: Omit<PictureMark, 'box' | 'outside'>[] = []
    for (const c of s.conditions) {
      if (c.kind.startsWith('patch-') && c.areaCm2) {
        const fill = setsFor('fill')
        used.add('fill')
        wanted.push({ kind: 'patch', label: `Patch ${squareMetres(c.areaCm2)}`, detail: fill.length ? `fill: ${setWords(fill)}` : '', action: fill.length ? 'fill' : undefined, setNumbers: fill })
      }
      else if ((c.kind === 'crack' || c.kind === 'frame-gap') && c.scrimmed) {
        const coats = setsFor('tight-coat')
        used.add('tight-coat')
        wanted.push({ kind: 'scrim', label: `Scrim ${c.lengthMm ? metres(c.lengthMm) : ''}`.trim(), detail: coats.length ? `tight coats: ${setWords(coats)}` : '', action: coats.length ? 'tight-coat' : undefined, setNumbers: coats })
      }
    }
    for (const action of [...new Set(tasks.map(t => t.action))].filter(a => !used.has(a))) {
      const n = setsFor(action)
      wanted.push({ kind: 'task', action, label: TASK_NAMES[action] ?? action, detail: setWords(n), setNumbers: n })
    }
    const chipText = px(PX.chipText)
    for (const m of wanted) {
      const w = px(PX.chip) + Math.max(textWidth(m.label, chipText), textWidth(m.detail, chipText)) + 2 * pad
      const h = m.detail ? chipText * 2.5 + pad : chipText * 1.3 + pad
      const spot = freeSpot(box, obstacles, w, h, pad)
      if (spot) obstacles.push(spot)
      surface.marks.push({ ...m, box: spot ?? { x: 0, y: 0, w, h }, outside: !spot })
    }
  }

  // ceilings: plans side by side along the top, names under them
  if (ceilings.length) {
    let x = margin
    const lanes = new Lanes(0, viewW, px(4))
    const top = y
    for (const c of ceilings) {
      const box = { x, y: top + ceilingHeight - c.secondMm, w: c.lengthMm, h: c.secondMm }
      const surface = makeSurface(c, box, -1)
      surfaces.push(surface)
      place.set(c.id, surface)
      x += c.lengthMm + WIDE_GAP_MM
    }
    y = top + ceilingHeight
    y = underLanes(surfaces.filter(s => s.row === -1), lanes, y)
    y += px(PX.gapBetweenRows)
  }

  // the rows of walls (and what joins them)
  rowsOfGroups.forEach((groupIndexes, row) => {
    const ids = groupIndexes.flatMap(gi => groups[gi]!)
    ids.forEach((id, i) => order.set(id, [row, i, order.get(id)![2]]))
    const height = Math.max(...ids.map(id => byId.get(id)!.s.secondMm))
    // the corner tags above the row come first (a corner's tag goes over the row of its first surface)
    const tagLanes = new Lanes(0, viewW, px(4))
    const firstIn = (c: PictureRoomCorner) => {
      const both = [c.surfaceAId, c.surfaceBId].filter(id => order.has(id)).sort((p, q) => order.get(p)![2] - order.get(q)![2])
      return both[0] !== undefined && ids.includes(both[0])
    }
    const tagged = room.corners.filter(firstIn).map(c => ({ c, style: cornerStyle(c, room, options.corners) })).filter(t => t.style.style !== 'plain')
    // x positions of surfaces in the row
    const xs = new Map<string, number>()
    let x = margin
    groupIndexes.forEach((gi, k) => {
      if (k > 0) x += WIDE_GAP_MM - GAP_MM
      for (const id of groups[gi]!) {
        xs.set(id, x)
        x += byId.get(id)!.s.lengthMm + GAP_MM
      }
    })
    const tagLines = tagged.map(t => tagLanes.place(cornerXs(t.c, xs, byId, order)[0] ?? margin, textWidth(t.style.label, px(PX.tag)) + px(6)))
    const tagLineCount = tagLanes.lines.length
    const tagsTop = y
    const top = y + tagLineCount * px(PX.line) + (tagLineCount ? px(4) : 0)
    const floor = top + height
    const rowSurfaces: PictureSurface[] = []
    for (const id of ids) {
      const s = byId.get(id)!.s
      const surface = makeSurface(s, { x: xs.get(id)!, y: floor - s.secondMm, w: s.lengthMm, h: s.secondMm }, row)
      rowSurfaces.push(surface)
      surfaces.push(surface)
      place.set(id, surface)
    }
    tagged.forEach((t, k) => {
      const size = px(PX.tag)
      const where = tagLines[k]!
      const ty = tagsTop + where.line * px(PX.line) + px(PX.line) * 0.75
      tagAt.set(t.c, { text: t.style.label, x: where.cx, y: ty, size, row })
    })
    y = underLanes(rowSurfaces, new Lanes(0, viewW, px(4)), floor)
    y += px(PX.gapBetweenRows)
  })

  // corners: marks along the shared edge (or each surface's edge), tags with a leader down to the mark
  for (const c of room.corners) {
    const st = cornerStyle(c, room, options.corners)
    const lines = cornerLines(c, place, order, GAP_MM)
    if (!lines.length) continue
    const t = tagAt.get(c)
    let tag: PictureCorner['tag'] = null
    if (t) {
      const w = textWidth(t.text, t.size) + px(6)
      const target = lines.find(l => surfaces.some(s => s.row === t.row && l.y1 === s.box.y && Math.abs(l.x1 - s.box.x) < s.box.w + GAP_MM)) ?? lines[0]!
      tag = { text: t.text, x: t.x, y: t.y, size: t.size, anchor: 'middle', box: { x: t.x - w / 2, y: t.y - t.size, w, h: t.size * 1.3 }, leader: { x1: t.x, y1: t.y + t.size * 0.3, x2: target.x1, y2: target.y1 } }
    }
    corners.push({ aId: c.surfaceAId, bId: c.surfaceBId, style: st.style, label: st.label, lines, tag })
  }

  /** Under the surfaces: the numbers that did not fit inside, the captions, marks with no room inside. */
  function underLanes(list: PictureSurface[], lanes: Lanes, top: number): number {
    const lineH = px(PX.line)
    const badgeH = px(PX.badge)
    // the badges have their own first line (taller), the captions and marks below
    const badgeLanes = new Lanes(0, viewW, px(3))
    for (const s of list.filter(x => x.number.outside)) {
      const w = Math.max(badgeH, textWidth(s.number.text, s.number.size) + px(8))
      const where = badgeLanes.place(s.box.x + s.box.w / 2, w)
      const by = top + px(3) + where.line * (badgeH + px(2))
      s.number = { ...s.number, x: where.cx, y: by + badgeH / 2, box: { x: where.cx - w / 2, y: by, w, h: badgeH } }
    }
    const start = top + px(3) + badgeLanes.lines.length * (badgeH + px(2))
    for (const s of list) {
      const size = s.caption.size
      const where = lanes.place(s.box.x + s.box.w / 2, textWidth(s.caption.text, size))
      s.caption = { ...s.caption, x: where.cx, y: start + where.line * lineH + size }
    }
    // marks with no room inside go under the captions, on lines as tall as the tallest of them
    const below = start + lanes.lines.length * lineH + px(2)
    const outside = list.flatMap(s => s.marks.filter(k => k.outside).map(m => ({ s, m })))
    const markH = Math.max(0, ...outside.map(o => o.m.box.h)) + px(3)
    const markLanes = new Lanes(0, viewW, px(4))
    for (const { s, m } of outside) {
      const where = markLanes.place(s.box.x + s.box.w / 2, m.box.w)
      m.box = { ...m.box, x: where.cx - m.box.w / 2, y: below + where.line * markH }
    }
    return below + markLanes.lines.length * markH
  }

  const sets = [...new Set(surfaces.map(s => s.setNumber).filter((n): n is number => n !== null).concat(surfaces.flatMap(s => s.marks.flatMap(m => m.setNumbers))))].sort((a, b) => a - b)
  // surfaces in the order they were measured
  surfaces.sort((a, b) => byId.get(a.id)!.i - byId.get(b.id)!.i)
  return { name: room.name, viewBox: { x: 0, y: 0, w: viewW, h: y - px(PX.gapBetweenRows) + margin }, unit: u, surfaces, corners, sets, rows: rowsOfGroups.length }
}

/** What kind of corner it is, in words, and how it is drawn. */
export function cornerStyle(c: PictureRoomCorner, room: PictureRoom, planCorners: PlanCorner[] = []): { style: CornerStyle, label: string } {
  const planned = planCorners.find(p => (p.a === c.surfaceAId && p.b === c.surfaceBId) || (p.a === c.surfaceBId && p.b === c.surfaceAId))
  const outOfTrue = room.surfaces.some(s => (s.id === c.surfaceAId || s.id === c.surfaceBId) && s.conditions.some(k => k.kind === 'out-of-true'))
  if (planned?.dryCorner) {
    const why = [c.returnWidthMm !== null ? `narrow return ${c.returnWidthMm} mm` : '', outOfTrue ? 'out of true' : ''].filter(Boolean).join(', ')
    return { style: 'difficult', label: why ? why[0]!.toUpperCase() + why.slice(1) : 'Difficult corner' }
  }
  if (c.packedOut) return { style: 'packed', label: 'Packed-out bead' }
  if (c.needsBead) return { style: 'bead', label: 'Bead' }
  return { style: 'plain', label: c.kind === 'internal' ? 'Internal corner' : 'External corner' }
}

/** The x of a corner's mark(s) in a row, before the surfaces have their y. */
function cornerXs(c: PictureRoomCorner, xs: Map<string, number>, byId: Map<string, { s: PictureRoomSurface }>, order: Map<string, [number, number, number]>): number[] {
  const a = order.get(c.surfaceAId)
  const b = order.get(c.surfaceBId)
  const right = (id: string) => xs.get(id)! + byId.get(id)!.s.lengthMm
  if (a && b && a[0] === b[0] && Math.abs(a[1] - b[1]) === 1) {
    const first = a[1] < b[1] ? c.surfaceAId : c.surfaceBId
    return [right(first) + GAP_MM / 2]
  }
  return [c.surfaceAId, c.surfaceBId].filter(id => xs.has(id)).map(id => xs.get(id)!)
}

/** Lines along the shared edge of two surfaces side by side; else one on each surface's edge. */
function cornerLines(c: PictureRoomCorner, place: Map<string, PictureSurface>, order: Map<string, [number, number, number]>, gap: number) {
  const a = place.get(c.surfaceAId)
  const b = place.get(c.surfaceBId)
  const oa = order.get(c.surfaceAId)
  const ob = order.get(c.surfaceBId)
  if (a && b && oa && ob && oa[0] === ob[0] && Math.abs(oa[1] - ob[1]) === 1) {
    const [first, second] = oa[1] < ob[1] ? [a, b] : [b, a]
    const x = first.box.x + first.box.w + gap / 2
    const bottom = Math.min(first.box.y + first.box.h, second.box.y + second.box.h)
    const top = Math.max(first.box.y, second.box.y)
    return [{ x1: x, y1: top, x2: x, y2: bottom }]
  }
  // not side by side (the corner round from the last wall to the first, or onto a ceiling):
  // a mark on the near edge of each surface in a row; a ceiling gets none
  const lines: PictureCorner['lines'] = []
  const pair = [[a, oa], [b, ob]] as const
  pair.forEach(([s, o], k) => {
    if (!s || !o) return
    const other = pair[1 - k]![1]
    // next to each other in the order but wrapped onto the next row: the end of one row, the start of
    // the next; else (the corner round from the last wall to the first) the earlier one's left edge
    const earlier = !other || other[2] > o[2]
    const wrapped = other !== undefined && Math.abs(other[2] - o[2]) === 1
    const leftEdge = wrapped ? !earlier : earlier
    const x = leftEdge ? s.box.x - gap / 4 : s.box.x + s.box.w + gap / 4
    lines.push({ x1: x, y1: s.box.y, x2: x, y2: s.box.y + s.box.h })
  })
  return lines
}

/** Every room of the plan, laid out. */
export function planPictures(rooms: PictureRoom[], plan: SetPlan, options: PictureOptions = {}): RoomPicture[] {
  return rooms.filter(r => r.surfaces.length).map(r => roomPicture(r, plan, options))
}

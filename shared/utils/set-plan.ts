// The set planner: which surfaces go in which set, in what order.
//
// A set is one batch of plaster mixed, laid on and trowelled up in one go (../shared/DOMAIN.md,
// "Planning the sets"). The trade's rules of thumb for the order (common practice):
// - a difficult internal corner (`dryCorner`) is worked against a face that has already set, so
//   its two faces are skimmed in different sets;
// - patches back to the undercoat or masonry are filled in an earlier set than the skim over
//   them, so the whole surface has even suction;
// - a gap bridged with scrim takes thin tight coats in at least two earlier sets before the
//   surface is skimmed;
// - on a packed-out bead the face is skimmed before its return, so the set plaster holds the bead;
// - a surface back to masonry or the undercoat all over takes its undercoat in an earlier set;
// - the firm's rule "ceilings first" (options.ceilingsFirst, on unless false): in each room (`room`;
//   surfaces with none are one room) a ceiling is skimmed in a set no later than every other
//   surface of the room, and first in a set it shares, so plaster dropped from it lands on walls not
//   yet skimmed; a packed-out bead that needs a wall first overrules it, with a warning;
// - a set is no bigger than the people can lay on and trowel (people x bagsPerPersonPerSet bags),
//   sets are kept even, and there are as few of them as the rules allow.
// It is a rule of thumb for the day, not a promise about setting or drying: the plasterer
// decides on site, and can move surfaces by hand (`checkPlan` then says which rule is broken).
//
// How it works:
// 1. Check the numbers (a bad one throws, naming the field) and tidy the room: a corner naming an
//    unknown surface, a corner from a surface to itself, a repeated surface id and a circle of
//    packed-out beads are left out with a warning, never an exception.
// 2. Make tasks: a skim per surface, a patch fill and a whole-surface undercoat before it (each
//    split into parts when it is more than one set can take; their bags are the take-off's,
//    fillBags / undercoatBags, when given, else the patches' area at the skim's coverage), two
//    thin tight coats before a scrimmed surface. Bags are counted in whole tenths, so 0.1 + 0.2 is
//    0.3 and never 0.30000000000000004.
// 3. Join the tasks by "must be in an earlier set" edges (fill -> skim, undercoat -> skim, coat 1
//    -> coat 2 -> skim, face -> return) and "no later" edges (ceiling -> each wall of its room;
//    an earlier-set edge where the two also share a difficult corner; pairs on a circle with a
//    packed-out bead are overruled, strongly connected components). That graph has no cycles, so
//    a longest path (an earlier-set edge counting one set, a no-later edge none) gives each task
//    the earliest set it can go in (its level) and how many sets must follow it (its tail).
//    Difficult corners are "not in the same set" pairs, not edges, so a ring of four walls needs
//    two sets, not four.
// 4. Pack. First fit in level order always succeeds (a new set is opened when nothing fits) and
//    gives an upper bound on the sets. The lower bound (`setLowerBound`: the longest chain, a
//    difficult corner counting a step; the bags over one set by bin packing's bound L2; and the two
//    together, what must follow a task packed from its level on) is tried first, then the next
//    sets up, then a binary search, each with a balanced packing (each task into the least-loaded
//    set it may go in) and a tight one (the first set with room). Still above the bound, two dozen
//    shuffles of each level's order (fixed seed) and, on a house, emptying a light set by moving
//    its tasks elsewhere and a search with a step budget try one set fewer.
// 5. Even out: neighbouring sets that can be one are merged, single tasks move from heavier to
//    lighter sets, and pairs of tasks swap between the heaviest or lightest set and another, each
//    only while every rule still holds, until nothing helps. Empty sets are dropped.
// 6. Each task gets a reason in plain words naming its set and why, worked out from where the
//    tasks are (`explain`), so the same words serve a plan after moves by hand (`reasonsForPlan`):
//    a reason names only its own task's set and those of the tasks it names, and a rule a move
//    broke is said as broken.
// Everything is in input order with fixed tie-breaks, so the same input gives the same plan.
// "Least-loaded set in a range" is a segment tree over the sets, so each pass is about
// tasks x log(sets): a house takes a few milliseconds, a 2,000-surface estate a fraction of a second.

// the actions and their words live on their own (plan-actions.ts), so a screen that only names them
// does not load the planner
import type { PlanAction } from './plan-actions'

export interface PlanSurface {
  id: string
  areaM2: number
  patches?: { areaM2: number }[]
  scrimmedGap?: boolean
  /** What kind of surface it is ('ceiling' is what the ceilings-first rule reads; any other kind is a wall to it). */
  kind?: 'wall' | 'ceiling' | 'chimney-breast' | 'reveal' | 'strip'
  /** The room it is in: the ceilings-first rule works room by room (surfaces with no room are one room). */
  room?: string
  /** Bags of patch fill, when the take-off has worked them out (the quote's undercoat), rounded up to tenths; else from the patches' area. */
  fillBags?: number
  /** Bags of undercoat over the whole surface before its skim (back to masonry or the undercoat), from the take-off, rounded up to tenths. */
  undercoatBags?: number
}
export interface PlanCorner { a: string, b: string, kind: 'internal' | 'external', dryCorner?: boolean, packedBead?: { face: string } }
export interface PlanOptions {
  people: number
  bagsPerPersonPerSet: number
  coverageM2PerBag: number
  /** Each room's ceiling in a set no later than its walls, and first in a set it shares (the firm's rule, on unless false). */
  ceilingsFirst?: boolean
}
export interface PlanTask { surfaceId: string, action: PlanAction, bags: number, reason: string }
export interface PlannedSet { number: number, tasks: PlanTask[], bags: number }
export interface SetPlan { sets: PlannedSet[], warnings: string[] }

/** A thin tight coat over scrim is a trowelful or two from that set's mix: counted as 0.1 bag (a planning figure, not a measured one). */
export const TIGHT_COAT_TENTHS = 1
/** How many thin tight coats a scrimmed gap takes before the skim (at least two, in different sets). */
export const TIGHT_COATS = 2

/** Areas above this are taken to be a typing error. */
const MAX_AREA_M2 = 1_000_000

// ---------------------------------------------------------------------------------------------
// Numbers

/** Strips the last-bit noise of a float product or quotient (1.15 * 10 = 11.499999999999998). */
function clean(x: number): number {
  return Number(x.toPrecision(12))
}

/** A quantity of bags (0 or more) to whole tenths, half up. */
function toTenths(bags: number): number {
  return Math.floor(clean(bags * 10) + 0.5)
}

/** A quantity of bags (0 or more) to whole tenths, up: what the take-off gives is never cut (0.61 -> 0.7). */
function toTenthsUp(bags: number): number {
  return Math.ceil(clean(bags * 10))
}

/** Tenths as a number of bags with one decimal at most: 3 -> 0.3, 120 -> 12. */
function bagsOf(tenths: number): number {
  return tenths / 10
}

/** Tenths for people to read: 145 -> '14.5', 120 -> '12'. */
function fmtTenths(tenths: number): string {
  return tenths % 10 === 0 ? String(tenths / 10) : (tenths / 10).toFixed(1)
}

function fmtNumber(n: number): string {
  return String(clean(n))
}

function finiteAtLeast0(n: unknown, field: string): number {
  if (typeof n !== 'number' || !Number.isFinite(n) || n < 0) throw new RangeError(`${field} must be a number of 0 or more, got ${String(n)}`)
  if (n > MAX_AREA_M2) throw new RangeError(`${field} looks too big (over ${MAX_AREA_M2} m²), got ${n}`)
  return n
}

function peopleText(people: number): string {
  return people === 1 ? '1 person' : `${people} people`
}

function setList(numbers: number[]): string {
  const sorted = [...new Set(numbers)].sort((x, y) => x - y).map(n => `set ${n}`)
  return sorted.length <= 1 ? sorted.join('') : `${sorted.slice(0, -1).join(', ')} and ${sorted[sorted.length - 1]}`
}

function nameList(names: string[]): string {
  return names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`
}

// ---------------------------------------------------------------------------------------------
// The room, checked and tidied

interface ModelSurface {
  id: string
  name: string
  areaM2: number
  skimTenths: number
  /** 0 when the surface has no patches. */
  fillTenths: number
  hasPatches: boolean
  /** Undercoat over the whole surface before the skim; 0 when none. */
  undercoatTenths: number
  gap: boolean
  ceiling: boolean
  /** The room as the ceilings-first rule groups it ('' for surfaces with no room); the room's name for people. */
  roomKey: string
  room: string
}

interface Model {
  surfaces: ModelSurface[]
  index: Map<string, number>
  /** Difficult corners as pairs of surface indexes, each pair once (lower index first). */
  dry: [number, number][]
  /** Packed-out beads as [face, return] surface indexes, each once, with no circle. */
  packed: [number, number][]
  /** Ceilings-first pairs [ceiling, wall] of one room the plan keeps (the ceiling no later than the wall). */
  ceilingBefore: [number, number][]
  /** Ceilings-first pairs a packed-out bead overrules (the wall must come first), kept apart for the reasons. */
  overruled: [number, number][]
  warnings: string[]
  people: number
  capTenths: number
  coverage: number
  ceilingsFirst: boolean
}

function checkOptions(o: PlanOptions): { capTenths: number } {
  if (o === null || typeof o !== 'object') throw new TypeError('options must give people, bagsPerPersonPerSet and coverageM2PerBag')
  if (typeof o.people !== 'number' || !Number.isSafeInteger(o.people) || o.people < 1) {
    throw new RangeError(`people must be a whole number of 1 or more, got ${String(o.people)}`)
  }
  const perPerson = o.bagsPerPersonPerSet
  if (typeof perPerson !== 'number' || !Number.isFinite(perPerson) || perPerson <= 0) {
    throw new RangeError(`bagsPerPersonPerSet must be a number over 0, got ${String(perPerson)}`)
  }
  const cover = o.coverageM2PerBag
  if (typeof cover !== 'number' || !Number.isFinite(cover) || cover <= 0) {
    throw new RangeError(`coverageM2PerBag must be a number over 0, got ${String(cover)}`)
  }
  const capTenths = Math.min(Number.MAX_SAFE_INTEGER, Math.floor(clean(o.people * perPerson * 10)))
  if (capTenths < 1) throw new RangeError(`bagsPerPersonPerSet x people must come to at least 0.1 bag a set, got ${fmtNumber(o.people * perPerson)}`)
  return { capTenths }
}

function bagsForArea(areaM2: number, coverage: number, field: string): number {
  const tenths = toTenths(areaM2 / coverage)
  if (!Number.isSafeInteger(tenths) || tenths > 1e12) throw new RangeError(`${field} at coverageM2PerBag ${coverage} comes to too many bags to plan`)
  return tenths
}

function buildModel(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, labels: Record<string, string> | undefined): Model {
  const { capTenths } = checkOptions(options)
  if (!Array.isArray(surfaces)) throw new TypeError('surfaces must be a list')
  if (!Array.isArray(corners)) throw new TypeError('corners must be a list')
  const coverage = options.coverageM2PerBag
  const name = (id: string): string => {
    const l = labels?.[id]
    return typeof l === 'string' && l.trim() ? l : String(id)
  }
  const warnings: string[] = []
  const ceilingsFirst = options.ceilingsFirst !== false
  const model: Model = { surfaces: [], index: new Map(), dry: [], packed: [], ceilingBefore: [], overruled: [], warnings, people: options.people, capTenths, coverage, ceilingsFirst }

  surfaces.forEach((s, i) => {
    const areaM2 = finiteAtLeast0(s.areaM2, `surfaces[${i}].areaM2`)
    let patchM2 = 0
    const patches = s.patches ?? []
    if (!Array.isArray(patches)) throw new TypeError(`surfaces[${i}].patches must be a list`)
    patches.forEach((p, j) => {
      patchM2 += finiteAtLeast0(p?.areaM2, `surfaces[${i}].patches[${j}].areaM2`)
    })
    const skimTenths = bagsForArea(areaM2, coverage, `surfaces[${i}].areaM2`)
    // the take-off's bags when given (the same figure the quote prices), else the patches' area at the skim's coverage
    const fillGiven = s.fillBags === undefined || s.fillBags === null ? null : toTenthsUp(finiteAtLeast0(s.fillBags, `surfaces[${i}].fillBags`))
    const hasPatches = patches.length > 0 || (fillGiven !== null && fillGiven > 0)
    // a fill is at least 0.1 bag: a small patch still needs a small mix
    const fillTenths = hasPatches ? Math.max(1, fillGiven ?? bagsForArea(patchM2, coverage, `surfaces[${i}].patches`)) : 0
    const undercoatGiven = s.undercoatBags === undefined || s.undercoatBags === null ? 0 : toTenthsUp(finiteAtLeast0(s.undercoatBags, `surfaces[${i}].undercoatBags`))
    const id = s.id
    const seen = model.index.get(id)
    if (seen !== undefined) {
      warnings.push(`Two surfaces share the id ${name(id)}; only the first (${fmtNumber(model.surfaces[seen]!.areaM2)} m²) is planned, the other (${fmtNumber(areaM2)} m²) is left out.`)
      return
    }
    model.index.set(id, model.surfaces.length)
    const room = typeof s.room === 'string' ? s.room.trim() : ''
    model.surfaces.push({
      id, name: name(id), areaM2, skimTenths, fillTenths, hasPatches, undercoatTenths: undercoatGiven, gap: s.scrimmedGap === true,
      ceiling: s.kind === 'ceiling', roomKey: room, room,
    })
  })

  // Corners. Packed beads are added in input order; one that would close a circle is dropped.
  const n = model.surfaces.length
  const after: number[][] = Array.from({ length: n }, () => [])
  const dryKeys = new Set<string>()
  const packedKeys = new Set<string>()
  const stamp = new Int32Array(n)
  let visit = 0
  const reaches = (from: number, to: number): boolean => {
    visit += 1
    const stack = [from]
    stamp[from] = visit
    while (stack.length) {
      const x = stack.pop()!
      if (x === to) return true
      for (const y of after[x]!) {
        if (stamp[y] !== visit) {
          stamp[y] = visit
          stack.push(y)
        }
      }
    }
    return false
  }
  for (const c of corners) {
    const ia = model.index.get(c?.a)
    const ib = model.index.get(c?.b)
    if (ia === undefined || ib === undefined) {
      const unknown = [...new Set([c?.a, c?.b].filter(id => !model.index.has(id)).map(id => name(String(id))))]
      warnings.push(`A corner between ${name(String(c?.a))} and ${name(String(c?.b))} names ${nameList(unknown)}, which ${unknown.length === 1 ? 'is not one of' : 'are not among'} the surfaces; that corner is left out of the plan.`)
      continue
    }
    if (ia === ib) {
      warnings.push(`A corner joins ${name(c.a)} to itself; it is left out of the plan.`)
      continue
    }
    if (c.dryCorner) {
      const key = ia < ib ? `${ia}:${ib}` : `${ib}:${ia}`
      if (!dryKeys.has(key)) {
        dryKeys.add(key)
        model.dry.push(ia < ib ? [ia, ib] : [ib, ia])
      }
    }
    if (c.packedBead) {
      const face = c.packedBead.face
      if (face !== c.a && face !== c.b) {
        warnings.push(`The packed-out bead between ${name(c.a)} and ${name(c.b)} gives its face as ${name(String(face))}, which is neither of them; it is planned as if the bead were not packed out.`)
        continue
      }
      const f = face === c.a ? ia : ib
      const r = f === ia ? ib : ia
      const key = `${f}:${r}`
      if (packedKeys.has(key)) continue
      if (reaches(r, f)) {
        warnings.push(`The packed-out bead between ${name(c.a)} and ${name(c.b)} would have ${name(face)} skimmed before ${model.surfaces[r]!.name}, but other packed-out beads already put ${model.surfaces[r]!.name} first: the beads go round in a circle, so this one is planned as if it were not packed out. Check the order on site.`)
        continue
      }
      packedKeys.add(key)
      after[f]!.push(r)
      model.packed.push([f, r])
    }
  }
  if (ceilingsFirst) ceilingPairs(model, after)
  return model
}

/**
 * Ceilings first (the firm's rule, common practice): in each room every ceiling is skimmed no
 * later than every other surface of the room. A pair that packed-out beads already order the other
 * way (the wall, or something that must follow it, before the ceiling) cannot hold: every pair
 * whose two surfaces lie on one circle of "no later than" steps is overruled, with a warning, so
 * what is kept has no circle (a circle of only these pairs cannot happen: they all start at a ceiling
 * and end at a wall).
 */
function ceilingPairs(m: Model, after: number[][]): void {
  const rooms = new Map<string, { ceilings: number[], walls: number[] }>()
  m.surfaces.forEach((s, i) => {
    const r = rooms.get(s.roomKey) ?? { ceilings: [], walls: [] }
    rooms.set(s.roomKey, r);
    (s.ceiling ? r.ceilings : r.walls).push(i)
  })
  const pairs: [number, number][] = []
  for (const r of rooms.values()) for (const c of r.ceilings) for (const w of r.walls) pairs.push([c, w])
  if (!pairs.length) return
  const adj = after.map(list => [...list])
  for (const [c, w] of pairs) adj[c]!.push(w)
  const comp = components(adj)
  const overruled = new Map<number, number[]>()
  for (const [c, w] of pairs) {
    if (comp[c] === comp[w]) {
      m.overruled.push([c, w])
      overruled.set(c, [...(overruled.get(c) ?? []), w])
    }
    else {
      m.ceilingBefore.push([c, w])
    }
  }
  for (const [c, walls] of overruled) {
    const ceiling = m.surfaces[c]!
    const names = nameList(walls.map(w => m.surfaces[w]!.name))
    m.warnings.push(`${ceiling.name} cannot go before ${names}${ceiling.room ? ` (${ceiling.room})` : ''} as the firm's ceilings-first rule says: packed-out beads need ${walls.length === 1 ? 'that surface' : 'those surfaces'} skimmed first, and that rule wins. Cover the finished ${walls.length === 1 ? 'surface' : 'surfaces'} below while the ceiling is skimmed.`)
  }
}

/** Strongly connected components (Tarjan's, without recursion): the component number of each node. */
function components(adj: number[][]): Int32Array {
  const n = adj.length
  const index = new Int32Array(n).fill(-1)
  const low = new Int32Array(n)
  const comp = new Int32Array(n).fill(-1)
  const onStack = new Uint8Array(n)
  const next = new Int32Array(n)
  const stack: number[] = []
  let counter = 0
  let comps = 0
  for (let root = 0; root < n; root++) {
    if (index[root] !== -1) continue
    const call = [root]
    index[root] = low[root] = counter++
    stack.push(root)
    onStack[root] = 1
    while (call.length) {
      const v = call[call.length - 1]!
      const out = adj[v]!
      if (next[v]! < out.length) {
        const w = out[next[v]!]!
        next[v]! += 1
        if (index[w] === -1) {
          index[w] = low[w] = counter++
          stack.push(w)
          onStack[w] = 1
          call.push(w)
        }
        else if (onStack[w]) {
          low[v] = Math.min(low[v]!, index[w]!)
        }
        continue
      }
      call.pop()
      if (call.length) {
        const u = call[call.length - 1]!
        low[u] = Math.min(low[u]!, low[v]!)
      }
      if (low[v] === index[v]) {
        let w: number
        do {
          w = stack.pop()!
          onStack[w] = 0
          comp[w] = comps
        } while (w !== v)
        comps += 1
      }
    }
  }
  return comp
}

function oversizedWarning(m: Model, s: ModelSurface): string {
  return `${s.name} needs ${fmtTenths(s.skimTenths)} bags, more than ${peopleText(m.people)} can lay on and trowel in one set (${fmtTenths(m.capTenths)}), so it has a set to itself. Split it at a natural break or bring more hands.`
}

// ---------------------------------------------------------------------------------------------
// Tasks and the "earlier set" graph

const ACTION_ORDER: Record<PlanAction, number> = { 'fill': 0, 'undercoat': 1, 'tight-coat': 2, 'skim': 3 }

interface Graph {
  surface: number[]
  action: PlanAction[]
  tenths: number[]
  /** For fills, undercoats and tight coats: 1-based part and how many parts. */
  part: number[]
  parts: number[]
  /** "In an earlier set" edges. */
  preds: number[][]
  succs: number[][]
  /** "In the same set or an earlier one" edges (ceilings first). */
  wpreds: number[][]
  wsuccs: number[][]
  /** Skims that must not share this skim's set. */
  apart: number[][]
  skimOf: number[]
  /** The earliest set each task can go in (1-based), counting an earlier-set edge as one set and a same-or-earlier edge as none. */
  level: number[]
  /** How many sets must follow each task, counted the same way. */
  tail: number[]
}

function buildGraph(m: Model): Graph {
  const g: Graph = { surface: [], action: [], tenths: [], part: [], parts: [], preds: [], succs: [], wpreds: [], wsuccs: [], apart: [], skimOf: [], level: [], tail: [] }
  const add = (s: number, action: PlanAction, tenths: number, part: number, parts: number): number => {
    g.surface.push(s)
    g.action.push(action)
    g.tenths.push(tenths)
    g.part.push(part)
    g.parts.push(parts)
    g.preds.push([])
    g.succs.push([])
    g.wpreds.push([])
    g.wsuccs.push([])
    g.apart.push([])
    return g.surface.length - 1
  }
  const edge = (from: number, to: number): void => {
    g.succs[from]!.push(to)
    g.preds[to]!.push(from)
  }
  /** A quantity bigger than one set can take is split into even parts, each in a set of its own. */
  const split = (s: number, action: PlanAction, tenths: number, into: number[]): void => {
    const parts = Math.ceil(tenths / m.capTenths)
    const base = Math.floor(tenths / parts)
    const extra = tenths - base * parts
    for (let p = 1; p <= parts; p++) into.push(add(s, action, base + (p <= extra ? 1 : 0), p, parts))
  }
  m.surfaces.forEach((s, i) => {
    const before: number[] = []
    if (s.hasPatches) split(i, 'fill', s.fillTenths, before)
    if (s.undercoatTenths > 0) split(i, 'undercoat', s.undercoatTenths, before)
    if (s.gap) {
      let prev = -1
      for (let p = 1; p <= TIGHT_COATS; p++) {
        const t = add(i, 'tight-coat', TIGHT_COAT_TENTHS, p, TIGHT_COATS)
        if (prev >= 0) edge(prev, t)
        prev = t
      }
      before.push(prev)
    }
    const skim = add(i, 'skim', s.skimTenths, 1, 1)
    for (const b of before) edge(b, skim)
    g.skimOf[i] = skim
  })
  for (const [f, r] of m.packed) edge(g.skimOf[f]!, g.skimOf[r]!)
  const dryKeys = new Set<string>()
  for (const [a, b] of m.dry) {
    g.apart[g.skimOf[a]!]!.push(g.skimOf[b]!)
    g.apart[g.skimOf[b]!]!.push(g.skimOf[a]!)
    dryKeys.add(`${a}:${b}`)
  }
  for (const [c, w] of m.ceilingBefore) {
    const x = g.skimOf[c]!
    const y = g.skimOf[w]!
    // a ceiling no later than a wall it may not share a set with (a difficult corner) is simply earlier
    if (dryKeys.has(c < w ? `${c}:${w}` : `${w}:${c}`)) {
      edge(x, y)
    }
    else {
      g.wsuccs[x]!.push(y)
      g.wpreds[y]!.push(x)
    }
  }

  // Longest paths over the DAG (Kahn's order, first in first out, so it is deterministic).
  const n = g.surface.length
  const indeg = g.preds.map((p, t) => p.length + g.wpreds[t]!.length)
  const order: number[] = []
  for (let t = 0; t < n; t++) if (indeg[t] === 0) order.push(t)
  const release = (s: number): void => {
    indeg[s]! -= 1
    if (indeg[s] === 0) order.push(s)
  }
  for (let h = 0; h < order.length; h++) {
    for (const s of g.succs[order[h]!]!) release(s)
    for (const s of g.wsuccs[order[h]!]!) release(s)
  }
  g.level = new Array<number>(n).fill(1)
  g.tail = new Array<number>(n).fill(0)
  for (const t of order) {
    for (const s of g.succs[t]!) g.level[s] = Math.max(g.level[s]!, g.level[t]! + 1)
    for (const s of g.wsuccs[t]!) g.level[s] = Math.max(g.level[s]!, g.level[t]!)
  }
  for (let h = order.length - 1; h >= 0; h--) {
    const t = order[h]!
    for (const s of g.succs[t]!) g.tail[t] = Math.max(g.tail[t]!, g.tail[s]! + 1)
    for (const s of g.wsuccs[t]!) g.tail[t] = Math.max(g.tail[t]!, g.tail[s]!)
  }
  return g
}

/**
 * The fewest sets any plan that keeps the rules can have: the larger of
 * - the longest chain of "must be in an earlier set" steps (a difficult corner counts as a step:
 *   one of its two faces must be earlier, whichever it is), and
 * - the bags over what one set takes, rounded up, an oversized skim counting a set of its own;
 *   counted as bin packing counts it (Martello and Toth's bound L2), which is never less: two
 *   tasks of more than half a set cannot share one, so with sets of 2 bags three walls of 1.2
 *   bags need three sets, not ceil(3.6 / 2) = 2.
 * 0 for nothing to plan.
 */
function lowerBound(g: Graph, m: Model): number {
  if (g.surface.length === 0) return 0
  let chain = 1
  g.tenths.forEach((_, t) => {
    chain = Math.max(chain, g.level[t]! + g.tail[t]!)
    for (const d of g.apart[t]!) {
      if (d > t) chain = Math.max(chain, Math.min(g.level[t]! + 1 + g.tail[d]!, g.level[d]! + 1 + g.tail[t]!))
    }
  })
  let best = Math.max(chain, binsNeeded(g.tenths, m.capTenths))
  // Both together: everything that must be no earlier than a task t sits in sets from t's level
  // on, so the sets are at least level - 1 plus what those tasks need packed on their own; and
  // the same the other way round with what must be no later than t, and t's tail. Worked out
  // within a budget of steps (a big job gets a weaker bound, never a wrong one).
  const stamp = new Int32Array(g.surface.length)
  let visit = 0
  let budget = BOUND_STEPS
  const reach = (t: number, next: number[][], weak: number[][]): number[] | null => {
    visit += 1
    stamp[t] = visit
    const stack = [t]
    const out: number[] = []
    while (stack.length) {
      const x = stack.pop()!
      out.push(g.tenths[x]!)
      if (--budget < 0) return null
      for (const list of [next[x]!, weak[x]!]) {
        for (const y of list) {
          if (stamp[y] !== visit) {
            stamp[y] = visit
            stack.push(y)
          }
        }
      }
    }
    return out
  }
  for (let t = 0; t < g.surface.length && budget > 0; t++) {
    if (g.succs[t]!.length || g.wsuccs[t]!.length) {
      const later = reach(t, g.succs, g.wsuccs)
      if (later) best = Math.max(best, g.level[t]! - 1 + binsNeeded(later, m.capTenths))
    }
    if (g.preds[t]!.length || g.wpreds[t]!.length) {
      const earlier = reach(t, g.preds, g.wpreds)
      if (earlier) best = Math.max(best, g.tail[t]! + binsNeeded(earlier, m.capTenths))
    }
  }
  return best
}

/** The most steps `lowerBound` takes to put chains and bags together. */
const BOUND_STEPS = 200_000

/**
 * Martello and Toth's lower bound L2 for packing sizes into bins of `cap` (all whole tenths; a size
 * over cap counts a bin of its own). For each a from 0 to cap/2: the sizes over cap - a each need a
 * bin; those over cap/2 each need one too and leave cap - size free in it; the sizes from a to cap/2
 * then need what they do not fit in that free room, over cap. The largest over a is the bound; at
 * a = 0 it is at least the bags over cap, rounded up.
 */
function binsNeeded(tenths: readonly number[], cap: number): number {
  const w = [...tenths].sort((x, y) => x - y)
  const n = w.length
  const prefix = new Array<number>(n + 1).fill(0)
  for (let i = 0; i < n; i++) prefix[i + 1] = prefix[i]! + w[i]!
  /** How many sizes are at most x. */
  const atMost = (x: number): number => {
    let lo = 0
    let hi = n
    while (lo < hi) {
      const mid = (lo + hi) >> 1
      if (w[mid]! <= x) lo = mid + 1
      else hi = mid
    }
    return lo
  }
  const half = Math.floor(cap / 2)
  const iHalf = atMost(half)
  let best = 0
  const candidates = [0, ...new Set(w.filter(x => x > 0 && x <= half))]
  for (const a of candidates) {
    const iBig = atMost(cap - a)
    const n1 = n - iBig
    const n2 = iBig - iHalf
    const free = n2 * cap - (prefix[iBig]! - prefix[iHalf]!)
    const iA = atMost(a - 1)
    const small = prefix[iHalf]! - prefix[iA]!
    const bound = n1 + n2 + Math.max(0, Math.ceil((small - free) / cap))
    if (bound > best) best = bound
  }
  return best
}

/**
 * The fewest sets the rules allow for these surfaces (see `lowerBound`): no plan that keeps them
 * all has fewer; the planner aims to meet it. Throws like `planSets` for a bad number.
 */
export function setLowerBound(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions): number {
  const m = buildModel(surfaces, corners, options, undefined)
  return lowerBound(buildGraph(m), m)
}

// ---------------------------------------------------------------------------------------------
// Packing

interface Packing {
  /** 0-based set of each task. */
  setOf: Int32Array
  load: number[]
  count: number[]
}

/**
 * A segment tree over the sets: the least value in a range, and the first set in a range whose
 * value is at most x, each in about log(sets) steps. It keeps the packing near (tasks x log sets)
 * instead of (tasks x sets) when a big job has hundreds of sets.
 */
class MinTree {
  private readonly size: number
  private readonly v: Float64Array
  constructor(n: number) {
    let size = 1
    while (size < n) size <<= 1
    this.size = size
    this.v = new Float64Array(2 * size).fill(Number.POSITIVE_INFINITY)
  }

  get(i: number): number {
    return this.v[this.size + i]!
  }

  set(i: number, x: number): void {
    let p = this.size + i
    this.v[p] = x
    for (p >>= 1; p >= 1; p >>= 1) this.v[p] = Math.min(this.v[2 * p]!, this.v[2 * p + 1]!)
  }

  min(lo: number, hi: number): number {
    let m = Number.POSITIVE_INFINITY
    for (let l = lo + this.size, r = hi + this.size + 1; l < r; l >>= 1, r >>= 1) {
      if (l & 1) m = Math.min(m, this.v[l++]!)
      if (r & 1) m = Math.min(m, this.v[--r]!)
    }
    return m
  }

  /** The first index in [lo, hi] whose value is at most x, or -1. */
  firstAtMost(lo: number, hi: number, x: number): number {
    if (lo > hi) return -1
    return this.find(1, 0, this.size - 1, lo, hi, x)
  }

  /** The index of the least value in [lo, hi] (the first on a tie), or -1 when all are Infinity. */
  argMin(lo: number, hi: number): number {
    if (lo > hi) return -1
    const m = this.min(lo, hi)
    return m === Number.POSITIVE_INFINITY ? -1 : this.find(1, 0, this.size - 1, lo, hi, m)
  }

  private find(node: number, nl: number, nr: number, lo: number, hi: number, x: number): number {
    if (nr < lo || nl > hi || this.v[node]! > x) return -1
    if (nl === nr) return nl
    const mid = (nl + nr) >> 1
    const left = this.find(2 * node, nl, mid, lo, hi, x)
    return left >= 0 ? left : this.find(2 * node + 1, mid + 1, nr, lo, hi, x)
  }

  private hidden: number[] = []

  /** Hides set j (as +Infinity) until `restore`; hiding the same set twice is fine. */
  hide(j: number): void {
    this.hidden.push(j, this.get(j))
    this.set(j, Number.POSITIVE_INFINITY)
  }

  restore(): void {
    const h = this.hidden
    while (h.length) {
      const x = h.pop()!
      this.set(h.pop()!, x)
    }
  }
}

/** Hides the sets (placed so far) of t's difficult-corner partners. */
function hideApart(g: Graph, setOf: Int32Array, tree: MinTree, t: number): void {
  for (const d of g.apart[t]!) if (setOf[d]! >= 0) tree.hide(setOf[d]!)
}

function placeOrder(g: Graph): number[] {
  // level first (every task after the tasks it follows), then the tightest (longest tail), then a
  // ceiling before the walls it goes no later than (same level and tail), then the biggest
  const first = (t: number): number => (g.wsuccs[t]!.length ? 0 : 1)
  return g.surface.map((_, t) => t).sort((x, y) =>
    g.level[x]! - g.level[y]! || g.tail[y]! - g.tail[x]! || first(x) - first(y) || g.tenths[y]! - g.tenths[x]! || x - y)
}

function earliest(g: Graph, setOf: Int32Array, t: number): number {
  let e = 0
  for (const p of g.preds[t]!) e = Math.max(e, setOf[p]! + 1)
  for (const p of g.wpreds[t]!) e = Math.max(e, setOf[p]!)
  return e
}

function place(g: Graph, pk: Packing, t: number, j: number): void {
  pk.setOf[t] = j
  pk.load[j]! += g.tenths[t]!
  pk.count[j]! += 1
}

/**
 * First fit in level order, opening a set when nothing fits: always succeeds. Every open set has
 * work in it, so "fits" is load + bags <= cap, and an oversized skim always opens its own set.
 */
function firstFit(g: Graph, order: number[], cap: number): Packing {
  const pk: Packing = { setOf: new Int32Array(g.surface.length).fill(-1), load: [], count: [] }
  const tree = new MinTree(g.surface.length)
  for (const t of order) {
    const e = earliest(g, pk.setOf, t)
    const b = g.tenths[t]!
    hideApart(g, pk.setOf, tree, t)
    let j = tree.firstAtMost(e, pk.load.length - 1, cap - b)
    tree.restore()
    if (j < 0) {
      j = pk.load.length
      pk.load.push(0)
      pk.count.push(0)
    }
    place(g, pk, t, j)
    tree.set(j, pk.load[j]!)
  }
  return pk
}

/**
 * Each task into the least-loaded set it may go in, among exactly k sets, leaving room after it
 * for the sets its followers need; null when one does not fit. The tree holds 2 x load, plus 1 for
 * a set with work in it, so an empty set is preferred to one holding only a 0-bag task.
 */
function balanced(g: Graph, order: number[], cap: number, k: number): Packing | null {
  const pk: Packing = { setOf: new Int32Array(g.surface.length).fill(-1), load: new Array<number>(k).fill(0), count: new Array<number>(k).fill(0) }
  const tree = new MinTree(k)
  for (let j = 0; j < k; j++) tree.set(j, 0)
  for (const t of order) {
    hideApart(g, pk.setOf, tree, t)
    const j = tree.argMin(earliest(g, pk.setOf, t), k - 1 - g.tail[t]!)
    tree.restore()
    if (j < 0 || (pk.count[j]! > 0 && pk.load[j]! + g.tenths[t]! > cap)) return null
    place(g, pk, t, j)
    tree.set(j, 2 * pk.load[j]! + 1)
  }
  return pk
}

/**
 * Each task into the first set it may go in that has room, among exactly k sets (leaving room after
 * it for the sets its followers need); an oversized skim only into an empty set; null when one
 * does not fit. Where the balanced packing leaves gaps it cannot fill, this one packs tight.
 */
function firstInK(g: Graph, order: number[], cap: number, k: number): Packing | null {
  const pk: Packing = { setOf: new Int32Array(g.surface.length).fill(-1), load: new Array<number>(k).fill(0), count: new Array<number>(k).fill(0) }
  const tree = new MinTree(k)
  for (let j = 0; j < k; j++) tree.set(j, 0)
  for (const t of order) {
    const b = g.tenths[t]!
    hideApart(g, pk.setOf, tree, t)
    const j = tree.firstAtMost(earliest(g, pk.setOf, t), k - 1 - g.tail[t]!, b > cap ? 0 : 2 * (cap - b) + 1)
    tree.restore()
    if (j < 0) return null
    place(g, pk, t, j)
    tree.set(j, 2 * pk.load[j]! + 1)
  }
  return pk
}

/**
 * A search with a step budget for a packing into exactly k sets: each task in turn (in `order`)
 * into each set it may go in that has room, backing up when one cannot go anywhere. Null when
 * there is none, or none found within `budget` steps. For a house-sized job above the bound, where
 * the greedy packings leave a set too many.
 */
function searchK(g: Graph, order: number[], cap: number, k: number, budget: number): Packing | null {
  const n = order.length
  const pk: Packing = { setOf: new Int32Array(g.surface.length).fill(-1), load: new Array<number>(k).fill(0), count: new Array<number>(k).fill(0) }
  const after = new Array<number>(n + 1).fill(0)
  for (let i = n - 1; i >= 0; i--) after[i] = after[i + 1]! + Math.min(g.tenths[order[i]!]!, cap)
  let steps = 0
  /** The room the sets have left, kept as tasks come and go. */
  let room = k * cap
  const roomIn = (j: number): number => Math.max(0, cap - pk.load[j]!)
  const fits = (t: number, j: number): boolean => {
    const b = g.tenths[t]!
    if (b > cap ? pk.count[j]! > 0 : pk.load[j]! + b > cap) return false
    if (pk.load[j]! > cap) return false
    for (const d of g.apart[t]!) if (pk.setOf[d] === j) return false
    for (const s of g.wsuccs[t]!) if (pk.setOf[s]! >= 0 && pk.setOf[s]! < j) return false
    return true
  }
  const go = (i: number): boolean => {
    if (i === n) return true
    if (++steps > budget) return false
    // what is left must fit in the room the sets have left
    if (after[i]! > room) return false
    const t = order[i]!
    const hi = k - 1 - g.tail[t]!
    // the fullest set it fits in first (best fit), then the emptier ones
    const choices: number[] = []
    const lo = earliest(g, pk.setOf, t)
    steps += Math.max(0, hi - lo + 1)
    for (let j = lo; j <= hi; j++) if (fits(t, j)) choices.push(j)
    choices.sort((x, y) => pk.load[y]! - pk.load[x]! || x - y)
    for (const j of choices) {
      const before = room
      room -= roomIn(j)
      place(g, pk, t, j)
      room += roomIn(j)
      if (go(i + 1)) return true
      pk.setOf[t] = -1
      pk.load[j]! -= g.tenths[t]!
      pk.count[j]! -= 1
      room = before
      if (steps > budget) return false
    }
    return false
  }
  return go(0) ? pk : null
}

/** The sets task t may go in now, given where the others are: [lo, hi], less its difficult-corner partners' sets (checked by `allowed`). */
function windowOf(g: Graph, pk: Packing, t: number): [number, number] {
  let lo = 0
  let hi = pk.load.length - 1
  for (const p of g.preds[t]!) lo = Math.max(lo, pk.setOf[p]! + 1)
  for (const p of g.wpreds[t]!) lo = Math.max(lo, pk.setOf[p]!)
  for (const s of g.succs[t]!) hi = Math.min(hi, pk.setOf[s]! - 1)
  for (const s of g.wsuccs[t]!) hi = Math.min(hi, pk.setOf[s]!)
  return [lo, hi]
}

function move(g: Graph, pk: Packing, members: number[][], t: number, to: number): void {
  const from = pk.setOf[t]!
  pk.load[from]! -= g.tenths[t]!
  pk.count[from]! -= 1
  members[from]!.splice(members[from]!.indexOf(t), 1)
  place(g, pk, t, to)
  members[to]!.push(t)
}

/**
 * Tries to empty one of the lighter sets by moving each of its tasks to another set it may go in
 * that has room (the fullest first), or, failing that, by first moving one task out of such a set
 * to a third one to make room. All or nothing: a set that cannot be emptied is left as it was.
 * True when a set was emptied (compact it after).
 */
function emptyOneSet(g: Graph, pk: Packing, cap: number): boolean {
  const k = pk.load.length
  const members: number[][] = pk.load.map(() => [])
  pk.setOf.forEach((j, t) => members[j]!.push(t))
  const fitsIn = (t: number, x: number, skip: number): boolean => {
    if (x === skip || pk.count[x] === 0 || pk.load[x]! > cap || pk.load[x]! + g.tenths[t]! > cap) return false
    return g.apart[t]!.every(d => pk.setOf[d] !== x)
  }
  const relocate = (t: number, skip: number): boolean => {
    const [lo, hi] = windowOf(g, pk, t)
    let best = -1
    for (let x = lo; x <= hi; x++) if (fitsIn(t, x, skip) && (best < 0 || pk.load[x]! > pk.load[best]!)) best = x
    if (best >= 0) {
      move(g, pk, members, t, best)
      return true
    }
    // make room: move one task u out of a set x t may go in, to a third set y
    for (let x = lo; x <= hi; x++) {
      if (x === skip || pk.count[x] === 0 || pk.load[x]! > cap || !g.apart[t]!.every(d => pk.setOf[d] !== x)) continue
      for (const u of [...members[x]!]) {
        if (pk.load[x]! - g.tenths[u]! + g.tenths[t]! > cap || g.apart[t]!.includes(u)) continue
        const [ulo, uhi] = windowOf(g, pk, u)
        for (let y = ulo; y <= uhi; y++) {
          if (y === x || !fitsIn(u, y, skip)) continue
          move(g, pk, members, u, y)
          // t's window may have changed with u gone (u may be one of its neighbours)
          const [tlo, thi] = windowOf(g, pk, t)
          if (x >= tlo && x <= thi && fitsIn(t, x, skip)) {
            move(g, pk, members, t, x)
            return true
          }
          move(g, pk, members, u, x)
        }
      }
    }
    return false
  }
  const lightest = [...Array(k).keys()].filter(j => pk.count[j]! > 0).sort((x, y) => pk.load[x]! - pk.load[y]! || x - y).slice(0, 3)
  for (const j of lightest) {
    const setOf = pk.setOf.slice()
    const load = [...pk.load]
    const count = [...pk.count]
    const before = members.map(list => [...list])
    const tasks = [...members[j]!].sort((x, y) => g.tenths[y]! - g.tenths[x]! || x - y)
    if (tasks.every(t => relocate(t, j))) return true
    pk.setOf.set(setOf)
    pk.load.splice(0, k, ...load)
    pk.count.splice(0, k, ...count)
    before.forEach((list, i) => {
      members[i] = list
    })
  }
  return false
}

/** mulberry32: a small generator of numbers in [0, 1) from a seed, the same every time. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296
  }
}

/** Drops empty sets and numbers the rest 0.. in order. */
function compact(pk: Packing): Packing {
  const map = new Int32Array(pk.load.length).fill(-1)
  const load: number[] = []
  const count: number[] = []
  pk.load.forEach((l, j) => {
    if (pk.count[j]! > 0) {
      map[j] = load.length
      load.push(l)
      count.push(pk.count[j]!)
    }
  })
  const setOf = pk.setOf.map(j => map[j]!)
  return { setOf, load, count }
}

/** Merges each set into the one before it where the two can be one set; one pass left to right is enough. */
function mergeNeighbours(g: Graph, pk: Packing, cap: number): boolean {
  const members: number[][] = pk.load.map(() => [])
  pk.setOf.forEach((j, t) => members[j]!.push(t))
  let merged = false
  let cur = -1
  for (let j = 0; j < members.length; j++) {
    if (members[j]!.length === 0) continue
    if (cur >= 0 && pk.load[cur]! + pk.load[j]! <= cap
      && members[j]!.every(t => g.preds[t]!.every(p => pk.setOf[p] !== cur) && g.apart[t]!.every(d => pk.setOf[d] !== cur))) {
      for (const t of members[j]!) pk.setOf[t] = cur
      members[cur]!.push(...members[j]!)
      pk.load[cur]! += pk.load[j]!
      pk.count[cur]! += pk.count[j]!
      pk.load[j] = 0
      pk.count[j] = 0
      members[j] = []
      merged = true
    }
    else {
      cur = j
    }
  }
  return merged
}

/**
 * Moves single tasks from a heavier set to the lightest set they may go in, while every rule
 * holds, until no move helps. A move of b bags from a set of load Li to one of Lj is only made
 * when Lj + b < Li, so the sum of the squared loads falls every time and the loop ends.
 */
function evenOut(g: Graph, order: number[], pk: Packing, cap: number, maxPasses: number): boolean {
  const k = pk.load.length
  const tree = new MinTree(k)
  for (let j = 0; j < k; j++) if (pk.count[j]! > 0) tree.set(j, pk.load[j]!)
  let movedAny = false
  for (let pass = 0; pass < maxPasses; pass++) {
    let moved = false
    for (const t of order) {
      const b = g.tenths[t]!
      if (b === 0) continue
      const i = pk.setOf[t]!
      const lo = earliest(g, pk.setOf, t)
      let hi = k - 1
      for (const s of g.succs[t]!) hi = Math.min(hi, pk.setOf[s]! - 1)
      for (const s of g.wsuccs[t]!) hi = Math.min(hi, pk.setOf[s]!)
      tree.hide(i)
      hideApart(g, pk.setOf, tree, t)
      const j = tree.argMin(lo, hi)
      tree.restore()
      if (j < 0) continue
      const lj = pk.load[j]!
      if (lj + b < pk.load[i]! && lj + b <= cap) {
        pk.load[i]! -= b
        pk.count[i]! -= 1
        tree.set(i, pk.count[i]! > 0 ? pk.load[i]! : Number.POSITIVE_INFINITY)
        place(g, pk, t, j)
        tree.set(j, pk.load[j]!)
        moved = true
      }
    }
    if (!moved) break
    movedAny = true
  }
  return movedAny
}

/** Whether task t may sit in set j, with `other` about to leave j for set `otherTo` (a swap). */
function mayGo(g: Graph, pk: Packing, t: number, j: number, other: number, otherTo: number): boolean {
  const at = (x: number): number => (x === other ? otherTo : pk.setOf[x]!)
  for (const p of g.preds[t]!) if (at(p) >= j) return false
  for (const s of g.succs[t]!) if (at(s) <= j) return false
  for (const p of g.wpreds[t]!) if (at(p) > j) return false
  for (const s of g.wsuccs[t]!) if (at(s) < j) return false
  for (const d of g.apart[t]!) if (at(d) === j) return false
  return true
}

/** Jobs up to this many tasks are searched (within SEARCH_STEPS steps) when the greedy packings stay above the bound. */
const SEARCH_UP_TO = 300
const SEARCH_STEPS = 20_000

/** Jobs up to this many tasks also try swaps between the heaviest (or lightest) set and every other. */
const WIDE_SWAPS_UP_TO = 600

/**
 * Swaps a pair of tasks between the heaviest and the lightest set (and, on a house-sized job,
 * between either of them and any other set) when that evens the two where a single move could
 * not. A bigger task b from the heavier set H goes for a smaller c from the lighter set L only
 * when L + (b - c) < H, so again the sum of the squared loads falls. Sets holding an oversized
 * skim are left alone.
 */
function swapExtremes(g: Graph, pk: Packing, cap: number, maxSwaps: number): boolean {
  const members: number[][] = pk.load.map(() => [])
  pk.setOf.forEach((j, t) => members[j]!.push(t))
  const wide = g.surface.length <= WIDE_SWAPS_UP_TO
  let swapped = false
  for (let n = 0; n < maxSwaps; n++) {
    let heavy = -1
    let light = -1
    pk.load.forEach((l, j) => {
      if (pk.count[j] === 0 || l > cap) return
      if (heavy < 0 || l > pk.load[heavy]!) heavy = j
      if (light < 0 || l < pk.load[light]!) light = j
    })
    if (heavy < 0 || heavy === light) break
    let best: [number, number] | null = null
    let bestGain = 0
    const tryPair = (x: number, y: number): void => {
      if (y === x || pk.count[y] === 0 || pk.load[y]! > cap) return
      const [hi, lo] = pk.load[x]! > pk.load[y]! ? [x, y] : [y, x]
      const gap = pk.load[hi]! - pk.load[lo]!
      for (const big of members[hi]!) {
        for (const small of members[lo]!) {
          const d = g.tenths[big]! - g.tenths[small]!
          if (d <= 0 || d >= gap || pk.load[lo]! + d > cap) continue
          const gain = d * (gap - d)
          if (gain > bestGain && mayGo(g, pk, big, lo, small, hi) && mayGo(g, pk, small, hi, big, lo)) {
            bestGain = gain
            best = [big, small]
          }
        }
      }
    }
    tryPair(heavy, light)
    if (!best && wide) {
      for (const x of [heavy, light]) {
        for (let y = 0; y < members.length && !best; y++) tryPair(x, y)
        if (best) break
      }
    }
    if (!best) break
    const [big, small] = best as [number, number]
    const hi = pk.setOf[big]!
    const lo = pk.setOf[small]!
    const d = g.tenths[big]! - g.tenths[small]!
    pk.setOf[big] = lo
    pk.setOf[small] = hi
    pk.load[hi]! -= d
    pk.load[lo]! += d
    members[hi]!.splice(members[hi]!.indexOf(big), 1, small)
    members[lo]!.splice(members[lo]!.indexOf(small), 1, big)
    swapped = true
  }
  return swapped
}

function pack(g: Graph, m: Model): Packing {
  const cap = m.capTenths
  const order = placeOrder(g)
  if (order.length === 0) return { setOf: new Int32Array(0), load: [], count: [] }
  const ff = compact(firstFit(g, order, cap))
  const bound = Math.max(lowerBound(g, m), 1)
  let lo = bound
  let hi = ff.load.length - 1
  let best: Packing | null = null
  const tryK = (k: number): Packing | null => balanced(g, order, cap, k) ?? firstInK(g, order, cap, k)
  // the bound and the few sets above it one by one (where most plans are), then halving the rest
  for (const stop = Math.min(hi, lo + 2); lo <= stop && !best; lo++) best = tryK(lo)
  if (best) hi = -1
  while (lo <= hi) {
    const mid = Math.floor((lo + hi) / 2)
    const p = tryK(mid)
    if (p) {
      best = p
      hi = mid - 1
    }
    else {
      lo = mid + 1
    }
  }
  let pk = compact(best ?? balanced(g, order, cap, ff.load.length) ?? ff)
  // Still above the bound: try again one set fewer with the tasks of each level in other orders
  // (shuffled by a fixed-seed generator, so the same job always gives the same plan), two dozen
  // times on a house-sized job (an estate keeps what it has: the time is not worth it there).
  const tries = order.length <= 400 ? 24 : 0
  const rand = mulberry32(0x5e7)
  for (let i = 0; i < tries && pk.load.length > bound; i++) {
    const key = new Float64Array(order.length)
    for (let t = 0; t < key.length; t++) key[t] = rand()
    const first = (t: number): number => (g.wsuccs[t]!.length ? 0 : 1)
    // every other try keeps the tightest tasks (longest tail) first within a level
    const tight = i % 2 === 0 ? 1 : 0
    const shuffled = [...order].sort((x, y) => g.level[x]! - g.level[y]! || tight * (g.tail[y]! - g.tail[x]!) || first(x) - first(y) || key[x]! - key[y]!)
    const k = pk.load.length - 1
    const p = firstInK(g, shuffled, cap, k) ?? balanced(g, shuffled, cap, k)
    if (p) pk = compact(p)
  }
  // a house still above the bound: empty a light set by moving its tasks, then a search with a step budget, one set fewer at a time
  while (order.length <= SEARCH_UP_TO && pk.load.length > bound && emptyOneSet(g, pk, cap)) pk = compact(pk)
  if (order.length <= SEARCH_UP_TO && pk.load.length > bound) {
    // the planner's order, then the biggest first within a level (as bin packing is searched)
    const first = (t: number): number => (g.wsuccs[t]!.length ? 0 : 1)
    const biggest = [...order].sort((x, y) => g.level[x]! - g.level[y]! || first(x) - first(y) || g.tenths[y]! - g.tenths[x]! || x - y)
    for (const o of [order, biggest]) {
      while (pk.load.length > bound) {
        const p = searchK(g, o, cap, pk.load.length - 1, SEARCH_STEPS)
        if (!p) break
        pk = compact(p)
      }
    }
  }
  for (let round = 0; round < 50; round++) {
    mergeNeighbours(g, pk, cap)
    pk = compact(pk)
    const moved = evenOut(g, order, pk, cap, 100)
    const swapped = swapExtremes(g, pk, cap, 4 * pk.load.length + 10)
    if (!moved && !swapped) break
  }
  return compact(pk)
}

// ---------------------------------------------------------------------------------------------
// Reasons

/** Where each task of a plan is: worked out from the plan itself, so any plan can be explained. */
interface Placed {
  /** Per surface: the sets (numbers) of its skims, fills, undercoats and tight coats, in set order. */
  skims: number[][]
  fills: number[][]
  undercoats: number[][]
  coats: number[][]
  /** Per set number: bags in tenths and how many tasks. */
  load: Map<number, number>
  count: Map<number, number>
}

function placed(m: Model, plan: SetPlan): Placed {
  const n = m.surfaces.length
  const p: Placed = { skims: [], fills: [], undercoats: [], coats: [], load: new Map(), count: new Map() }
  for (let i = 0; i < n; i++) {
    p.skims.push([])
    p.fills.push([])
    p.undercoats.push([])
    p.coats.push([])
  }
  const bySet = [...plan.sets].sort((x, y) => x.number - y.number)
  for (const set of bySet) {
    let load = 0
    for (const t of set.tasks) {
      load += taskTenths(t.bags) ?? 0
      const s = m.index.get(t.surfaceId)
      if (s === undefined) continue
      const list = t.action === 'skim' ? p.skims : t.action === 'fill' ? p.fills : t.action === 'undercoat' ? p.undercoats : t.action === 'tight-coat' ? p.coats : null
      list?.[s]!.push(set.number)
    }
    p.load.set(set.number, (p.load.get(set.number) ?? 0) + load)
    p.count.set(set.number, (p.count.get(set.number) ?? 0) + set.tasks.length)
  }
  return p
}

/** Who is related to whom by the rules, per surface. */
interface Relations { faces: number[][], returns: number[][], partners: number[][], ceilingWalls: number[][], overruledWalls: number[][] }

function relations(m: Model): Relations {
  const list = (): number[][] => m.surfaces.map(() => [])
  const r: Relations = { faces: list(), returns: list(), partners: list(), ceilingWalls: list(), overruledWalls: list() }
  for (const [f, x] of m.packed) {
    r.returns[f]!.push(x)
    r.faces[x]!.push(f)
  }
  for (const [a, b] of m.dry) {
    r.partners[a]!.push(b)
    r.partners[b]!.push(a)
  }
  for (const [c, w] of m.ceilingBefore) r.ceilingWalls[c]!.push(w)
  for (const [c, w] of m.overruled) r.overruledWalls[c]!.push(w)
  return r
}

const SEE = 'see the warnings'

/**
 * Each task's reason, worked out from where the tasks of `plan` are now (the planner's plan, or
 * one with surfaces moved by hand): every set a reason names is the set of its own task or of a
 * task it names, and a rule the plan breaks is said as broken ("see the warnings"), never as kept.
 * `moved` are the surfaces whose skim was moved by hand. The plan comes back with its tasks in
 * order in each set (each room's ceiling first when the rule is on, then fills, undercoats, tight
 * coats, skims), its set numbers, bags and warnings as given.
 */
function explain(m: Model, plan: SetPlan, moved: ReadonlySet<string>): SetPlan {
  const at = placed(m, plan)
  const rel = relations(m)
  const cap = m.capTenths
  const surfaces = m.surfaces
  const skimIn = (s: number): number | undefined => at.skims[s]![0]
  const seen = new Map<string, number>()
  const nth = (s: number, action: PlanAction): number => {
    const key = `${s}:${action}`
    const k = (seen.get(key) ?? 0) + 1
    seen.set(key, k)
    return k
  }
  const named = (s: number): string => {
    const x = skimIn(s)
    return x === undefined ? surfaces[s]!.name : `${surfaces[s]!.name} (set ${x})`
  }
  const wallsOf = (room: string, other: boolean): string => `the ${other ? 'other ' : ''}walls${room ? ` of ${room}` : ''}`

  const before = (s: number, action: 'fill' | 'undercoat' | 'tight-coat', j: number): string => {
    const k = nth(s, action)
    const parts = (action === 'fill' ? at.fills : action === 'undercoat' ? at.undercoats : at.coats)[s]!.length
    const skim = skimIn(s)
    if (action === 'fill') {
      const what = parts > 1 ? `Patch fill, part ${k} of ${parts}, in set ${j}` : `Patch filled in set ${j}`
      if (skim === undefined) return `${what} so the skim over it has even suction, but the surface is not skimmed in any set (${SEE})`
      if (j < skim) return `${what} so the skim over it in set ${skim} has even suction`
      return `${what}, but the skim over it is in set ${skim}: a patch is filled in an earlier set than its skim so the surface has even suction (${SEE})`
    }
    if (action === 'undercoat') {
      const what = parts > 1 ? `Undercoat over the whole surface, part ${k} of ${parts}, in set ${j}` : `Undercoat over the whole surface in set ${j}`
      if (skim === undefined) return `${what}, to firm up before the skim, but the surface is not skimmed in any set (${SEE})`
      if (j < skim) return `${what}, to firm up before the skim over it in set ${skim}`
      return `${what}, but the skim over it is in set ${skim}: the undercoat goes in an earlier set than its skim (${SEE})`
    }
    const what = `Thin tight coat over the scrimmed gap, ${k} of ${parts}, in set ${j}`
    if (skim === undefined) return `${what}, to firm up before the skim, but the surface is not skimmed in any set (${SEE})`
    if (j < skim) return `${what}, to firm up before the skim in set ${skim}`
    return `${what}, but the skim is in set ${skim}: the tight coats go in earlier sets than the skim (${SEE})`
  }

  const skimReason = (s: number, j: number): string => {
    const sf = surfaces[s]!
    const said: string[] = []
    const load = at.load.get(j) ?? 0
    const over = load > cap
    if (moved.has(sf.id)) said.push(`Moved to set ${j} by hand`)
    const linked = new Set<number>()
    const setOf = (x: number): number => skimIn(x) ?? 0
    const returns = rel.returns[s]!
    if (returns.length) {
      const ok = returns.filter(r => setOf(r) > j)
      const bad = returns.filter(r => setOf(r) <= j)
      if (ok.length) said.push(`Face of the packed-out bead, skimmed in set ${j} before its return (${nameList(ok.map(r => `${surfaces[r]!.name} in set ${setOf(r)}`))}) so the set plaster holds the bead`)
      if (bad.length) said.push(`Face of the packed-out bead, in set ${j}, but its return (${nameList(bad.map(r => `${surfaces[r]!.name} in set ${setOf(r)}`))}) is not in a later set (${SEE})`)
      returns.forEach(r => linked.add(r))
    }
    const faces = rel.faces[s]!
    if (faces.length) {
      const ok = faces.filter(f => setOf(f) > 0 && setOf(f) < j)
      const bad = faces.filter(f => !(setOf(f) > 0 && setOf(f) < j))
      if (ok.length) said.push(`Return of the packed-out bead, skimmed in set ${j} after its face (${nameList(ok.map(f => `${surfaces[f]!.name} in set ${setOf(f)}`))}) so the bead is already held`)
      if (bad.length) said.push(`Return of the packed-out bead, in set ${j}, but its face (${nameList(bad.map(f => `${surfaces[f]!.name} in set ${setOf(f)}`))}) is not in an earlier set (${SEE})`)
      faces.forEach(f => linked.add(f))
    }
    const partners = rel.partners[s]!.filter(p => !linked.has(p) && skimIn(p) !== undefined)
    const earlier = partners.filter(p => setOf(p) < j)
    const later = partners.filter(p => setOf(p) > j)
    const same = partners.filter(p => setOf(p) === j)
    if (earlier.length) said.push(`Skimmed in set ${j} so the corner with ${nameList(earlier.map(named))} is against a face that has already set`)
    if (later.length) said.push(`Skimmed in set ${j}, before ${nameList(later.map(named))}, so that difficult corner is not worked with both faces wet`)
    if (same.length) said.push(`Skimmed in set ${j}, the same set as ${nameList(same.map(p => surfaces[p]!.name))} across a difficult corner (${SEE})`)
    const fills = at.fills[s]!
    if (fills.length) {
      const ok = fills.filter(f => f < j)
      if (ok.length) said.push(`Skimmed in set ${j}, after the patch fill in ${setList(ok)}, so the whole surface has even suction`)
      if (ok.length < fills.length) said.push(`Skimmed in set ${j}, but its patch fill in ${setList(fills.filter(f => f >= j))} is not in an earlier set (${SEE})`)
    }
    const undercoats = at.undercoats[s]!
    if (undercoats.length) {
      const ok = undercoats.filter(f => f < j)
      if (ok.length) said.push(`Skimmed in set ${j}, after the undercoat over the whole surface in ${setList(ok)}`)
      if (ok.length < undercoats.length) said.push(`Skimmed in set ${j}, but its undercoat in ${setList(undercoats.filter(f => f >= j))} is not in an earlier set (${SEE})`)
    }
    const coats = at.coats[s]!
    if (coats.length) {
      const ok = coats.filter(c => c < j)
      if (ok.length) said.push(`Skimmed in set ${j}, after the thin tight coats over the scrimmed gap in ${setList(ok)}`)
      if (ok.length < coats.length) said.push(`Skimmed in set ${j}, but a thin tight coat over the scrimmed gap in ${setList(coats.filter(c => c >= j))} is not in an earlier set (${SEE})`)
    }
    if (sf.ceiling && m.ceilingsFirst) {
      const walls = rel.ceilingWalls[s]!.filter(w => skimIn(w) !== undefined)
      const earlierWalls = walls.filter(w => setOf(w) < j)
      const overruled = rel.overruledWalls[s]!
      if (walls.length && !earlierWalls.length) {
        const first = walls.some(w => setOf(w) === j) ? 'first ' : ''
        said.push(`Ceiling ${first}in set ${j}, before ${wallsOf(sf.room, overruled.length > 0)}, so plaster dropped from it lands on walls not yet skimmed`)
      }
      if (earlierWalls.length) {
        said.push(`Ceiling in set ${j}, after ${nameList(earlierWalls.map(named))}: the firm does ceilings first, so plaster dropped from them lands on walls not yet skimmed (${SEE})`)
      }
      if (overruled.length) {
        said.push(`Not before ${nameList(overruled.map(w => surfaces[w]!.name))}: packed-out beads need ${overruled.length === 1 ? 'that surface' : 'those surfaces'} skimmed first, and that rule wins over ceilings first`)
      }
    }
    const rules = said.length - (moved.has(sf.id) ? 1 : 0)
    const count = at.count.get(j) ?? 0
    if (sf.skimTenths > cap) {
      said.push(count === 1
        ? `On its own in set ${j}: at ${fmtTenths(sf.skimTenths)} bags it is more than ${peopleText(m.people)} can lay on and trowel in one set (${fmtTenths(cap)})`
        : `In set ${j} with other work, though at ${fmtTenths(sf.skimTenths)} bags it is more than ${peopleText(m.people)} can lay on and trowel in one set (${fmtTenths(cap)}) (${SEE})`)
    }
    else if (over) {
      said.push(`In set ${j}, which now holds ${fmtTenths(load)} bags, more than ${peopleText(m.people)} can lay on and trowel (${fmtTenths(cap)}) (${SEE})`)
    }
    else if (moved.has(sf.id)) {
      if (rules === 0) said[0] = `${said[0]} (${fmtTenths(load)} of ${fmtTenths(cap)} bags in the set)`
    }
    else if (rules === 0) {
      const room = load < cap ? ' with room to spare' : ', which it fills'
      said.push(j === 1
        ? `Fits in set 1${room} (${fmtTenths(load)} of ${fmtTenths(cap)} bags)`
        : `In set ${j} to keep the sets even (${fmtTenths(load)} of ${fmtTenths(cap)} bags)`)
    }
    return said.join('; ')
  }

  const sets = [...plan.sets].sort((x, y) => x.number - y.number).map((set) => {
    const j = set.number
    const tasks = set.tasks.map((t, pos) => {
      const s = m.index.get(t.surfaceId)
      let reason: string
      if (s === undefined || !(t.action in ACTION_ORDER)) reason = `In set ${j}; this task is not one the planner knows (${SEE})`
      else if (t.action === 'skim') reason = skimReason(s, j)
      else reason = before(s, t.action, j)
      return { task: { ...t, reason }, s: s ?? surfaces.length, pos }
    })
    const ceilingRank = (s: number): number => (m.ceilingsFirst && s < surfaces.length && surfaces[s]!.ceiling ? 0 : 1)
    tasks.sort((x, y) => ceilingRank(x.s) - ceilingRank(y.s) || (ACTION_ORDER[x.task.action] ?? 9) - (ACTION_ORDER[y.task.action] ?? 9) || x.s - y.s || x.pos - y.pos)
    return { ...set, tasks: tasks.map(x => x.task) }
  })
  return { ...plan, sets }
}

// ---------------------------------------------------------------------------------------------
// The planner

/**
 * Plans the sets for a room or a job. `labels` (optional) gives each surface id a name for the
 * reasons and warnings, e.g. "Front bedroom · Wall 2"; without it the ids are used.
 * Throws a RangeError naming the field for a bad number; warns, never throws, for a muddled room.
 */
export function planSets(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, labels?: Record<string, string>): SetPlan {
  const m = buildModel(surfaces, corners, options, labels)
  const g = buildGraph(m)
  const pk = pack(g, m)
  const byset: number[][] = pk.load.map(() => [])
  pk.setOf.forEach((j, t) => byset[j]!.push(t))
  const sets: PlannedSet[] = byset.map((tasks, j) => {
    tasks.sort((x, y) => g.surface[x]! - g.surface[y]! || x - y)
    return {
      number: j + 1,
      tasks: tasks.map(t => ({ surfaceId: m.surfaces[g.surface[t]!]!.id, action: g.action[t]!, bags: bagsOf(g.tenths[t]!), reason: '' })),
      bags: bagsOf(pk.load[j]!),
    }
  })
  const warnings = [...m.warnings]
  m.surfaces.forEach((s) => {
    if (s.skimTenths > m.capTenths) warnings.push(oversizedWarning(m, s))
  })
  return explain(m, { sets, warnings }, new Set())
}

/**
 * Every task's reason worked out again for `plan` as it stands (after surfaces were moved by
 * hand, say), from the same surfaces, corners and options the planner had: a reason names only
 * the set of its own task and of the tasks it names, and says when a rule is broken there (the
 * broken rules themselves are `checkPlan`'s warnings). `movedByHand` are the surface ids whose skim
 * was moved by hand: their skim's reason says so. The tasks of each set come back in the planner's
 * order (a room's ceiling first when the rule is on); numbers, bags and warnings are as given.
 * Throws like `planSets` for a bad number.
 */
export function reasonsForPlan(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, plan: SetPlan, labels?: Record<string, string>, movedByHand: Iterable<string> = []): SetPlan {
  const m = buildModel(surfaces, corners, options, labels)
  return explain(m, plan, new Set(movedByHand))
}

// ---------------------------------------------------------------------------------------------
// Checking a plan (after a surface was moved by hand, say)

function taskTenths(bags: unknown): number | null {
  if (typeof bags !== 'number' || !Number.isFinite(bags) || bags < 0) return null
  const tenths = Math.round(bags * 10)
  return Math.abs(bags * 10 - tenths) < 1e-6 ? tenths : null
}

const ACTION_WORDS: Record<PlanAction, string> = { 'fill': 'patch fill', 'undercoat': 'undercoat', 'tight-coat': 'tight coat', 'skim': 'skim' }

/**
 * Re-checks a plan against the rules and returns each broken one in plain words (an empty list
 * when it is sound). A skim that alone is more than one set gives the same words as `planSets`'s
 * warning. Problems with the room itself (unknown corners and so on) are `planSets`'s warnings,
 * not repeated here; a bad number in the options or areas still throws, as in `planSets`.
 */
export function checkPlan(surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, plan: SetPlan, labels?: Record<string, string>): string[] {
  const m = buildModel(surfaces, corners, options, labels)
  const out: string[] = []
  const sets: PlannedSet[] = Array.isArray(plan?.sets) ? plan.sets : []
  const nameOf = (id: string): string => {
    const i = m.index.get(id)
    if (i !== undefined) return m.surfaces[i]!.name
    const l = labels?.[id]
    return typeof l === 'string' && l.trim() ? l : String(id)
  }

  const numbers = sets.map(s => s?.number)
  if (numbers.some((n, i) => n !== i + 1)) {
    out.push(`The sets are numbered ${numbers.map(String).join(', ')}; they should run 1 to ${sets.length} in order.`)
  }
  const skims = m.surfaces.map((): number[] => [])
  const skimBags = m.surfaces.map((): number[] => [])
  const fills = m.surfaces.map((): { set: number, tenths: number }[] => [])
  const coats = m.surfaces.map((): number[] => [])
  const undercoats = m.surfaces.map((): { set: number, tenths: number }[] => [])

  sets.forEach((set, i) => {
    const no = i + 1
    const tasks: PlanTask[] = Array.isArray(set?.tasks) ? set.tasks : []
    if (tasks.length === 0) out.push(`Set ${no} is empty.`)
    let sum = 0
    for (const task of tasks) {
      const word = ACTION_WORDS[task?.action] as string | undefined
      const who = nameOf(task?.surfaceId)
      const tenths = taskTenths(task?.bags)
      if (tenths === null) out.push(`In set ${no}, the ${word ?? 'task'} for ${who} is ${String(task?.bags)} bags; bags are counted in tenths, 0 or more.`)
      else sum += tenths
      if (!word) {
        out.push(`Set ${no} has a task "${String(task?.action)}" for ${who} that the planner does not know.`)
        continue
      }
      if (typeof task.reason !== 'string' || !task.reason.trim()) out.push(`In set ${no}, the ${word} for ${who} gives no reason.`)
      const s = m.index.get(task.surfaceId)
      if (s === undefined) {
        out.push(`Set ${no} has a ${word} for ${who}, which is not one of the surfaces.`)
        continue
      }
      if (task.action === 'skim') {
        skims[s]!.push(no)
        skimBags[s]!.push(tenths ?? -1)
      }
      else if (task.action === 'fill') {
        fills[s]!.push({ set: no, tenths: tenths ?? 0 })
      }
      else if (task.action === 'undercoat') {
        undercoats[s]!.push({ set: no, tenths: tenths ?? 0 })
      }
      else {
        coats[s]!.push(no)
      }
    }
    const stated = taskTenths(set?.bags)
    if (stated !== sum) out.push(`Set ${no} says ${String(set?.bags)} bags but its tasks add up to ${fmtTenths(sum)}.`)
    if (sum > m.capTenths) {
      const only = tasks.length === 1 ? tasks[0]! : null
      const s = only && only.action === 'skim' ? m.index.get(only.surfaceId) : undefined
      if (s !== undefined && m.surfaces[s]!.skimTenths > m.capTenths) out.push(oversizedWarning(m, m.surfaces[s]!))
      else out.push(`Set ${no} holds ${fmtTenths(sum)} bags, more than ${peopleText(m.people)} can lay on and trowel (${fmtTenths(m.capTenths)}).`)
    }
  })

  /** The one set a surface is skimmed in, or null when that is not so (said already). */
  const skimmedIn = m.surfaces.map((s, i): number | null => {
    const found = skims[i]!
    if (found.length === 0) {
      out.push(`${s.name} is not skimmed in any set.`)
      return null
    }
    if (found.length > 1) {
      out.push(`${s.name} is skimmed ${found.length} times (${setList(found)}); it should be skimmed once.`)
      return null
    }
    const got = skimBags[i]![0]!
    if (got >= 0 && got !== s.skimTenths) {
      out.push(`${s.name}'s skim is ${fmtTenths(got)} bags, but ${fmtNumber(s.areaM2)} m² at ${fmtNumber(m.coverage)} m² a bag comes to ${fmtTenths(s.skimTenths)}.`)
    }
    return found[0]!
  })

  m.surfaces.forEach((s, i) => {
    const at = skimmedIn[i] ?? null
    if (s.hasPatches) {
      if (fills[i]!.length === 0) {
        out.push(`${s.name} has patches but no patch fill in a set before its skim.`)
      }
      else {
        if (at !== null) {
          for (const f of fills[i]!) if (f.set >= at) out.push(`The patch fill for ${s.name} in set ${f.set} is not before its skim in set ${at}.`)
        }
        const total = fills[i]!.reduce((n, f) => n + f.tenths, 0)
        if (total !== s.fillTenths) out.push(`The patch fill for ${s.name} comes to ${fmtTenths(total)} bags; its patches need ${fmtTenths(s.fillTenths)}.`)
      }
    }
    else {
      for (const f of fills[i]!) out.push(`Set ${f.set} has a patch fill for ${s.name}, which has no patches recorded.`)
    }
    if (s.undercoatTenths > 0) {
      if (undercoats[i]!.length === 0) {
        out.push(`${s.name} is undercoated all over but has no undercoat in a set before its skim.`)
      }
      else {
        if (at !== null) {
          for (const u of undercoats[i]!) if (u.set >= at) out.push(`The undercoat for ${s.name} in set ${u.set} is not before its skim in set ${at}.`)
        }
        const total = undercoats[i]!.reduce((n, u) => n + u.tenths, 0)
        if (total !== s.undercoatTenths) out.push(`The undercoat for ${s.name} comes to ${fmtTenths(total)} bags; the take-off gives ${fmtTenths(s.undercoatTenths)}.`)
      }
    }
    else {
      for (const u of undercoats[i]!) out.push(`Set ${u.set} has an undercoat for ${s.name}, which has no undercoat over the whole surface recorded.`)
    }
    if (s.gap) {
      if (at !== null) {
        for (const c of coats[i]!) if (c >= at) out.push(`A tight coat for ${s.name} in set ${c} is not before its skim in set ${at}.`)
        const earlier = new Set(coats[i]!.filter(c => c < at)).size
        if (earlier < TIGHT_COATS) {
          out.push(`${s.name} has a scrimmed gap but thin tight coats in ${earlier === 0 ? 'no set' : `only ${earlier} set`} before its skim in set ${at}; it needs them in at least ${TIGHT_COATS} earlier sets.`)
        }
      }
    }
    else {
      for (const c of new Set(coats[i]!)) out.push(`Set ${c} has a tight coat for ${s.name}, which has no scrimmed gap recorded.`)
    }
  })

  for (const [a, b] of m.dry) {
    const sa = skimmedIn[a] ?? null
    if (sa !== null && sa === skimmedIn[b]) {
      out.push(`${m.surfaces[a]!.name} and ${m.surfaces[b]!.name} share a difficult corner but are skimmed in the same set (${sa}).`)
    }
  }
  for (const [f, r] of m.packed) {
    const sf = skimmedIn[f] ?? null
    const sr = skimmedIn[r] ?? null
    if (sf !== null && sr !== null && sf >= sr) {
      out.push(`${m.surfaces[f]!.name} is the face of a packed-out bead and should be skimmed before its return, ${m.surfaces[r]!.name}, but the face is in set ${sf} and the return in set ${sr}.`)
    }
  }
  // ceilings first (the firm's rule, when on): a ceiling after a wall of its room, one line per ceiling
  const afterWalls = new Map<number, number[]>()
  for (const [c, w] of m.ceilingBefore) {
    const sc = skimmedIn[c] ?? null
    const sw = skimmedIn[w] ?? null
    if (sc !== null && sw !== null && sw < sc) afterWalls.set(c, [...(afterWalls.get(c) ?? []), w])
  }
  for (const [c, walls] of afterWalls) {
    const ceiling = m.surfaces[c]!
    out.push(`${ceiling.name} is skimmed in set ${skimmedIn[c]}, after ${nameList(walls.map(w => `${m.surfaces[w]!.name} (set ${skimmedIn[w]})`))}: the firm does ceilings before the walls${ceiling.room ? ` of ${ceiling.room}` : ''}, so plaster dropped from the ceiling does not mark a finished wall.`)
  }
  return out
}

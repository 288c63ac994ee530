// The lines of a quote or an invoice as the customer reads them (the PDFs and the public pages):
// kept together by room and kind of work, identical lines merged into one ("Skim walls: Front room"
// four times, one per wall, reads "Skim walls, front room: 4 walls, 31.20 m²"), and quantities at
// a sensible precision (areas and lengths to 2 decimals, whole packs with the right plural).
//
// What is stored is never changed: a merged line's net is the SUM of its lines' nets, each rounded
// as the totals round it (shared/utils/tax.ts lineNetPence), so grouping never moves a total by a
// penny. The quantity shown is rounded for reading; the net is worked from the exact quantities.
// Pure.
import { formatPence } from './money'
import { lineNetPence } from './tax'

export interface GroupableLine {
  kind: 'labour' | 'materials'
  description: string
  quantityX1000: number
  unit: string
  unitPence: number
  vatRatePercent: number
}

export interface LineGroup {
  kind: 'labour' | 'materials'
  /** "Skim walls, front room" */
  description: string
  /** "4 walls, 31.20 m²", "3 packs", "2.40 m" */
  quantity: string
  /** The unit price, "£18.00 per m²" as "£18.00" (every merged line has the same). */
  unitPrice: string
  unitPence: number
  vatRatePercent: number
  /** The sum of the merged lines' nets, each rounded as the totals round it. */
  netPence: number
  /** How many stored lines this one stands for. */
  count: number
}

/** Units measured by area and by length: shown to 2 decimals. */
const AREA_UNITS = new Set(['m²', 'm2', 'sq m', 'sqm'])
const LENGTH_UNITS = new Set(['m', 'lm', 'metre', 'metres', 'lin m'])

/**
 * Counted units, singular and plural (our table of the units the app and plasterers use). A unit
 * not listed is shown as typed.
 */
const COUNTED: readonly (readonly [string, string])[] = [
  ['pack', 'packs'], ['bag', 'bags'], ['length', 'lengths'], ['item', 'items'], ['day', 'days'],
  ['hour', 'hours'], ['tub', 'tubs'], ['roll', 'rolls'], ['box', 'boxes'], ['sheet', 'sheets'],
  ['visit', 'visits'], ['board', 'boards'], ['tin', 'tins'], ['tube', 'tubes'], ['opening', 'openings'],
  ['socket', 'sockets'], ['switch', 'switches'], ['patch', 'patches'], ['room', 'rooms'], ['wall', 'walls'], ['ceiling', 'ceilings'],
]

/** Thousandths to `dp` decimals, rounded half up: 6977, 2 -> '6.98'. */
function fixed(x1000: number, dp: 2): string {
  const sign = x1000 < 0 ? '-' : ''
  const hundredths = Math.floor((Math.abs(x1000) + 5) / 10)
  return `${sign}${Math.floor(hundredths / 100)}.${String(hundredths % 100).padStart(dp, '0')}`
}

/** Thousandths as a count, no trailing zeros: 1500 -> '1.5', 3000 -> '3'. */
function count(x1000: number): string {
  const a = Math.abs(x1000)
  const frac = String(a % 1000).padStart(3, '0').replace(/0+$/, '')
  return `${x1000 < 0 ? '-' : ''}${Math.floor(a / 1000)}${frac ? `.${frac}` : ''}`
}

/** A counted unit in the number it goes with: ('packs', 1000) -> 'pack'; ('pack', 3000) -> 'packs'. Unknown units as given. */
export function unitFor(unit: string, x1000: number): string {
  const u = unit.trim()
  const pair = COUNTED.find(([one, many]) => one === u.toLowerCase() || many === u.toLowerCase())
  if (!pair) return u
  return x1000 === 1000 ? pair[0] : pair[1]
}

/**
 * A quantity as the customer reads it: areas "6.98 m²" and lengths "2.40 m" to 2 decimals; counted
 * units with the right plural ("1 pack", "3 packs", "1.5 days"); any other unit as typed.
 */
export function formatLineQuantity(x1000: number, unit: string): string {
  const u = unit.trim()
  if (AREA_UNITS.has(u.toLowerCase())) return `${fixed(x1000, 2)} m²`
  if (LENGTH_UNITS.has(u.toLowerCase())) return `${fixed(x1000, 2)} m`
  return `${count(x1000)} ${unitFor(u, x1000)}`.trim()
}

/**
 * The kinds of work a drafted line names before its room ("Skim walls: Front room"), and what one
 * of the merged lines is (one per wall, one per ceiling). The first names are the draft's
 * (shared/utils/quote-draft.ts); the old wording of the undercoat line is still read on quotes
 * drafted before it changed.
 */
const WORKS: Record<string, { one: string, many: string } | null> = {
  'Skim walls': { one: 'wall', many: 'walls' },
  'Skim ceilings': { one: 'ceiling', many: 'ceilings' },
  'Skim wide reveals and strips': null,
  'Undercoat where the old plaster is off': null,
  'Undercoat, back to the background': null, // words-test: old words, mended
  'Fill patches in undercoat': null,
  'Reveals and narrow strips': null,
  'Fit beads': null,
  'Scrim and fill gaps round frames': null,
  'Pack out beads': null,
  'Make good narrow returns': null,
}

/** A drafted line's work and room ("Skim walls: Front room" -> ['Skim walls', 'Front room']), or null. */
export function workAndRoom(description: string): { work: string, room: string } | null {
  const at = description.indexOf(': ')
  if (at < 0) return null
  const work = description.slice(0, at)
  const room = description.slice(at + 2).trim()
  if (!(work in WORKS) || !room) return null
  return { work: work === 'Undercoat, back to the background' ? 'Undercoat where the old plaster is off' : work, room } // words-test: old words, mended
}

/** "Front room" -> "front room" inside a sentence; a name that starts with two capitals ("WC") stays. */
function inSentence(room: string): string {
  return /^[A-Z][a-z]/.test(room) ? room[0]!.toLowerCase() + room.slice(1) : room
}

/** What the customer reads for a line: "Skim walls, front room"; other descriptions as written. */
export function customerDescription(description: string): string {
  const wr = workAndRoom(description)
  return wr ? `${wr.work}, ${inSentence(wr.room)}` : description
}

/**
 * The lines grouped and merged: labour first, then materials (as the documents print them); within
 * labour, the lines of one room together, rooms in the order they first appear; lines alike in
 * kind, description, unit, unit price and VAT rate merged into one, their quantities and nets
 * added. The sum of the groups' nets is always the sum of the lines' nets.
 */
export function groupLines(lines: readonly GroupableLine[]): LineGroup[] {
  // where each room (or a line of no room, on its own) first appears
  const firstSeen = new Map<string, number>()
  const placed = lines.map((l, i) => {
    const room = l.kind === 'labour' ? workAndRoom(l.description)?.room.toLowerCase() : undefined
    const key = room !== undefined ? `room:${room}` : `line:${i}`
    if (!firstSeen.has(key)) firstSeen.set(key, i)
    return { l, i, rank: firstSeen.get(key)! }
  })
  placed.sort((a, b) => (a.l.kind === b.l.kind ? 0 : a.l.kind === 'labour' ? -1 : 1) || a.rank - b.rank || a.i - b.i)

  const groups: (LineGroup & { x1000: number, unit: string, work: string | null })[] = []
  const byKey = new Map<string, number>()
  for (const { l } of placed) {
    const key = JSON.stringify([l.kind, l.description.trim(), l.unit.trim().toLowerCase(), l.unitPence, l.vatRatePercent])
    const net = lineNetPence({ quantity: l.quantityX1000 / 1000, unitPence: l.unitPence })
    const at = byKey.get(key)
    if (at !== undefined) {
      const g = groups[at]!
      g.x1000 += l.quantityX1000
      g.netPence += net
      g.count += 1
      continue
    }
    byKey.set(key, groups.length)
    groups.push({
      kind: l.kind, description: customerDescription(l.description.trim()), quantity: '', unitPrice: formatPence(l.unitPence),
      unitPence: l.unitPence, vatRatePercent: l.vatRatePercent, netPence: net, count: 1,
      x1000: l.quantityX1000, unit: l.unit, work: workAndRoom(l.description)?.work ?? null,
    })
  }
  return groups.map(({ x1000, unit, work, ...g }) => {
    const amount = formatLineQuantity(x1000, unit)
    const noun = work ? WORKS[work] : null
    return { ...g, quantity: g.count > 1 && noun ? `${g.count} ${noun.many}, ${amount}` : amount }
  })
}

/** The nets of the groups added up (the same as the lines' nets added up). */
export const groupsNetPence = (groups: readonly LineGroup[]) => groups.reduce((s, g) => s + g.netPence, 0)

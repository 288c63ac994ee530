// The lines as the customer reads them (shared/utils/line-groups.ts): grouped by room and kind of
// work, identical lines merged, quantities at a sensible precision, and never a penny moved.
// Sources: the quantities and plurals are the ones a customer was shown ("6.977 m²", "1 packs",
// four "Skim walls: Front room" lines, issue 17); the arithmetic is shared/utils/tax.ts's. Rooms,
// prices and quantities are invented.
import { describe, expect, it } from 'vitest'
import { customerDescription, formatLineQuantity, groupLines, groupsNetPence, unitFor, type GroupableLine } from '../../shared/utils/line-groups'
import { invoiceTotals, lineNetPence } from '../../shared/utils/tax'

const labour = (description: string, quantityX1000: number, unit = 'm²', unitPence = 18_00, vatRatePercent = 20): GroupableLine =>
  ({ kind: 'labour', description, quantityX1000, unit, unitPence, vatRatePercent })
const materials = (description: string, quantityX1000: number, unit = 'packs', unitPence = 12_50): GroupableLine =>
  ({ kind: 'materials', description, quantityX1000, unit, unitPence, vatRatePercent: 20 })

describe('formatLineQuantity: areas and lengths to 2 decimals, counted units with the right plural', () => {
  it.each<[string, number, string, string]>([
    ['an area of 3 decimals', 6977, 'm²', '6.98 m²'],
    ['an area rounded half up', 6975, 'm²', '6.98 m²'],
    ['an area just under', 6974, 'm²', '6.97 m²'],
    ['a whole area', 12_000, 'm²', '12.00 m²'],
    ['an area typed as m2', 8400, 'm2', '8.40 m²'],
    ['a length in m', 2400, 'm', '2.40 m'],
    ['a length in lm', 1205, 'lm', '1.21 m'],
    ['one pack (stored as packs)', 1000, 'packs', '1 pack'],
    ['three packs', 3000, 'packs', '3 packs'],
    ['three packs (stored as pack)', 3000, 'pack', '3 packs'],
    ['one bag', 1000, 'bags', '1 bag'],
    ['one length of bead', 1000, 'lengths', '1 length'],
    ['half a day', 500, 'days', '0.5 days'],
    ['one day', 1000, 'days', '1 day'],
    ['one item', 1000, 'item', '1 item'],
    ['two boxes', 2000, 'box', '2 boxes'],
    ['a unit not in the table, as typed', 2000, 'each', '2 each'],
    ['a unit of mixed case', 1000, 'Packs', '1 pack'],
  ])('%s: %i %s -> %s', (_what, x1000, unit, shown) => {
    expect(formatLineQuantity(x1000, unit)).toBe(shown)
  })

  it('leaves a unit it does not count as given', () => {
    expect(unitFor('sockets', 1000)).toBe('socket')
    expect(unitFor('job lot', 1000)).toBe('job lot')
  })
})

describe('customerDescription: a drafted line reads as a phrase', () => {
  it.each<[string, string]>([
    ['Skim walls: Front room', 'Skim walls, front room'],
    ['Skim ceilings: Back bedroom', 'Skim ceilings, back bedroom'],
    ['Fit beads: WC', 'Fit beads, WC'],
    ['Undercoat, back to the background: Hall', 'Undercoat where the old plaster is off, hall'],
    ['Undercoat where the old plaster is off: Hall', 'Undercoat where the old plaster is off, hall'],
    // not a drafted line: as written
    ['Labour: 2 days at £200.00 a day', 'Labour: 2 days at £200.00 a day'],
    ['Multi-finish plaster (25 kg bag)', 'Multi-finish plaster (25 kg bag)'],
  ])('%s -> %s', (stored, shown) => {
    expect(customerDescription(stored)).toBe(shown)
  })
})

describe('groupLines: merged, grouped, and never a penny moved', () => {
  it('merges four identical wall lines into one, quantities and nets summed', () => {
    const walls = [labour('Skim walls: Front room', 8400), labour('Skim walls: Front room', 7200), labour('Skim walls: Front room', 8400), labour('Skim walls: Front room', 7200)]
    const groups = groupLines(walls)
    expect(groups).toEqual([{
      kind: 'labour', description: 'Skim walls, front room', quantity: '4 walls, 31.20 m²', unitPrice: '£18.00', unitPence: 18_00,
      vatRatePercent: 20, netPence: 151_20 + 129_60 + 151_20 + 129_60, count: 4,
    }])
  })

  it('keeps a room\'s lines together, rooms in the order they first appear, materials last', () => {
    const lines = [
      materials('Multi-finish (25 kg bag)', 3000, 'packs'),
      labour('Skim walls: Front room', 8400),
      labour('Skim walls: Back bedroom', 9000),
      labour('Skim ceilings: Front room', 12_000, 'm²', 21_00),
      labour('Fit beads: Back bedroom', 2400, 'm', 6_00),
      labour('Skim walls: Front room', 7200),
      labour('Making good round a socket', 1000, 'item', 15_00),
      materials('Angle bead (3 m)', 1000, 'packs', 4_00),
    ]
    expect(groupLines(lines).map(g => [g.description, g.quantity])).toEqual([
      ['Skim walls, front room', '2 walls, 15.60 m²'],
      ['Skim ceilings, front room', '12.00 m²'],
      ['Skim walls, back bedroom', '9.00 m²'],
      ['Fit beads, back bedroom', '2.40 m'],
      ['Making good round a socket', '1 item'],
      ['Multi-finish (25 kg bag)', '3 packs'],
      ['Angle bead (3 m)', '1 pack'],
    ])
  })

  it('does not merge lines that differ in price, unit or VAT rate', () => {
    const lines = [labour('Skim walls: Hall', 5000), labour('Skim walls: Hall', 5000, 'm²', 19_00), labour('Skim walls: Hall', 5000, 'm²', 18_00, 5)]
    expect(groupLines(lines)).toHaveLength(3)
  })

  it('sums the pence of merged lines: three lines of 1.005 m² at 99p are 297p, each rounded as the totals round it, not the 298p of 3.015 m² at once', () => {
    const lines = [labour('Skim walls: Hall', 1005, 'm²', 99), labour('Skim walls: Hall', 1005, 'm²', 99), labour('Skim walls: Hall', 1005, 'm²', 99)]
    // each: 1.005 x 99 = 99.495 -> 99p; three: 297p; 3.015 x 99 = 298.485 -> 298p would be a penny over
    const [g] = groupLines(lines)
    expect(g!.netPence).toBe(3 * lineNetPence({ quantity: 1.005, unitPence: 99 }))
    expect(g!.netPence).not.toBe(lineNetPence({ quantity: 3.015, unitPence: 99 }))
  })

  it('keeps the net of every quote the same (property over awkward lines)', () => {
    let seed = 17
    const rand = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648
      return seed / 2147483648
    }
    const rooms = ['Front room', 'Hall', 'Back bedroom']
    const works = ['Skim walls', 'Skim ceilings', 'Fit beads']
    for (let run = 0; run < 200; run++) {
      const lines: GroupableLine[] = Array.from({ length: 1 + Math.floor(rand() * 12) }, () => rand() < 0.75
        ? labour(`${works[Math.floor(rand() * 3)]}: ${rooms[Math.floor(rand() * 3)]}`, 1 + Math.floor(rand() * 20_000), 'm²', [1, 33, 99, 18_00][Math.floor(rand() * 4)]!, [0, 5, 20][Math.floor(rand() * 3)]!)
        : materials(['Board finish', 'Bonding'][Math.floor(rand() * 2)]!, 1000 * (1 + Math.floor(rand() * 3)), 'packs', [3_33, 19_99][Math.floor(rand() * 2)]!))
      const totals = invoiceTotals(lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })), { vat: 'standard', cisRatePercent: null })
      const groups = groupLines(lines)
      expect(groupsNetPence(groups)).toBe(totals.netPence)
      // the VAT worked from the groups' nets, rate by rate, is the VAT of the lines
      const vatHundredths = groups.reduce((s, g) => s + g.netPence * g.vatRatePercent, 0)
      expect(Math.floor(vatHundredths / 100)).toBe(totals.vatPence)
      expect(groups.reduce((s, g) => s + g.count, 0)).toBe(lines.length)
    }
  })
})

import { describe, expect, it } from 'vitest'
import { formatDays, pricedLines, type PricedLine } from '../../shared/utils/quote-pricing'
import { invoiceTotals } from '../../shared/utils/tax'

// The three ways of pricing a quote are our product's own rule (issue 4), not a trade figure:
// the cases check the arithmetic of that rule. Rates below are inputs, not claims about prices.

const labour = (description: string, quantityX1000: number, unitPence: number, vatRatePercent = 20): PricedLine =>
  ({ kind: 'labour', description, quantityX1000, unit: 'm²', unitPence, vatRatePercent, derivation: '' })
const materials = (description: string, packs: number, unitPence: number): PricedLine =>
  ({ kind: 'materials', description, quantityX1000: packs * 1000, unit: 'packs', unitPence, vatRatePercent: 20, derivation: '' })

// skim walls 24.5 m² at £9.50 = £232.75; skim ceiling 12.2 m² at £11.00 = £134.20; 4 packs at £12.40 = £49.60
const working = [labour('Skim walls', 24_500, 950), labour('Skim ceiling', 12_200, 1100), materials('Finish plaster', 4, 1240)]
const net = (lines: PricedLine[]) => invoiceTotals(lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })), { vat: 'not-registered', cisRatePercent: null })

describe('pricedLines', () => {
  it.each([
    // by measure: the working lines as they are; labour 232.75 + 134.20 = 366.95, materials 49.60
    { name: 'by measure', choice: { pricing: 'measure', estimatedDaysX100: 150, dayRatePence: 18_000, fixedPricePence: null }, lines: 3, labour: 36_695, materials: 4_960 },
    // by days: 1.5 days x £180.00 = £270.00 labour, materials kept at £49.60
    { name: 'by days', choice: { pricing: 'days', estimatedDaysX100: 150, dayRatePence: 18_000, fixedPricePence: null }, lines: 2, labour: 27_000, materials: 4_960 },
    // by days, quarter days: 2.25 x £175.50 = £394.875 -> £394.88 (half up)
    { name: 'by days, a quarter day', choice: { pricing: 'days', estimatedDaysX100: 225, dayRatePence: 17_550, fixedPricePence: null }, lines: 2, labour: 39_488, materials: 4_960 },
    // fixed £450.00 net: materials £49.60 stay apart, labour is £400.40, the net is exactly £450.00
    { name: 'fixed price', choice: { pricing: 'fixed', estimatedDaysX100: 150, dayRatePence: 0, fixedPricePence: 45_000 }, lines: 2, labour: 40_040, materials: 4_960 },
    // fixed price equal to the materials: labour 0 (allowed: a supply-only price)
    { name: 'fixed price equal to the materials', choice: { pricing: 'fixed', estimatedDaysX100: 0, dayRatePence: 0, fixedPricePence: 4_960 }, lines: 2, labour: 0, materials: 4_960 },
  ] as const)('$name', ({ choice, lines, labour: labourPence, materials: materialsPence }) => {
    const result = pricedLines(working, choice)
    expect(result.ok).toBe(true)
    if (!result.ok) return
    expect(result.lines).toHaveLength(lines)
    const totals = net(result.lines)
    expect(totals.labourNetPence).toBe(labourPence)
    expect(totals.materialsNetPence).toBe(materialsPence)
    expect(result.labourByMeasurePence).toBe(36_695)
    expect(result.materialsPence).toBe(4_960)
  })

  it('says how the labour line was worked out, and what it would be by measure', () => {
    const result = pricedLines(working, { pricing: 'days', estimatedDaysX100: 150, dayRatePence: 18_000, fixedPricePence: null })
    expect(result.ok && result.lines[0]).toMatchObject({ kind: 'labour', description: 'Labour: 1.5 days at £180.00 a day', unit: 'days', quantityX1000: 1500 })
    expect(result.ok && result.lines[0]!.derivation).toBe('1.5 days x £180.00 day rate; priced by measure the labour would be £366.95')
    const fixed = pricedLines(working, { pricing: 'fixed', estimatedDaysX100: 0, dayRatePence: 0, fixedPricePence: 45_000 })
    expect(fixed.ok && fixed.lines[0]!.derivation).toBe('Fixed price £450.00 less materials £49.60 = £400.40; priced by measure the labour would be £366.95')
  })

  it('keeps the labour VAT rate when the labour lines agree, else the standard rate', () => {
    const fivePercent = [labour('Skim walls', 10_000, 1000, 5), materials('Finish plaster', 1, 1000)]
    const a = pricedLines(fivePercent, { pricing: 'days', estimatedDaysX100: 100, dayRatePence: 15_000, fixedPricePence: null })
    expect(a.ok && a.lines[0]!.vatRatePercent).toBe(5)
    const mixed = [labour('A', 1000, 100, 5), labour('B', 1000, 100, 0)]
    const b = pricedLines(mixed, { pricing: 'fixed', estimatedDaysX100: 0, dayRatePence: 0, fixedPricePence: 500 })
    expect(b.ok && b.lines[0]!.vatRatePercent).toBe(20)
  })

  it.each([
    { name: 'a fixed price below the materials', choice: { pricing: 'fixed', estimatedDaysX100: 0, dayRatePence: 0, fixedPricePence: 4_959 }, field: 'fixedPricePence', message: 'The fixed price is less than the materials on the quote (£49.60).' },
    { name: 'no fixed price', choice: { pricing: 'fixed', estimatedDaysX100: 0, dayRatePence: 0, fixedPricePence: null }, field: 'fixedPricePence', message: 'Enter the fixed price.' },
    { name: 'days with no day rate', choice: { pricing: 'days', estimatedDaysX100: 100, dayRatePence: 0, fixedPricePence: null }, field: 'dayRatePence', message: 'Set the firm\'s day rate (Settings, Firm) before pricing by days.' },
    { name: 'days with no days', choice: { pricing: 'days', estimatedDaysX100: 0, dayRatePence: 18_000, fixedPricePence: null }, field: 'estimatedDaysX100', message: 'Enter the days it will take.' },
  ] as const)('refuses $name on its field', ({ choice, field, message }) => {
    expect(pricedLines(working, choice)).toEqual({ ok: false, field, message })
  })

  it.each([[100, '1 day'], [50, '0.5 days'], [225, '2.25 days'], [300, '3 days']])('formatDays(%i) is %s', (x100, words) => {
    expect(formatDays(x100)).toBe(words)
  })
})

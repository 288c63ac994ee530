import { describe, expect, it } from 'vitest'
import { customerSchema } from '../../shared/schemas/customer'

// Which flag combinations are allowed. Sources:
// - CIS rates 0 / 20 / 30%: gov.uk "What you must do as a CIS contractor" (gross, registered, not registered).
// - A homeowner is never in the domestic reverse charge and never a CIS contractor paying us:
//   gov.uk "How to use the VAT domestic reverse charge for building and construction services".
// - End-user or intermediary notices come from businesses (same gov.uk guidance).
const base = { name: 'Example customer' }
const fieldsOf = (input: object) => {
  const r = customerSchema.safeParse({ ...base, ...input })
  return r.success ? [] : [...new Set(r.error.issues.map(i => i.path.join('.')))].sort()
}

describe('customerSchema flags', () => {
  it.each([
    ['a plain homeowner', { kind: 'homeowner' }, []],
    ['a homeowner paying under CIS', { kind: 'homeowner', paysUnderCis: true, cisRatePercent: 20 }, ['paysUnderCis']],
    ['a homeowner marked VAT-registered', { kind: 'homeowner', vatRegistered: true, vatNumber: 'GB999999973' }, ['vatRegistered']],
    ['a homeowner with an end-user notice', { kind: 'homeowner', endUserNotified: true }, ['endUserNotified']],
    ['a builder paying under CIS at 20%', { kind: 'builder', paysUnderCis: true, cisRatePercent: 20 }, []],
    ['a builder paying under CIS at 0% (gross)', { kind: 'builder', paysUnderCis: true, cisRatePercent: 0 }, []],
    ['a builder paying under CIS at 30%', { kind: 'builder', paysUnderCis: true, cisRatePercent: 30 }, []],
    ['a builder paying under CIS with no rate', { kind: 'builder', paysUnderCis: true }, ['cisRatePercent']],
    ['a builder at a rate that does not exist', { kind: 'builder', paysUnderCis: true, cisRatePercent: 25 }, ['cisRatePercent']],
    ['a rate without CIS', { kind: 'business', cisRatePercent: 20 }, ['cisRatePercent']],
    ['VAT-registered with no number', { kind: 'business', vatRegistered: true }, ['vatNumber']],
    ['VAT-registered with a number (spaces allowed)', { kind: 'business', vatRegistered: true, vatNumber: 'gb 999 9999 73' }, []],
    ['a malformed VAT number', { kind: 'business', vatRegistered: true, vatNumber: 'GB12' }, ['vatNumber']],
    ['a landlord with an end-user notice', { kind: 'landlord', endUserNotified: true }, []],
    ['no kind', {}, ['kind']],
  ])('%s', (_what, input, fields) => {
    expect(fieldsOf(input)).toEqual(fields)
  })

  it('reports every problem at once, not one at a time', () => {
    expect(fieldsOf({ kind: 'homeowner', email: 'nope', paysUnderCis: true, cisRatePercent: 20, vatRegistered: true })).toEqual(['email', 'paysUnderCis', 'vatNumber', 'vatRegistered'])
  })

  it('normalises what it keeps', () => {
    const c = customerSchema.parse({ ...base, kind: 'business', email: ' Office@Example.COM ', billingPostcode: 'kb4 7qz', vatRegistered: true, vatNumber: 'gb 999 9999 73' })
    expect(c).toMatchObject({ email: 'office@example.com', billingPostcode: 'KB4 7QZ', vatNumber: 'GB999999973' })
  })
})

import { describe, expect, it } from 'vitest'
import { reverseChargeEligible, suggestedVat, vatTreatmentProblem } from '../../shared/utils/vat-treatment'

// Source: gov.uk "How to use the VAT domestic reverse charge if you supply building and
// construction services" (DOMAIN.md "Money rules"): both VAT-registered, paid under CIS, and the
// customer has not said it is an end user or intermediary; a homeowner is never in scope.

const registered = { vatRegistered: true }
const unregistered = { vatRegistered: false }
const builder = { kind: 'builder', vatRegistered: true, paysUnderCis: true, endUserNotified: false }
const homeowner = { kind: 'homeowner', vatRegistered: false, paysUnderCis: false, endUserNotified: false }

describe('suggestedVat and reverseChargeEligible (gov.uk reverse charge guidance)', () => {
  it.each<[string, { vatRegistered: boolean }, typeof builder, 'standard' | 'reverse-charge' | 'not-registered', boolean]>([
    ['a firm below the threshold charges none', unregistered, builder, 'not-registered', false],
    ['a registered builder paying under CIS: reverse charge', registered, builder, 'reverse-charge', true],
    ['an end user who said so in writing: standard', registered, { ...builder, endUserNotified: true }, 'standard', false],
    ['a builder not under CIS: standard', registered, { ...builder, paysUnderCis: false }, 'standard', false],
    ['a builder not VAT-registered: standard', registered, { ...builder, vatRegistered: false }, 'standard', false],
    ['a homeowner: standard, never the reverse charge', registered, { ...homeowner, vatRegistered: true, paysUnderCis: true }, 'standard', false],
  ])('%s', (_what, firm, customer, vat, eligible) => {
    expect(suggestedVat(firm, customer)).toBe(vat)
    expect(reverseChargeEligible(firm, customer)).toBe(eligible)
  })
})

describe('vatTreatmentProblem (gov.uk reverse charge guidance; HMRC: no VAT without registration)', () => {
  it.each<[string, 'standard' | 'reverse-charge' | 'not-registered', { vatRegistered: boolean }, typeof builder, RegExp | null]>([
    ['standard from a firm not registered', 'standard', unregistered, homeowner, /not VAT-registered/],
    ['reverse charge from a firm not registered', 'reverse-charge', unregistered, builder, /not VAT-registered/],
    ['none from a firm not registered is right', 'not-registered', unregistered, homeowner, null],
    ['none from a registered firm', 'not-registered', registered, homeowner, /is VAT-registered/],
    ['reverse charge for a homeowner', 'reverse-charge', registered, homeowner, /homeowner is never/],
    ['reverse charge for a customer not registered', 'reverse-charge', registered, { ...builder, vatRegistered: false }, /VAT-registered customer/],
    ['reverse charge for work not under CIS', 'reverse-charge', registered, { ...builder, paysUnderCis: false }, /under CIS/],
    ['reverse charge for an end user', 'reverse-charge', registered, { ...builder, endUserNotified: true }, /end user/],
    ['reverse charge for an eligible builder is right', 'reverse-charge', registered, builder, null],
    ['standard for an eligible builder is allowed (the notice may not be recorded yet)', 'standard', registered, builder, null],
    ['standard for a homeowner is right', 'standard', registered, homeowner, null],
  ])('%s', (_what, vat, firm, customer, problem) => {
    const got = vatTreatmentProblem(vat, firm, customer)
    if (problem) expect(got).toMatch(problem)
    else expect(got).toBeNull()
  })
})

// Which VAT treatment a quote or an invoice may carry, from the firm's registration and the
// customer's flags (../shared/DOMAIN.md, "Money rules": gov.uk "How to use the VAT domestic reverse
// charge if you supply building and construction services"). A rule of thumb for the screens and
// the routes: unusual cases are for HMRC's guidance or the firm's accountant.
import type { VatTreatment } from './vat-return'

export interface VatFirm { vatRegistered: boolean }
export interface VatCustomer { kind: string, vatRegistered: boolean, paysUnderCis: boolean, endUserNotified: boolean }

/**
 * The reverse charge can apply: both VAT-registered, the payment reported under CIS, and the
 * customer has not said it is an end user or intermediary. A homeowner is never in scope.
 */
export function reverseChargeEligible(firm: VatFirm, customer: VatCustomer): boolean {
  return firm.vatRegistered && customer.kind !== 'homeowner' && customer.vatRegistered && customer.paysUnderCis && !customer.endUserNotified
}

/** The VAT treatment a quote or invoice starts with. */
export function suggestedVat(firm: VatFirm, customer: VatCustomer): VatTreatment {
  if (!firm.vatRegistered) return 'not-registered'
  if (reverseChargeEligible(firm, customer)) return 'reverse-charge'
  return 'standard'
}

/**
 * Why `vat` cannot be used for this firm and customer, in words for the form; null when it can.
 * A registered firm may still choose standard rate for an eligible customer (the end-user notice
 * may not be recorded yet); what is refused is what the rules rule out.
 */
export function vatTreatmentProblem(vat: VatTreatment, firm: VatFirm, customer: VatCustomer): string | null {
  if (!firm.vatRegistered && vat !== 'not-registered') {
    return 'Your firm is not VAT-registered (Firm settings), so no VAT is charged: choose "None".'
  }
  if (firm.vatRegistered && vat === 'not-registered') {
    return 'Your firm is VAT-registered (Firm settings): choose standard rate, or the reverse charge if it applies.'
  }
  if (vat === 'reverse-charge' && !reverseChargeEligible(firm, customer)) {
    if (customer.kind === 'homeowner') return 'A homeowner is never under the reverse charge: choose standard rate.'
    if (!customer.vatRegistered) return 'The reverse charge needs a VAT-registered customer: record their VAT number on their page, or choose standard rate.'
    if (!customer.paysUnderCis) return 'The reverse charge applies only to work the customer pays under CIS: record that on their page, or choose standard rate.'
    return 'The customer has said it is an end user or intermediary, so the reverse charge does not apply: choose standard rate.'
  }
  return null
}

import type { CustomerInput } from '#shared/schemas/customer'

export function blankCustomer(): Required<CustomerInput> {
  return {
    kind: 'homeowner', name: '', contactName: '', email: '', phone: '', billingLine1: '', billingLine2: '', billingTown: '',
    billingPostcode: '', notes: '', vatRegistered: false, vatNumber: null, paysUnderCis: false, cisRatePercent: null, endUserNotified: false,
  }
}

/** The editable part of a customer row from the API. */
export function customerInput(c: Required<CustomerInput> & Record<string, unknown>): Required<CustomerInput> {
  const b = blankCustomer()
  return Object.fromEntries(Object.keys(b).map(k => [k, c[k] ?? (b as Record<string, unknown>)[k]])) as Required<CustomerInput>
}

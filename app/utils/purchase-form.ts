// Between the purchase form (pounds as typed) and the API (pence): read what was typed, naming
// each amount that is not money beside its field.
import type { PurchaseFormValue } from '~/components/purchase/PurchaseForm.vue'

export function emptyPurchase(today: string): PurchaseFormValue {
  return { supplier: '', boughtOn: today, category: 'materials', net: '', vat: '0', reference: '', notes: '', jobs: [] }
}

export function purchaseFormFrom(p: { supplier: string, boughtOn: string, category: PurchaseFormValue['category'], netPence: number, vatPence: number, reference: string, notes: string, jobs: { jobId: string, netPence: number }[] }): PurchaseFormValue {
  return {
    supplier: p.supplier, boughtOn: p.boughtOn, category: p.category, net: penceToDecimal(p.netPence), vat: penceToDecimal(p.vatPence),
    reference: p.reference, notes: p.notes, jobs: p.jobs.map(j => ({ jobId: j.jobId, net: penceToDecimal(j.netPence) })),
  }
}

/** The body for the API, or the fields that are wrong. */
export function purchaseBody(form: PurchaseFormValue): { body: Record<string, unknown> } | { errors: Record<string, string> } {
  const errors: Record<string, string> = {}
  const netPence = parsePounds(form.net)
  const vatPence = form.vat.trim() === '' ? 0 : parsePounds(form.vat)
  if (netPence === null) errors.netPence = 'Enter the amount before VAT in pounds, like 42.50.'
  if (vatPence === null) errors.vatPence = 'Enter the VAT in pounds, like 8.50, or 0.'
  const jobs = form.jobs.map((j, i) => {
    const pence = parsePounds(j.net)
    if (!j.jobId) errors[`jobs.${i}.jobId`] = 'Choose the job.'
    if (pence === null || pence === 0) errors[`jobs.${i}.netPence`] = 'Enter the amount for this job in pounds.'
    return { jobId: j.jobId, netPence: pence ?? 0 }
  })
  if (Object.keys(errors).length) return { errors }
  return { body: { supplier: form.supplier, boughtOn: form.boughtOn, category: form.category, netPence, vatPence, reference: form.reference, notes: form.notes, jobs } }
}

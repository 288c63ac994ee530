type Invoice = ApiResponse<'/api/invoices/:id'>

/** A draft invoice's VAT treatment, the reason it differs from the suggested one, and its CIS rate. */
export interface InvoiceTaxForm {
  vat: 'standard' | 'reverse-charge' | 'not-registered'
  vatReason: string
  cisRatePercent: 0 | 20 | 30 | null
}

/**
 * A draft invoice or credit note on its page: its tax and lines as typed, read back from each
 * answer, saved (PUT draft), issued, or deleted. Nothing is sent while a quantity or price cannot
 * be read: those are marked on their fields. The page asks before issuing or deleting.
 */
export function useInvoiceDraft(invoice: Ref<Invoice | null | undefined>) {
  const tax = reactive<InvoiceTaxForm>({ vat: 'standard', vatReason: '', cisRatePercent: null })
  const lines = useLineForm({ blank: () => ({ vatRatePercent: tax.vat === 'not-registered' ? 0 : 20 }) })
  let notes = ''
  function load() {
    const v = invoice.value
    if (!v) return
    Object.assign(tax, { vat: v.vat, vatReason: v.vatReason, cisRatePercent: v.cisRatePercent as InvoiceTaxForm['cisRatePercent'] })
    notes = v.notes
    lines.load(v.lines)
  }
  load()
  const url = (what = '') => `/api/invoices/${invoice.value!.id}${what}`

  let body: Record<string, unknown> = {}
  const save = useSubmit(async () => {
    invoice.value = await $fetch<Invoice>(url('/draft'), { method: 'PUT', body })
    load()
  })
  async function saveDraft() {
    const read = lines.read()
    if (Object.keys(read.errors).length) {
      save.fail(read.errors)
      return false
    }
    body = { ...tax, notes, lines: read.lines }
    return save.submit()
  }

  // issued, but its e-mail did not go (the answer's warning)
  const warning = ref('')
  const issue = useSubmit(async () => {
    const { warning: w, ...issued } = await $fetch<Invoice & { warning: string | null }>(url('/issue'), { method: 'POST' })
    invoice.value = issued
    warning.value = w ?? ''
    load()
  })
  async function saveAndIssue() {
    if (await saveDraft()) await issue.submit()
  }
  const remove = useSubmit(async () => {
    await $fetch(url(), { method: 'DELETE' })
    await navigateTo('/invoices')
  })

  return { tax, lines, load, save, saveDraft, issue, saveAndIssue, warning, remove }
}

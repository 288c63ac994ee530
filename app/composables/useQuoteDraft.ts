type Quote = ApiResponse<'/api/quotes/:id'>
type Vat = 'standard' | 'reverse-charge' | 'not-registered'

/** The draft version's terms as typed on the quote page (QuotePricing shows them). */
export interface QuoteTermsForm {
  pricing: 'measure' | 'days' | 'fixed'
  days: string
  fixedPrice: string
  vat: Vat
  cisRatePercent: 0 | 20 | 30 | null
  validUntil: string
  terms: string
  notes: string
  cautions: string[]
}

/**
 * A quote's draft on its page: the terms and the lines as typed, read back from each answer, saved
 * (PUT draft) and sent. Nothing is sent while a quantity, price, days or fixed price cannot be read:
 * those are marked on their fields. The page asks before sending.
 */
export function useQuoteDraft(quote: Ref<Quote | null | undefined>) {
  const lines = useLineForm({ blank: kind => ({ unit: kind === 'labour' ? 'item' : 'packs' }) })
  const form = reactive<QuoteTermsForm>({ pricing: 'measure', days: '', fixedPrice: '', vat: 'standard', cisRatePercent: null, validUntil: '', terms: '', notes: '', cautions: [] })

  function load() {
    const v = quote.value?.current
    if (!v) return
    Object.assign(form, {
      pricing: v.pricing, days: v.estimatedDaysX100 ? formatQuantity(v.estimatedDaysX100 * 10) : '',
      fixedPrice: v.fixedPricePence ? penceToDecimal(v.fixedPricePence) : '', vat: v.vat, cisRatePercent: v.cisRatePercent as QuoteTermsForm['cisRatePercent'],
      validUntil: v.validUntil, terms: v.terms, notes: v.notes, cautions: [...v.cautions],
    })
    lines.load(v.lines)
  }
  load()

  function body(): Record<string, unknown> | null {
    const read = lines.read()
    const local: Record<string, string> = { ...read.errors }
    const daysX1000 = form.days.trim() ? parseQuantity(form.days) : 0
    if (daysX1000 === null) local.estimatedDaysX100 = 'Enter days, like 2.5.'
    const fixedPricePence = form.fixedPrice.trim() ? parsePounds(form.fixedPrice) : null
    if (form.fixedPrice.trim() && fixedPricePence === null) local.fixedPricePence = 'Enter the price in pounds.'
    if (Object.keys(local).length) {
      save.fail(local)
      return null
    }
    return { pricing: form.pricing, estimatedDaysX100: Math.round((daysX1000 ?? 0) / 10), fixedPricePence, vat: form.vat, cisRatePercent: form.cisRatePercent, validUntil: form.validUntil, terms: form.terms, notes: form.notes, cautions: form.cautions, lines: read.lines }
  }

  let pending: Record<string, unknown> = {}
  const save = useSubmit(async () => {
    quote.value = await $fetch<Quote>(`/api/quotes/${quote.value!.id}/draft`, { method: 'PUT', body: pending })
    load()
  })
  async function saveDraft() {
    const b = body()
    if (!b) return false
    pending = b
    return save.submit()
  }
  const send = useSubmit(async () => {
    await $fetch(`/api/quotes/${quote.value!.id}/send`, { method: 'POST' })
    quote.value = await $fetch<Quote>(`/api/quotes/${quote.value!.id}`)
    load()
  })
  async function saveAndSend() {
    if (await saveDraft()) await send.submit()
  }

  // What the customer will see, worked out as the form changes (the server works it out again on save).
  const preview = computed(() => {
    const draft = quote.value?.current.status === 'draft'
    const dayRatePence = draft ? (quote.value?.firmDayRatePence ?? 0) : (quote.value?.current.dayRatePence ?? 0)
    const daysX1000 = parseQuantity(form.days) ?? 0
    return pricedLines(lines.working.value, { pricing: form.pricing, estimatedDaysX100: Math.round(daysX1000 / 10), dayRatePence, fixedPricePence: parsePounds(form.fixedPrice) })
  })

  return { form, lines, load, save, send, saveDraft, saveAndSend, preview }
}

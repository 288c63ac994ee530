// The firm's settings as typed on the Firm page: the form starts from what is saved and, after a
// save, shows what the server kept (the VAT number and UTR normalised, the sort code as 12-34-56).
// A save the server refuses leaves the form as typed, with the message beside each field.
export interface FirmRecord {
  tradingName?: string
  addressLine1?: string | null
  addressLine2?: string | null
  town?: string | null
  postcode?: string | null
  email?: string | null
  phone?: string | null
  vatRegistered?: boolean
  vatNumber?: string | null
  cisStatus?: string
  utr?: string | null
  dayRatePence?: number | string | null
  paymentTermsDays?: number
  invoicePrefix?: string
  creditNoteNumbering?: string
  creditNotePrefix?: string
  takesTransfer?: boolean
  bankAccountName?: string
  bankSortCode?: string
  bankAccountNumber?: string
  vatStagger?: number
  vatCashAccounting?: boolean
  quoteChaseDays?: number
}

export function firmForm(f: FirmRecord | null | undefined) {
  return {
    tradingName: f?.tradingName ?? '', addressLine1: f?.addressLine1 ?? '', addressLine2: f?.addressLine2 ?? '', town: f?.town ?? '',
    postcode: f?.postcode ?? '', email: f?.email ?? '', phone: f?.phone ?? '', vatRegistered: f?.vatRegistered ?? false,
    vatNumber: f?.vatNumber ?? '', cisStatus: f?.cisStatus ?? 'not-registered', utr: f?.utr ?? '',
    dayRate: f?.dayRatePence ? penceToDecimal(Number(f.dayRatePence)) : '', paymentTermsDays: String(f?.paymentTermsDays ?? 30),
    invoicePrefix: f?.invoicePrefix ?? '',
    creditNoteNumbering: (f?.creditNoteNumbering ?? 'own') as 'shared' | 'own',
    creditNotePrefix: f?.creditNotePrefix ?? '',
    takesTransfer: f?.takesTransfer ?? true,
    bankAccountName: f?.bankAccountName ?? '',
    // the sort code as people write it, 12-34-56 (kept as six digits)
    bankSortCode: formatSortCode(f?.bankSortCode ?? ''),
    bankAccountNumber: f?.bankAccountNumber ?? '',
    vatStagger: (f?.vatStagger ?? 1) as 1 | 2 | 3,
    vatCashAccounting: f?.vatCashAccounting ?? false,
    quoteChaseDays: String(f?.quoteChaseDays ?? 7),
  }
}
export type FirmForm = ReturnType<typeof firmForm>

/** The form, its errors and its save; `onSaved` runs once the server has kept it. */
export function useFirmForm(firm: () => FirmRecord | null | undefined, onSaved: () => unknown) {
  const shell = useShellStore()
  const form = ref(firmForm(firm()))
  const saved = ref(false)
  let body: Record<string, unknown> = {}
  const { busy, errors, submit, fail } = useSubmit(async () => {
    const kept = await $fetch<FirmRecord>('/api/firm', { method: 'PATCH', body })
    saved.value = true
    form.value = firmForm(kept)
    onSaved()
    await shell.load()
  })

  async function save() {
    saved.value = false
    const typed = form.value
    const dayRatePence = typed.dayRate.trim() === '' ? 0 : parsePounds(typed.dayRate)
    const terms = /^\d+$/.test(typed.paymentTermsDays.trim()) ? Number(typed.paymentTermsDays.trim()) : null
    const chase = /^\d+$/.test(typed.quoteChaseDays.trim()) ? Number(typed.quoteChaseDays.trim()) : null
    const local: Record<string, string> = {}
    if (dayRatePence === null) local.dayRatePence = 'Enter the day rate in pounds, like 180 or 180.50.'
    if (terms === null) local.paymentTermsDays = 'Enter a whole number of days, like 30.'
    if (chase === null) local.quoteChaseDays = 'Enter a whole number of days, like 7.'
    if (Object.keys(local).length) return fail(local)
    const { dayRate: _d, paymentTermsDays: _t, quoteChaseDays: _q, ...rest } = typed
    body = { ...rest, dayRatePence, paymentTermsDays: terms, quoteChaseDays: chase }
    await submit()
  }

  return { form, saved, busy, errors, save }
}

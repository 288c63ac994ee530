// The price book's form: read from the server, checked here (shared/utils/price-book-form.ts),
// sent whole, and read back once saved. Every error stands beside its field; nothing typed is lost.
import { priceBookBody, priceBookFormFrom, type PriceBookForm } from '#shared/utils/price-book-form'

export async function usePriceBookForm() {
  const { data: book, refresh } = await useFetch('/api/price-book')
  const form = ref<PriceBookForm | null>(book.value ? priceBookFormFrom(book.value) : null)
  const saved = ref(false)
  let body: Record<string, unknown> = {}
  const { busy, errors, submit, fail } = useSubmit(async () => {
    await $fetch('/api/price-book', { method: 'PUT', body })
    await refresh()
    if (book.value) form.value = priceBookFormFrom(book.value)
    saved.value = true
  })
  async function save() {
    saved.value = false
    if (!form.value) return
    const r = priceBookBody(form.value)
    if ('errors' in r) return fail(r.errors)
    body = r.body
    await submit()
  }
  /** The server's message for a bead length (on the list or on one of its entries). */
  const stockLengthsError = computed(() => errors.value.fields.beadStockLengthsMm
    ?? Object.entries(errors.value.fields).find(([k]) => k.startsWith('beadStockLengthsMm.'))?.[1] ?? '')
  return { form, saved, busy, errors, save, stockLengthsError }
}

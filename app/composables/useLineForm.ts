import { sentLines, typedLine, type LineKind, type SentLine, type TypedLine } from '#shared/utils/money-lines'

/**
 * The priced lines of a quote or an invoice being edited, shown by <MoneyLineEditor>: the lines as
 * typed, adding and removing them, and reading them into what the API takes (whole pence and
 * thousandths, checked by shared/schemas/line.ts). `blank` says what a new line starts as on this
 * page (a quote's materials come in packs; an invoice of a firm not registered for VAT starts at 0%).
 *
 *   const lines = useLineForm({ blank: kind => ({ unit: kind === 'labour' ? 'item' : 'packs' }) })
 *   lines.load(saved.lines)
 *   const { lines: body, errors } = lines.read()   // errors keyed `lines.0.unitPence`, as the API names them
 */
export function useLineForm(options: { blank?: (kind: LineKind) => Partial<TypedLine> } = {}) {
  const lines = ref<TypedLine[]>([])

  function load(saved: readonly SentLine[]) {
    lines.value = saved.map(typedLine)
  }
  function add(kind: LineKind) {
    lines.value.push({ kind, description: '', quantity: '1', unit: 'item', unitPrice: '', vatRatePercent: 20, derivation: '', extraWork: false, ...options.blank?.(kind) })
  }
  /** Add a line worked out elsewhere (a making-good item of the price book). */
  function addSaved(line: SentLine) {
    lines.value.push(typedLine(line))
  }
  function remove(index: number) {
    lines.value.splice(index, 1)
  }
  /** The lines as the API takes them, and the quantities and prices that cannot be read. */
  const read = () => sentLines(lines.value)
  /** As read() but with 0 for what cannot be read yet: for a preview worked out as the person types. */
  const working = computed(() => sentLines(lines.value).lines)

  return { lines, load, add, addSaved, remove, read, working }
}

export type LineForm = ReturnType<typeof useLineForm>

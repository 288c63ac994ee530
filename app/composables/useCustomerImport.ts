// Importing customers from a CSV file: the file is read in the browser (useCsvFile), every row is
// checked with customerSchema before anything is sent, and the good rows go to
// POST /api/customers/import in batches. The server checks each row again and skips rows it
// already has, so running a file twice is safe.
import {
  CUSTOMER_IMPORT_FIELD_LABELS, CUSTOMER_IMPORT_FIELDS, batchForImport, checkImportRow, describeImportProblems,
  emptyImportMapping, guessMapping, importSheetRow,
  type CustomerImportMapping, type CustomerImportPreviewRow, type CustomerImportProblem, type ImportedCustomer,
} from '#shared/utils/customer-import'

/** More rows than a small firm's customer list: past this, ask for the file in parts. */
const MAX_RECORDS = 10_000
const PREVIEW_ROWS = 5

export function useCustomerImport() {
  // --- the file ---
  const fileName = ref('')
  const headers = ref<string[]>([])
  const records = shallowRef<Record<string, string>[]>([])
  const sample = computed(() => records.value.slice(0, PREVIEW_ROWS))
  const mapping = ref<CustomerImportMapping>(emptyImportMapping())
  const guessedAny = ref(true)
  const file = useCsvFile({
    maxRows: MAX_RECORDS,
    thing: 'customer',
    onRead({ name, fields, rows }) {
      const guess = guessMapping(fields)
      // keep what was chosen for the last file where this one has the same heading (a second run of a file)
      const kept = Object.fromEntries(CUSTOMER_IMPORT_FIELDS.map(f => [f, mapping.value[f] && fields.includes(mapping.value[f]) ? mapping.value[f] : guess[f]])) as CustomerImportMapping
      resetImport()
      fileName.value = name
      headers.value = fields
      mapping.value = kept
      guessedAny.value = Object.values(guess).some(Boolean)
      records.value = rows
    },
  })

  // --- the check, before anything is sent ---
  const checks = computed(() => records.value.map(r => checkImportRow(r, mapping.value)))
  const mappingErrors = computed(() => (mapping.value.name ? {} : { name: 'Choose the column that holds the customer’s name.' }))
  const problems = computed<CustomerImportProblem[]>(() => checks.value.flatMap((c, i) =>
    c.ok ? [] : [{ index: i, row: importSheetRow(i), name: c.input.name, text: describeImportProblems(c.errors) }]))
  const counts = computed(() => {
    let ready = 0
    let repeats = 0
    const seen = new Set<string>()
    for (const c of checks.value) {
      if (!c.ok) continue
      ready++
      if (seen.has(c.key)) repeats++
      else seen.add(c.key)
    }
    return { ready, repeats }
  })
  const preview = computed<CustomerImportPreviewRow[]>(() => checks.value.slice(0, PREVIEW_ROWS).map((c, i) => ({ row: importSheetRow(i), ok: c.ok, input: c.input })))
  const canImport = computed(() => Boolean(mapping.value.name) && counts.value.ready > 0)

  // --- sending, in batches ---
  interface Batch { rows: ImportedCustomer[], recordIndexes: number[] }
  const phase = ref<'check' | 'importing' | 'done'>('check')
  let batches: Batch[] = []
  const nextBatch = ref(0)
  const sent = ref(0)
  const toSend = ref(0)
  const created = ref(0)
  const skipped = ref(0)
  const serverRejected = ref<{ recordIndex: number, errors: Record<string, string> }[]>([])
  const importError = ref('')

  function resetImport() {
    phase.value = 'check'
    batches = []
    nextBatch.value = 0
    sent.value = 0
    toSend.value = 0
    created.value = 0
    skipped.value = 0
    serverRejected.value = []
    importError.value = ''
  }

  function startImport() {
    if (!canImport.value) return
    const ready = checks.value.flatMap((c, recordIndex) => (c.ok ? [{ recordIndex, input: c.input }] : []))
    batches = batchForImport(ready).map(b => ({ rows: b.map(e => e.input), recordIndexes: b.map(e => e.recordIndex) }))
    toSend.value = ready.length
    phase.value = 'importing'
    return sendBatches()
  }

  /** Sends the batches from where it stopped; a failed batch stops it, with a button to carry on. */
  async function sendBatches() {
    importError.value = ''
    while (nextBatch.value < batches.length) {
      const batch = batches[nextBatch.value]!
      try {
        const res = await $fetch('/api/customers/import', { method: 'POST', body: { rows: batch.rows } })
        created.value += res.created
        skipped.value += res.skipped
        serverRejected.value.push(...res.rejected.map(r => ({ recordIndex: batch.recordIndexes[r.index]!, errors: r.errors })))
        sent.value += batch.rows.length
        nextBatch.value++
      }
      catch (err) {
        importError.value = `${formErrors(err).message} The rows sent before this are saved; nothing you chose is lost.`
        return
      }
    }
    phase.value = 'done'
  }

  function startAgain() {
    file.stopReading()
    resetImport()
    fileName.value = ''
    file.fileError.value = ''
    records.value = []
    headers.value = []
  }

  // --- downloads ---
  const rejectedCount = computed(() => problems.value.length + serverRejected.value.length)

  /** The rows left out (by the check here and by the server), as in the file, with a Row and a Problem column. */
  async function downloadRejected() {
    const Papa = (await import('papaparse')).default
    const left = [
      ...problems.value.map(p => ({ recordIndex: p.index, text: p.text })),
      ...serverRejected.value.map(r => ({ recordIndex: r.recordIndex, text: describeImportProblems(r.errors) })),
    ].sort((a, b) => a.recordIndex - b.recordIndex)
    const rowCol = headers.value.includes('Row') ? 'Row in file' : 'Row'
    const problemCol = headers.value.includes('Problem') ? 'Problem found' : 'Problem'
    const csv = Papa.unparse({
      fields: [rowCol, ...headers.value, problemCol],
      data: left.map(l => [String(importSheetRow(l.recordIndex)), ...headers.value.map(h => records.value[l.recordIndex]?.[h] ?? ''), l.text]),
    }, { escapeFormulae: true })
    downloadCsv(`${fileName.value.replace(/\.[^.]*$/, '') || 'customers'}-rejected.csv`, csv)
  }

  async function downloadTemplate() {
    const Papa = (await import('papaparse')).default
    downloadCsv('setwell-customers-template.csv', Papa.unparse({ fields: CUSTOMER_IMPORT_FIELDS.map(f => CUSTOMER_IMPORT_FIELD_LABELS[f]), data: [] }))
  }

  return {
    file, fileName, headers, records, sample, mapping, guessedAny,
    mappingErrors, problems, counts, preview, canImport,
    phase, sent, toSend, created, skipped, importError, rejectedCount,
    startImport, sendBatches, startAgain, downloadRejected, downloadTemplate,
  }
}

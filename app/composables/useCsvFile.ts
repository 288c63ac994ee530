// Reading a CSV file in the browser with papaparse, in chunks, so a big file does not freeze the
// page. A new file replaces the one loaded only once it has been read (`onRead`): a file that
// cannot be read leaves the last one as it was, with a message that says what to do.
import type { Parser } from 'papaparse'

export interface CsvRead { name: string, fields: string[], rows: Record<string, string>[] }

/** `thing`: what a row is, for the message when the file has none ("customer"). */
export function useCsvFile(options: { maxRows: number, thing: string, onRead: (read: CsvRead) => void }) {
  const readingName = ref('')
  const reading = ref(false)
  const readCount = ref(0)
  const fileError = ref('')
  let parser: Parser | null = null
  let readToken = 0

  function stopReading() {
    readToken++
    parser?.abort()
    parser = null
    reading.value = false
  }

  async function readFile(file: File) {
    stopReading()
    const token = readToken
    if (/\.(xlsx|xls|xlsm|ods|numbers)$/i.test(file.name)) {
      fileError.value = `${file.name} is a spreadsheet, not a CSV file. In the spreadsheet, choose Save as (or Download) and CSV, then choose that file here.`
      return
    }
    fileError.value = ''
    readingName.value = file.name
    readCount.value = 0
    reading.value = true
    const Papa = (await import('papaparse')).default
    const rows: Record<string, string>[] = []
    let fields: string[] = []
    let tooMany = false
    const failed = (message: string) => {
      if (token !== readToken) return
      parser = null
      reading.value = false
      fileError.value = message
    }
    Papa.parse<Record<string, string>>(file, {
      header: true,
      skipEmptyLines: 'greedy',
      worker: false,
      chunkSize: 256 * 1024,
      transformHeader: h => h.replace(/^\uFEFF/, '').trim(),
      chunk(results, p) {
        if (token !== readToken) return p.abort()
        parser = p
        if (!fields.length) fields = results.meta.fields ?? []
        for (const r of results.data) {
          if (rows.length >= options.maxRows) {
            tooMany = true
            p.abort()
            break
          }
          rows.push(r)
        }
        readCount.value = rows.length
      },
      complete() {
        if (token !== readToken) return
        if (tooMany) return failed(`${file.name} has more than ${options.maxRows.toLocaleString('en-GB')} rows. Split it into smaller files and import them one after another.`)
        if (!rows.length) return failed(`${file.name} has no ${options.thing}s in it: the first row should be the column headings, then one ${options.thing} a row.`)
        parser = null
        reading.value = false
        options.onRead({ name: file.name, fields: fields.filter(h => h !== ''), rows })
      },
      error(err) {
        failed(`We could not read ${file.name} (${err.message}). Check it is a CSV file and choose it again.`)
      },
    })
  }

  onBeforeUnmount(stopReading)
  return { reading, readingName, readCount, fileError, readFile, stopReading }
}

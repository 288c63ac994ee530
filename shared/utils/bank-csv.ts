// Reading a bank statement exported as CSV by a UK bank (issue 20): which column is which, from the
// header where it says so (else the person maps them, with a preview, as the customer import does),
// and each line as a date, a description and a signed amount in pence, with the balance when the
// file has one. Pure: the server streams the file through papaparse and hands the rows here.
//
// Layouts seen in UK banks' exports (written for the tests, not copied from any bank): one signed
// amount, or paid-in and paid-out columns; a balance column or none; dates as 04/12/2026,
// 04-12-2026, 2026-12-04, 04/12/26 or 4 Dec 2026 (day first: a UK statement never puts the month
// first); amounts with £, commas, a minus, brackets, or CR/DR after them; header rows above the
// column names; a summary row at the end. A line that is not a date and an amount between lines
// that are is an error naming its line; rows after the last line are a summary and are left.
import { parsePounds } from './money'

export const BANK_COLUMNS = ['date', 'description', 'amount', 'paidIn', 'paidOut', 'balance'] as const
export type BankColumn = (typeof BANK_COLUMNS)[number]
/** Which column of the file holds what (0-based); description may join several columns. */
export interface BankMapping {
  date: number
  description: number[]
  amount?: number
  paidIn?: number
  paidOut?: number
  balance?: number
}
/** A line of the statement: `row` is its line in the file (1-based), for messages. */
export interface BankCsvLine { row: number, date: string, description: string, amountPence: number, balancePence: number | null }
export type BankCsvResult = { ok: true, lines: BankCsvLine[], headerRow: number } | { ok: false, row: number, message: string }

const HEADER_WORDS: [BankColumn, RegExp][] = [
  ['date', /^(?:transaction |posting |posted |value )?date$|^date posted$/i],
  ['paidIn', /^(?:paid in|money in|credits?|deposits?|in)(?: \(?£\)?)?$/i],
  ['paidOut', /^(?:paid out|money out|debits?|withdrawals?|out)(?: \(?£\)?)?$/i],
  ['balance', /^(?:running )?balance(?: \(?£\)?)?$/i],
  ['amount', /^(?:amount|value|transaction amount)(?: \(?£\)?)?$/i],
  ['description', /^(?:description|transaction description|details|narrative|memo|payee|reference|transaction type|type|name)$/i],
]

/** The mapping the header row gives, when it names a date, a description and an amount (or in and out). */
export function mappingFromHeader(header: readonly string[]): BankMapping | null {
  const found: Partial<Record<BankColumn, number>> = {}
  const description: number[] = []
  header.forEach((cell, i) => {
    const text = cell.trim().replace(/\s+/g, ' ')
    for (const [column, words] of HEADER_WORDS) {
      if (!words.test(text)) continue
      if (column === 'description') description.push(i)
      else if (found[column] === undefined) found[column] = i
      break
    }
  })
  if (found.date === undefined || !description.length) return null
  const hasAmount = found.amount !== undefined || found.paidIn !== undefined || found.paidOut !== undefined
  if (!hasAmount) return null
  return { date: found.date, description, amount: found.amount, paidIn: found.paidIn, paidOut: found.paidOut, balance: found.balance }
}

const MONTHS = ['jan', 'feb', 'mar', 'apr', 'may', 'jun', 'jul', 'aug', 'sep', 'oct', 'nov', 'dec']

/** A statement's date as ISO (day first), or null. Two-digit years are this century. */
export function statementDate(input: string): string | null {
  const s = input.trim()
  let y: number, m: number, d: number
  let match = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(s)
  if (match) [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])]
  else if ((match = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{2}|\d{4})$/.exec(s))) {
    d = Number(match[1])
    m = Number(match[2])
    y = Number(match[3])
    if (match[3]!.length === 2) y += 2000
  }
  else if ((match = /^(\d{1,2})[ -]([a-z]{3})[a-z]*[ -](\d{2}|\d{4})$/i.exec(s))) {
    d = Number(match[1])
    m = MONTHS.indexOf(match[2]!.toLowerCase()) + 1
    y = Number(match[3])
    if (match[3]!.length === 2) y += 2000
    if (m === 0) return null
  }
  else return null
  const date = new Date(Date.UTC(y, m - 1, d))
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== m - 1 || date.getUTCDate() !== d) return null
  return date.toISOString().slice(0, 10)
}

/** A statement's amount in pence, signed: '-12.50', '£1,234.56', '(12.50)', '12.50 DR', '12.50CR'; '' is null. */
export function statementPence(input: string): number | null | 'bad' {
  let s = input.trim().replace(/\s+/g, '')
  if (!s) return null
  let sign = 1
  if (/^\(.*\)$/.test(s)) {
    sign = -1
    s = s.slice(1, -1)
  }
  const suffix = /(CR|DR)$/i.exec(s)
  if (suffix) {
    if (suffix[1]!.toUpperCase() === 'DR') sign = -sign
    s = s.slice(0, -2)
  }
  if (s.startsWith('-')) {
    sign = -sign
    s = s.slice(1)
  }
  else if (s.startsWith('+')) s = s.slice(1)
  if (s.startsWith('£')) s = s.slice(1)
  if (s.startsWith('-')) {
    // £-12.50
    sign = -sign
    s = s.slice(1)
  }
  const pence = parsePounds(s)
  return pence === null ? 'bad' : sign * pence
}

/** Rows (as papaparse gives them) to the statement's lines; the header row is the first (within ten) that names its columns, unless a mapping is given. */
/** The file's header does not say which column is which: the page then asks the person. */
export const NO_HEADER = 'No row names the date, description and amount columns: choose which column is which.'

export function readStatementRows(rows: readonly (readonly string[])[], given?: { mapping: BankMapping, headerRow: number }): BankCsvResult {
  let mapping = given?.mapping ?? null
  let headerRow = given?.headerRow ?? -1
  if (!mapping) {
    for (let i = 0; i < Math.min(rows.length, 10) && !mapping; i++) {
      mapping = mappingFromHeader(rows[i]!)
      if (mapping) headerRow = i
    }
  }
  if (!mapping) return { ok: false, row: 1, message: NO_HEADER }
  const lines: BankCsvLine[] = []
  let problem: { row: number, message: string } | null = null
  for (let i = headerRow + 1; i < rows.length; i++) {
    const r = rows[i]!
    const row = i + 1
    if (r.every(c => !c.trim())) continue
    const cell = (n: number | undefined) => (n === undefined ? '' : (r[n] ?? ''))
    const date = statementDate(cell(mapping.date))
    const amount = mapping.amount !== undefined ? statementPence(cell(mapping.amount)) : null
    const paidIn = mapping.paidIn !== undefined ? statementPence(cell(mapping.paidIn)) : null
    const paidOut = mapping.paidOut !== undefined ? statementPence(cell(mapping.paidOut)) : null
    const balance = mapping.balance !== undefined ? statementPence(cell(mapping.balance)) : null
    const whyNot = !date
      ? `the date "${cell(mapping.date).trim()}" is not a date (day, month, year)`
      : [amount, paidIn, paidOut, balance].includes('bad')
          ? 'an amount is not an amount of money'
          : amount === null && paidIn === null && paidOut === null
            ? 'it has no amount'
            : paidIn !== null && paidOut !== null && paidIn !== 0 && paidOut !== 0
              ? 'it has both money in and money out'
              : null
    if (whyNot) {
      // kept until a later line shows it was not the summary at the end
      problem ??= { row, message: `Line ${row}: ${whyNot}.` }
      continue
    }
    if (problem) return { ok: false, ...problem }
    const amountPence = amount !== null
      ? amount as number
      : (paidIn as number | null ?? 0) - Math.abs(paidOut as number | null ?? 0)
    lines.push({
      row,
      date: date!,
      description: mapping.description.map(n => cell(n).trim()).filter(Boolean).join(' ').replace(/\s+/g, ' '),
      amountPence,
      balancePence: balance as number | null,
    })
  }
  if (!lines.length) return { ok: false, row: problem?.row ?? headerRow + 2, message: problem?.message ?? 'The file has no statement lines under its header.' }
  return { ok: true, lines, headerRow: headerRow + 1 }
}

/**
 * Each line's identity, so a file imported again, or one overlapping it, adds nothing twice: the
 * bank's own id where the file has one (OFX's FITID); else the date, the amount, the description
 * (case and spacing aside) and the balance after it; else, with no balance, which of the identical
 * lines of the file it is (the second coffee of the same price on the same day is "#2" in every
 * file that holds both).
 */
export function lineKeys(lines: readonly (Pick<BankCsvLine, 'date' | 'description' | 'amountPence' | 'balancePence'> & { fitId?: string | null })[]): string[] {
  const seen = new Map<string, number>()
  return lines.map((l) => {
    if (l.fitId) return `fit:${l.fitId}`
    const base = `${l.date}|${l.amountPence}|${l.description.toUpperCase().replace(/\s+/g, ' ').trim()}`
    if (l.balancePence !== null) return `${base}|bal:${l.balancePence}`
    const n = (seen.get(base) ?? 0) + 1
    seen.set(base, n)
    return `${base}|#${n}`
  })
}

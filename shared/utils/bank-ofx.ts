// Reading a bank statement in OFX (issue 20), version 1 (SGML, tags left open) or 2 (XML), with
// ofx-js (no dependencies; runs on Node 20). Each transaction to the same line as a CSV statement's
// (shared/utils/bank-csv.ts): a date, a description (the payee's name and the memo), a signed
// amount in pence, and the bank's own id for the line (FITID), which re-imports recognise first.
import { parseSync } from 'ofx-js'
import { statementPence, type BankCsvLine } from './bank-csv'

export interface BankOfxLine extends BankCsvLine { fitId: string | null }
export type BankOfxResult = { ok: true, lines: BankOfxLine[] } | { ok: false, row: number, message: string }

type Loose = Record<string, unknown>
const list = (v: unknown): Loose[] => (Array.isArray(v) ? v : v ? [v] : []) as Loose[]
const text = (v: unknown) => (typeof v === 'string' ? v.trim() : '')

/** OFX's date (YYYYMMDD, with a time and zone after it or not) as ISO, or null. */
export function ofxDate(value: string): string | null {
  const m = /^(\d{4})(\d{2})(\d{2})/.exec(value.trim())
  if (!m) return null
  const iso = `${m[1]}-${m[2]}-${m[3]}`
  const d = new Date(`${iso}T00:00:00Z`)
  return Number.isNaN(d.getTime()) || d.toISOString().slice(0, 10) !== iso ? null : iso
}

/** Every transaction of every bank (and card) statement in the file; `row` is the transaction's place in the file (1-based). */
export function readOfx(data: string): BankOfxResult {
  let parsed: { OFX?: Loose }
  try {
    parsed = parseSync(data) as { OFX?: Loose }
  }
  catch {
    return { ok: false, row: 1, message: 'This is not an OFX file Setwell can read: export the statement again, or as CSV.' }
  }
  const ofx = parsed?.OFX
  const statements = [
    ...list((ofx?.BANKMSGSRSV1 as Loose | undefined)?.STMTTRNRS).map(t => t.STMTRS as Loose | undefined),
    ...list((ofx?.CREDITCARDMSGSRSV1 as Loose | undefined)?.CCSTMTTRNRS).map(t => t.CCSTMTRS as Loose | undefined),
  ].filter((s): s is Loose => !!s)
  const lines: BankOfxLine[] = []
  let row = 0
  for (const s of statements) {
    for (const t of list((s.BANKTRANLIST as Loose | undefined)?.STMTTRN)) {
      row++
      const date = ofxDate(text(t.DTPOSTED))
      const amount = statementPence(text(t.TRNAMT))
      if (!date) return { ok: false, row, message: `Transaction ${row}: the date "${text(t.DTPOSTED)}" is not a date.` }
      if (amount === null || amount === 'bad') return { ok: false, row, message: `Transaction ${row}: the amount "${text(t.TRNAMT)}" is not an amount of money.` }
      lines.push({ row, date, description: [text(t.NAME), text(t.MEMO)].filter(Boolean).join(' ').replace(/\s+/g, ' '), amountPence: amount, balancePence: null, fitId: text(t.FITID) || null })
    }
  }
  if (!lines.length) return { ok: false, row: 1, message: 'The OFX file holds no transactions.' }
  return { ok: true, lines }
}

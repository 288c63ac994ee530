import { parse } from 'csv-parse/sync'
import { describe, expect, it } from 'vitest'
import type { CsvCell } from '../../shared/utils/csv'
import { FORMULA_START, UTF8_BOM, poundsCell, toCsv } from '../../shared/utils/csv'
import { penceToDecimal } from '../../shared/utils/money'

// Sources: formula escaping of cells that start with =, +, -, @, a tab or a carriage return by a
// leading apostrophe (OWASP "CSV Injection"); quoting of cells holding a comma, a double quote or a
// line break, with a double quote doubled, and CRLF line ends (RFC 4180 section 2). Our own rules
// (shared/utils/csv.ts): one header row; a plain signed decimal this code wrote, such as "-12.50",
// stays a number so the accountant's sums work; amounts in pounds with two decimals; a CRLF after
// the last line too; a byte-order mark offered for spreadsheets on Windows.

/** One data row of one cell, without the header: what the cell is written as. */
const cell = (value: CsvCell) => toCsv(['x'], [[value]], false).replace(/\r\n$/, '')

describe('toCsv: a cell that could run as a formula gets a leading apostrophe (OWASP "CSV Injection")', () => {
  it.each<[string, string, string]>([
    ['=SUM(A1:A9)', '"\'=SUM(A1:A9)"', 'equals'],
    ['=HYPERLINK("http://example.invalid","Click")', '"\'=HYPERLINK(""http://example.invalid"",""Click"")"', 'equals, with the quotes doubled too (RFC 4180)'],
    ['+44 7700 900123', '"\'+44 7700 900123"', 'plus (a phone number typed with its country code)'],
    ['-2+3', '"\'-2+3"', 'minus, not a plain number'],
    ['-', '"\'-"', 'a lone minus'],
    ['-12.50 ', '"\'-12.50 "', 'minus: a number with a trailing space is not a plain number'],
    ['-1e5', '"\'-1e5"', 'minus with an exponent is not a plain decimal'],
    ['-12.', '"\'-12."', 'minus with a bare point'],
    ['-12.50\n', '"\'-12.50\n"', 'a plain number then a line break is not a plain number'],
    ['@SUM(A1)', '"\'@SUM(A1)"', 'at sign'],
    ['\t=1+1', '"\'\t=1+1"', 'a leading tab'],
    ['\r=1+1', '"\'\r=1+1"', 'a leading carriage return'],
    ['+12.50', '"\'+12.50"', 'a plus sign: this code never writes one, so it is a typed cell'],
  ])('%j is written %j (%s)', (value, written) => {
    expect(cell(value)).toBe(written)
    expect(FORMULA_START.test(value)).toBe(true)
  })
})

describe('toCsv: cells that are not formulas are left alone (OWASP "CSV Injection" lists only those first characters; plain numbers our rule)', () => {
  it.each<[CsvCell, string, string]>([
    ['-12.50', '-12.50', 'a refund this code wrote: a plain signed decimal stays a number'],
    ['-0.05', '-0.05', 'under a pound'],
    ['-12', '-12', 'a whole negative number'],
    ['12.50', '12.50', 'a plain positive amount'],
    ['Mrs A Patel', 'Mrs A Patel', 'a name'],
    ['Skim = 2 coats', 'Skim = 2 coats', 'an equals sign inside, not first'],
    ['a-b', 'a-b', 'a minus inside'],
    ['O\'Brien', 'O\'Brien', 'an apostrophe inside'],
    ['', '', 'an empty cell'],
    [null, '', 'null is empty'],
    [undefined, '', 'undefined is empty'],
    [-5, '-5', 'a number cell is never escaped'],
    [0, '0', 'nought'],
    [true, 'true', 'a boolean'],
  ])('%j is written %j (%s)', (value, written) => expect(cell(value)).toBe(written))
})

describe('toCsv: quoting (RFC 4180 section 2)', () => {
  it.each<[string, string, string]>([
    ['Brick, Mortar & Co', '"Brick, Mortar & Co"', 'a comma: quoted'],
    ['the "front" room', '"the ""front"" room"', 'a double quote: quoted and doubled'],
    ['line one\nline two', '"line one\nline two"', 'a line feed: quoted'],
    ['line one\r\nline two', '"line one\r\nline two"', 'CRLF inside a cell: quoted'],
    ['no quotes needed', 'no quotes needed', 'plain text is not quoted'],
    ['Dvořák', 'Dvořák', 'letters beyond ASCII are written as they are'],
  ])('%j is written %j (%s)', (value, written) => expect(cell(value)).toBe(written))
})

describe('toCsv: the shape of the file (RFC 4180 section 2: CRLF line ends; one header row is our rule)', () => {
  it('a header row, then one line per row, CRLF between lines and after the last', () => {
    expect(toCsv(['Date', 'Reference', 'Net'], [['2026-01-12', 'INV-0101', '1200.00'], ['2026-03-02', 'CN-0001', '-50.00']]))
      .toBe('Date,Reference,Net\r\n2026-01-12,INV-0101,1200.00\r\n2026-03-02,CN-0001,-50.00\r\n')
  })

  it('no bare line feeds between rows', () => {
    const text = toCsv(['a'], [['1'], ['2'], ['3']])
    expect(text.split('\r\n')).toEqual(['a', '1', '2', '3', ''])
    expect(text.replaceAll('\r\n', '')).not.toMatch(/[\r\n]/)
  })

  it('no rows: the header row alone, with its CRLF', () => expect(toCsv(['Date', 'Net'], [])).toBe('Date,Net\r\n'))
  it('no rows and no header: empty', () => expect(toCsv(['Date', 'Net'], [], false)).toBe(''))
  it('rows without the header', () => expect(toCsv(['Date', 'Net'], [['2026-01-12', '1.00']], false)).toBe('2026-01-12,1.00\r\n'))
  it('a header cell with a comma is quoted like any cell', () => expect(toCsv(['Net, £', 'VAT'], [])).toBe('"Net, £",VAT\r\n'))
  it('the byte-order mark is U+FEFF', () => expect(UTF8_BOM).toBe('\uFEFF'))
})

describe('poundsCell: pence as pounds with two decimals (our rule: the accountant\'s columns)', () => {
  it.each<[number | null | undefined, string]>([
    [123_450, '1234.50'],
    [100, '1.00'],
    [1, '0.01'],
    [0, '0.00'],
    [-5, '-0.05'],
    [-1_250, '-12.50'],
    [-123_456_789, '-1234567.89'],
    [null, ''],
    [undefined, ''],
  ])('%j -> %j', (pence, written) => expect(poundsCell(pence)).toBe(written))

  it('a negative amount it writes is not escaped as a formula (csv.ts: refunds stay numbers)', () => {
    expect(cell(poundsCell(-1_250))).toBe('-12.50')
  })

  it.each([12.5, Number.NaN, Number.POSITIVE_INFINITY])('%s pence is a RangeError', pence => expect(() => poundsCell(pence)).toThrow(RangeError))

  // poundsCell does its own whole-number formatting for speed; it must agree with dinero's
  it.each([9, 10, 99, 101, 109, 110, 1_000_000, -0, -1, -9, -10, -99, -100, -101, 2_147_483_647, -2_147_483_648, Number.MAX_SAFE_INTEGER, -Number.MAX_SAFE_INTEGER])(
    '%s pence is written as dinero writes it', pence => expect(poundsCell(pence)).toBe(penceToDecimal(pence)),
  )
})

describe('round trip through csv-parse (RFC 4180): a reader gets the cells back, escaped ones with their apostrophe', () => {
  const header = ['Date', 'Customer', 'Note', 'Amount']
  const rows: CsvCell[][] = [
    ['2026-01-12', 'Mrs A Patel', 'Skim, two rooms', poundsCell(120_000)],
    ['2026-02-03', 'Harbour "HL" Lettings', 'line one\r\nline two', poundsCell(-5_000)],
    ['2026-02-20', '=cmd|\' /C calc\'!A0', '@SUM(A1)', poundsCell(-5)],
    ['2026-03-02', '+44 7700 900123', '\tindented', '-12.50'],
    ['2026-03-31', 'Dvořák', '', null],
    ['2026-03-31', '-', 'new\nline', 7],
  ]
  const text = toCsv(header, rows)
  const back = parse(text) as string[][]

  it('gives back the header and every cell as text', () => {
    expect(back).toEqual([
      header,
      ['2026-01-12', 'Mrs A Patel', 'Skim, two rooms', '1200.00'],
      ['2026-02-03', 'Harbour "HL" Lettings', 'line one\r\nline two', '-50.00'],
      ['2026-02-20', '\'=cmd|\' /C calc\'!A0', '\'@SUM(A1)', '-0.05'],
      ['2026-03-02', '\'+44 7700 900123', '\'\tindented', '-12.50'],
      ['2026-03-31', 'Dvořák', '', ''],
      ['2026-03-31', '\'-', 'new\nline', '7'],
    ])
  })

  it('every row has the header\'s number of cells', () => expect(back.every(r => r.length === header.length)).toBe(true))

  it('with the byte-order mark in front, a reader that knows it gets the same cells', () => {
    expect(parse(UTF8_BOM + text, { bom: true })).toEqual(back)
  })
})

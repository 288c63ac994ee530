import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { lineKeys, mappingFromHeader, readStatementRows, statementDate, statementPence } from '../../shared/utils/bank-csv'

// Statement files written for these tests (invented payers and references); the layouts are the
// common shapes of UK banks' CSV exports ("common practice": no bank's file is copied).
const rows = (text: string) => Papa.parse<string[]>(text.trim(), { skipEmptyLines: false }).data

describe('statementDate: day first, as a UK statement writes it', () => {
  const cases: [string, string | null][] = [
    ['04/12/2026', '2026-12-04'],
    ['4/12/2026', '2026-12-04'],
    ['04-12-2026', '2026-12-04'],
    ['04.12.26', '2026-12-04'],
    ['2026-12-04', '2026-12-04'],
    ['4 Dec 2026', '2026-12-04'],
    ['04-Dec-26', '2026-12-04'],
    ['04 December 2026', '2026-12-04'],
    ['12/04/2026', '2026-04-12'], // never month first
    ['31/11/2026', null], // no 31 November
    ['29/02/2027', null],
    ['29/02/2028', '2028-02-29'],
    ['Total', null],
    ['', null],
  ]
  it.each(cases)('%s -> %s', (input, want) => expect(statementDate(input)).toBe(want))
})

describe('statementPence: signed pence from what banks write', () => {
  const cases: [string, number | null | 'bad'][] = [
    ['-12.50', -1250],
    ['12.5', 1250],
    ['£1,234.56', 123456],
    ['-£45.00', -4500],
    ['£-45.00', -4500],
    ['(12.50)', -1250],
    ['12.50 DR', -1250],
    ['12.50CR', 1250],
    ['+300', 30000],
    ['', null],
    ['  ', null],
    ['12.345', 'bad'],
    ['twelve', 'bad'],
  ]
  it.each(cases)('%s -> %s', (input, want) => expect(statementPence(input)).toBe(want))
})

describe('mappingFromHeader', () => {
  it('finds a signed amount, a balance and two description columns', () => {
    expect(mappingFromHeader(['Date', 'Type', 'Description', 'Amount', 'Balance'])).toEqual({ date: 0, description: [1, 2], amount: 3, paidIn: undefined, paidOut: undefined, balance: 4 })
  })
  it('finds paid-in and paid-out columns', () => {
    expect(mappingFromHeader(['Transaction Date', 'Details', 'Paid out (£)', 'Paid in (£)'])).toMatchObject({ date: 0, description: [1], paidIn: 3, paidOut: 2 })
  })
  it('says nothing when the header does not name the columns (the person maps them)', () => {
    expect(mappingFromHeader(['04/12/2026', 'BRP-17 MARLOW', '-12.00'])).toBeNull()
    expect(mappingFromHeader(['Date', 'Amount'])).toBeNull()
  })
})

describe('readStatementRows: each layout to the same lines', () => {
  const want = [
    { date: '2026-12-01', description: 'FASTER PAYMENT BRP-0017 COLLEY', amountPence: 48000 },
    { date: '2026-12-02', description: 'CARD PAYMENT TRADE PLASTER SUPPLIES', amountPence: -6420 },
    { date: '2026-12-04', description: 'BANK TRANSFER PRIBBLEWORTH INV BRP 21', amountPence: 176400 },
  ]
  const layouts: [string, string][] = [
    ['one signed amount, ISO dates', `
Date,Description,Amount
2026-12-01,FASTER PAYMENT BRP-0017 COLLEY,480.00
2026-12-02,CARD PAYMENT TRADE PLASTER SUPPLIES,-64.20
2026-12-04,BANK TRANSFER PRIBBLEWORTH INV BRP 21,"1,764.00"`],
    ['paid in and paid out, dd/mm/yyyy, a balance', `
Date,Description,Paid out,Paid in,Balance
01/12/2026,FASTER PAYMENT BRP-0017 COLLEY,,480.00,"2,480.00"
02/12/2026,CARD PAYMENT TRADE PLASTER SUPPLIES,64.20,,"2,415.80"
04/12/2026,BANK TRANSFER PRIBBLEWORTH INV BRP 21,,"1,764.00","4,179.80"`],
    ['lines above the header, a type column, a summary row at the end', `
Account name,Brackenridge Plastering
Sort code,00-00-00
,
Date,Type,Description,Amount
01/12/26,FASTER PAYMENT,BRP-0017 COLLEY,480.00
02/12/26,CARD PAYMENT,TRADE PLASTER SUPPLIES,-64.20
04/12/26,BANK TRANSFER,PRIBBLEWORTH INV BRP 21,1764.00
Total,,,2179.80`],
  ]
  it.each(layouts)('%s', (_name, text) => {
    const read = readStatementRows(rows(text))
    expect(read.ok, JSON.stringify(read)).toBe(true)
    if (read.ok) expect(read.lines.map(({ date, description, amountPence }) => ({ date, description, amountPence }))).toEqual(want)
  })

  it('keeps the balance when the file has one', () => {
    const read = readStatementRows(rows(layouts[1]![1]))
    expect(read.ok && read.lines.map(l => l.balancePence)).toEqual([248000, 241580, 417980])
  })

  it('names the line of a date that is not one, between good lines, and reads nothing', () => {
    const read = readStatementRows(rows(`
Date,Description,Amount
01/12/2026,FASTER PAYMENT BRP-0017 COLLEY,480.00
31/11/2026,CARD PAYMENT TRADE PLASTER SUPPLIES,-64.20
04/12/2026,BANK TRANSFER PRIBBLEWORTH,1764.00`))
    expect(read).toEqual({ ok: false, row: 3, message: 'Line 3: the date "31/11/2026" is not a date (day, month, year).' })
  })

  it('names a line with an amount that is not money', () => {
    const read = readStatementRows(rows(`
Date,Description,Amount
01/12/2026,FASTER PAYMENT,80.0.0
02/12/2026,CARD PAYMENT,-64.20`))
    expect(read).toEqual({ ok: false, row: 2, message: 'Line 2: an amount is not an amount of money.' })
  })

  it('asks for a mapping when no header names the columns, and reads with one given', () => {
    const text = `
01/12/2026,FASTER PAYMENT BRP-0017 COLLEY,480.00
02/12/2026,CARD PAYMENT TRADE PLASTER SUPPLIES,-64.20`
    expect(readStatementRows(rows(text))).toMatchObject({ ok: false, row: 1 })
    const read = readStatementRows(rows(text), { mapping: { date: 0, description: [1], amount: 2 }, headerRow: -1 })
    expect(read.ok && read.lines.map(l => l.amountPence)).toEqual([48000, -6420])
  })
})

describe('lineKeys: the same line has the same key in every file that holds it', () => {
  const l = (date: string, description: string, amountPence: number, balancePence: number | null = null, fitId: string | null = null) => ({ date, description, amountPence, balancePence, fitId })
  it('numbers identical lines of a file without balances, so both coffees are kept once each', () => {
    expect(lineKeys([l('2026-12-01', 'CARD PAYMENT CAFE', -350), l('2026-12-01', 'card  payment cafe', -350), l('2026-12-02', 'CARD PAYMENT CAFE', -350)]))
      .toEqual(['2026-12-01|-350|CARD PAYMENT CAFE|#1', '2026-12-01|-350|CARD PAYMENT CAFE|#2', '2026-12-02|-350|CARD PAYMENT CAFE|#1'])
  })
  it('an overlapping file gives the shared lines the same keys', () => {
    const first = lineKeys([l('2026-11-30', 'FP COLLEY', 48000), l('2026-12-01', 'CARD CAFE', -350), l('2026-12-01', 'CARD CAFE', -350)])
    const second = lineKeys([l('2026-12-01', 'CARD CAFE', -350), l('2026-12-01', 'CARD CAFE', -350), l('2026-12-02', 'FP DUNMORE', 25000)])
    expect(second.filter(k => first.includes(k))).toHaveLength(2)
  })
  it('uses the balance when there is one, and the bank\'s own id before anything', () => {
    expect(lineKeys([l('2026-12-01', 'CARD CAFE', -350, 100000), l('2026-12-01', 'CARD CAFE', -350, 99650)])).toEqual(['2026-12-01|-350|CARD CAFE|bal:100000', '2026-12-01|-350|CARD CAFE|bal:99650'])
    expect(lineKeys([l('2026-12-01', 'CARD CAFE', -350, null, 'A1')])).toEqual(['fit:A1'])
  })
})

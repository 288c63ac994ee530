import { describe, expect, it } from 'vitest'
import { ofxDate, readOfx } from '../../shared/utils/bank-ofx'

// OFX files made for these tests (the OFX 1.0.2 SGML layout and 2.x XML, as the OFX specification
// lays them out); invented payers.
const HEADER = 'OFXHEADER:100\nDATA:OFXSGML\nVERSION:102\nSECURITY:NONE\nENCODING:USASCII\nCHARSET:1252\nCOMPRESSION:NONE\nOLDFILEUID:NONE\nNEWFILEUID:NONE\n\n'
const sgml = (trns: string) => `${HEADER}<OFX><SIGNONMSGSRSV1><SONRS><STATUS><CODE>0<SEVERITY>INFO</STATUS><DTSERVER>20261205120000<LANGUAGE>ENG</SONRS></SIGNONMSGSRSV1>
<BANKMSGSRSV1><STMTTRNRS><TRNUID>1<STATUS><CODE>0<SEVERITY>INFO</STATUS><STMTRS><CURDEF>GBP<BANKACCTFROM><BANKID>000000<ACCTID>00000000<ACCTTYPE>CHECKING</BANKACCTFROM>
<BANKTRANLIST><DTSTART>20261201<DTEND>20261204
${trns}
</BANKTRANLIST></STMTRS></STMTTRNRS></BANKMSGSRSV1></OFX>`
const TWO = `<STMTTRN><TRNTYPE>CREDIT<DTPOSTED>20261201<TRNAMT>480.00<FITID>A1<NAME>FASTER PAYMENT<MEMO>BRP-0017 COLLEY</STMTTRN>
<STMTTRN><TRNTYPE>DEBIT<DTPOSTED>20261202000000[0:GMT]<TRNAMT>-64.20<FITID>A2<NAME>TRADE PLASTER SUP</STMTTRN>`

describe('ofxDate', () => {
  const cases: [string, string | null][] = [['20261204', '2026-12-04'], ['20261204120000[0:GMT]', '2026-12-04'], ['20261131', null], ['2026-12-04', null], ['', null]]
  it.each(cases)('%s -> %s', (v, want) => expect(ofxDate(v)).toBe(want))
})

describe('readOfx', () => {
  it('reads an OFX 1 (SGML) statement: dates, signed pence, name and memo, the bank\'s ids', () => {
    expect(readOfx(sgml(TWO))).toEqual({ ok: true, lines: [
      { row: 1, date: '2026-12-01', description: 'FASTER PAYMENT BRP-0017 COLLEY', amountPence: 48000, balancePence: null, fitId: 'A1' },
      { row: 2, date: '2026-12-02', description: 'TRADE PLASTER SUP', amountPence: -6420, balancePence: null, fitId: 'A2' },
    ] })
  })
  it('reads a statement of one transaction (not a list in the file)', () => {
    const r = readOfx(sgml('<STMTTRN><TRNTYPE>CREDIT<DTPOSTED>20261203<TRNAMT>1764.00<FITID>B7<NAME>PRIBBLEWORTH</STMTTRN>'))
    expect(r.ok && r.lines.map(l => [l.date, l.amountPence, l.fitId])).toEqual([['2026-12-03', 176400, 'B7']])
  })
  it('reads OFX 2 (XML)', () => {
    const xml = `<?xml version="1.0" encoding="UTF-8"?><?OFX OFXHEADER="200" VERSION="211" SECURITY="NONE" OLDFILEUID="NONE" NEWFILEUID="NONE"?>
<OFX><BANKMSGSRSV1><STMTTRNRS><TRNUID>1</TRNUID><STMTRS><CURDEF>GBP</CURDEF><BANKTRANLIST><DTSTART>20261201</DTSTART><DTEND>20261204</DTEND>
<STMTTRN><TRNTYPE>CREDIT</TRNTYPE><DTPOSTED>20261201</DTPOSTED><TRNAMT>480.00</TRNAMT><FITID>A1</FITID><NAME>FASTER PAYMENT</NAME></STMTTRN>
</BANKTRANLIST></STMTRS></STMTTRNRS></BANKMSGSRSV1></OFX>`
    const r = readOfx(xml)
    expect(r.ok && r.lines.map(l => [l.date, l.amountPence, l.description])).toEqual([['2026-12-01', 48000, 'FASTER PAYMENT']])
  })
  it('names the transaction with a bad date or amount, and reads nothing', () => {
    expect(readOfx(sgml(`${TWO}\n<STMTTRN><TRNTYPE>DEBIT<DTPOSTED>20261131<TRNAMT>-1.00<FITID>A3<NAME>X</STMTTRN>`))).toEqual({ ok: false, row: 3, message: 'Transaction 3: the date "20261131" is not a date.' })
    expect(readOfx(sgml('<STMTTRN><TRNTYPE>DEBIT<DTPOSTED>20261201<TRNAMT>12,34.5.6<FITID>A3<NAME>X</STMTTRN>'))).toMatchObject({ ok: false, row: 1 })
  })
  it('refuses what is not OFX, or holds no transactions', () => {
    expect(readOfx('Date,Description,Amount\n01/12/2026,X,1.00')).toMatchObject({ ok: false })
    expect(readOfx(sgml(''))).toEqual({ ok: false, row: 1, message: 'The OFX file holds no transactions.' })
  })
})

import { describe, expect, it } from 'vitest'
import { accountNumberProblem, bankAccountInline, bankAccountLines, formatSortCode, hasBankAccount, sortCodeProblem } from '../../shared/utils/bank-details'
import { firmSettingsSchema } from '../../shared/schemas/firm'
import { DEMO_CUSTOMERS, DEMO_FIRM, SECOND_FIRM } from '../../seeds/demo'

// The firm's bank account for payment by transfer. Sources (common practice, as UK banks ask a
// payer for a new payee and print on statements and paying-in slips):
// - a sort code is six digits, written as three pairs with dashes (12-34-56), sometimes with spaces;
// - an account number is eight digits; a few banks and building societies give seven or six,
//   which the payer makes up to eight with noughts in front (so eight is asked for);
// - a payer's bank checks the name on the account against the one given (Confirmation of
//   Payee), so the account name is asked for as the bank holds it, not shortened.

describe('sortCodeProblem', () => {
  it.each([
    ['six digits in pairs with dashes', '12-34-56', null],
    ['six digits together', '123456', null],
    ['six digits in pairs with spaces', '12 34 56', null],
    ['with spaces round it', '  12-34-56 ', null],
    ['noughts are digits too', '00-00-00', null],
    ['five digits', '12-34-5', 'six digits'],
    ['seven digits', '1234567', 'six digits'],
    ['a letter', '12-34-5O', 'six digits'],
    ['dashes in the wrong places', '123-456', 'six digits'],
    ['two dashes together', '12--34-56', 'six digits'],
    ['dots', '12.34.56', 'six digits'],
    ['blank', '', 'six digits'],
  ])('%s: %s', (_what, typed, problem) => {
    const said = sortCodeProblem(typed)
    if (problem === null) expect(said).toBeNull()
    else expect(said).toContain(problem)
  })
})

describe('accountNumberProblem', () => {
  it.each([
    ['eight digits', '12345678', null],
    ['eight digits with spaces (as printed on some cards)', '1234 5678', null],
    ['starting with noughts', '00123456', null],
    ['seven digits: asked for with a nought in front', '1234567', 'noughts in front'],
    ['six digits', '123456', 'noughts in front'],
    ['ten digits', '1234567890', 'eight digits'],
    ['with a dash', '1234-5678', 'digits only'],
    ['with a letter', '1234567O', 'digits only'],
    ['blank', '', 'digits only'],
  ])('%s: %s', (_what, typed, problem) => {
    const said = accountNumberProblem(typed)
    if (problem === null) expect(said).toBeNull()
    else expect(said).toContain(problem)
  })
})

describe('formatSortCode', () => {
  it.each([
    ['123456', '12-34-56'],
    ['12 34 56', '12-34-56'],
    ['12-34-56', '12-34-56'],
    // not six digits: left as typed, for the check to name
    ['12345', '12345'],
    ['', ''],
  ])('%s reads %s', (code, reads) => expect(formatSortCode(code)).toBe(reads))
})

describe('hasBankAccount', () => {
  const full = { bankAccountName: 'Brackenridge Plastering', bankSortCode: '123456', bankAccountNumber: '12345678' }
  it.each([
    ['all three', full, true],
    ['the sort code with dashes', { ...full, bankSortCode: '12-34-56' }, true],
    ['no name', { ...full, bankAccountName: '  ' }, false],
    ['no sort code', { ...full, bankSortCode: '' }, false],
    ['a short sort code', { ...full, bankSortCode: '12345' }, false],
    ['no account number', { ...full, bankAccountNumber: '' }, false],
    ['a seven-digit account number', { ...full, bankAccountNumber: '1234567' }, false],
    ['nothing', null, false],
  ])('%s: %s', (_what, account, has) => expect(hasBankAccount(account)).toBe(has))

  it('reads as lines and on one line, the sort code in pairs', () => {
    expect(bankAccountLines(full)).toEqual(['Account name: Brackenridge Plastering', 'Sort code: 12-34-56', 'Account number: 12345678'])
    expect(bankAccountInline(full)).toBe('Brackenridge Plastering, sort code 12-34-56, account 12345678')
  })
})

describe('the bank account in firmSettingsSchema', () => {
  const firm = { tradingName: 'Brackenridge Plastering', addressLine1: '', addressLine2: '', town: '', postcode: '', email: '', phone: '', vatRegistered: false, vatNumber: null, cisStatus: 'not-registered', utr: null, dayRatePence: 0, paymentTermsDays: 30, invoicePrefix: '' }
  const parse = (bank: Record<string, unknown>) => firmSettingsSchema.safeParse({ ...firm, ...bank })
  const fieldsOf = (bank: Record<string, unknown>) => {
    const r = parse(bank)
    return r.success ? {} : Object.fromEntries(r.error.issues.map(i => [i.path.join('.'), i.message]))
  }

  it('keeps the sort code and account number as digits, the name trimmed', () => {
    const r = parse({ takesTransfer: true, bankAccountName: ' Brackenridge Plastering ', bankSortCode: ' 12 34 56 ', bankAccountNumber: '1234 5678' })
    expect(r.success && r.data).toMatchObject({ takesTransfer: true, bankAccountName: 'Brackenridge Plastering', bankSortCode: '123456', bankAccountNumber: '12345678' })
  })

  it('leaves out what was not sent, and keeps blanks as blanks', () => {
    const none = parse({})
    expect(none.success && Object.keys(none.data).filter(k => k.startsWith('bank') || k === 'takesTransfer')).toEqual([])
    expect(parse({ bankAccountName: '', bankSortCode: '', bankAccountNumber: '' }).data).toMatchObject({ bankAccountName: '', bankSortCode: '', bankAccountNumber: '' })
  })

  it('names each bad part beside its field, with the words of the check', () => {
    expect(fieldsOf({ bankSortCode: '12-34-5', bankAccountNumber: '1234567' })).toEqual({
      bankSortCode: sortCodeProblem('12-34-5'),
      bankAccountNumber: accountNumberProblem('1234567'),
    })
    expect(Object.keys(fieldsOf({ takesTransfer: 'yes' }))).toEqual(['takesTransfer'])
    expect(Object.keys(fieldsOf({ bankAccountName: 'x'.repeat(141) }))).toEqual(['bankAccountName'])
  })
})

/** HMRC's check on a UK VAT number's nine digits: the first seven weighted 8 to 2, plus the last two, a multiple of 97 (or of 97 after adding 55). */
function vatCheckDigitsOk(vat: string) {
  const d = vat.replace(/^GB/, '').split('').map(Number)
  if (d.length !== 9) return false
  const sum = d.slice(0, 7).reduce((s, n, i) => s + n * (8 - i), 0) + d[7]! * 10 + d[8]!
  return sum % 97 === 0 || (sum + 55) % 97 === 0
}

describe('the demo data', () => {
  it('gives the demo builder a VAT number of its own, well formed', () => {
    const builder = DEMO_CUSTOMERS.find(c => c.kind === 'builder') as { vatNumber: string }
    expect(builder.vatNumber).not.toBe(DEMO_FIRM.vatNumber)
    for (const vat of [builder.vatNumber, DEMO_FIRM.vatNumber]) expect(vatCheckDigitsOk(vat), vat).toBe(true)
    // and the check can fail: a digit changed
    expect(vatCheckDigitsOk('GB999999874')).toBe(false)
  })

  it('gives the demo firms an invented bank account that passes the checks, and the firm\'s own references', () => {
    for (const f of [DEMO_FIRM, SECOND_FIRM]) {
      expect(f.takesTransfer).toBe(true)
      expect(hasBankAccount(f), f.tradingName).toBe(true)
      expect(sortCodeProblem(f.bankSortCode)).toBeNull()
      expect(accountNumberProblem(f.bankAccountNumber)).toBeNull()
      expect(f.bankAccountName).toBe(f.tradingName)
    }
    expect(DEMO_FIRM).toMatchObject({ referenceLetters: 'BP', invoicePrefix: 'BP-', creditNotePrefix: 'BP-C' })
  })
})

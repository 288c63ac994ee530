import { describe, expect, it } from 'vitest'
import { creditNotePrefixOf, firmLetters, invoicePrefixOf, invoiceReference, jobReference, quoteReference } from '../../shared/utils/references'

describe('the firm\'s letters: initials of the trading name, up to three, leaving out Ltd, and, the', () => {
  it.each([
    ['Brackenridge Plastering', 'BP'],
    ['Brackenridge Plastering Ltd', 'BP'],
    ['The Lath and Float Company Limited', 'LFC'],
    ['Lath & Float Plastering', 'LFP'],
    ['Hartley, Moss & Dunne Plastering Co.', 'HMD'],
    ['smith plastering', 'SP'],
    ['Kettlebury', 'K'],
    ['J.R. Skim-Coat 2000 PLC', 'JRS'],
    ['O\'Neill Plastering', 'ONP'],
    ['The Ltd', 'S'],
    ['', 'S'],
    ['123', 'S'],
  ])('%j -> %s', (name, letters) => {
    expect(firmLetters(name)).toBe(letters)
  })
})

describe('references people read: letters, kind, number as it is', () => {
  it.each([
    [1, 'BP-J1', 'BP-Q1', 'BP-1', 'BP-C1'],
    [42, 'BP-J42', 'BP-Q42', 'BP-42', 'BP-C42'],
    [12345, 'BP-J12345', 'BP-Q12345', 'BP-12345', 'BP-C12345'],
  ])('%i -> %s, %s, %s, %s', (n, job, quote, invoice, note) => {
    expect(jobReference('BP', n)).toBe(job)
    expect(quoteReference('BP', n)).toBe(quote)
    expect(invoiceReference(invoicePrefixOf('BP', ''), n)).toBe(invoice)
    expect(invoiceReference(creditNotePrefixOf('BP', ''), n)).toBe(note)
  })

  it('takes the firm\'s own prefix as it is', () => {
    expect(invoiceReference(invoicePrefixOf('BP', 'INV/'), 7)).toBe('INV/7')
    expect(invoiceReference(creditNotePrefixOf('BP', 'CR-'), 7)).toBe('CR-7')
  })
})

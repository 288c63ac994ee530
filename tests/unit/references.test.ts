import { describe, expect, it } from 'vitest'
import { invoiceReference, jobReference, quoteReference } from '../../shared/utils/references'

describe('references people read: four digits at least, never cut', () => {
  it.each([
    [1, 'J-0001', 'Q-0001', 'INV-0001'],
    [42, 'J-0042', 'Q-0042', 'INV-0042'],
    [9999, 'J-9999', 'Q-9999', 'INV-9999'],
    [12345, 'J-12345', 'Q-12345', 'INV-12345'],
  ])('%i -> %s, %s, %s', (n, job, quote, invoice) => {
    expect(jobReference(n)).toBe(job)
    expect(quoteReference(n)).toBe(quote)
    expect(invoiceReference('INV-', n)).toBe(invoice)
  })

  it('takes the firm\'s own prefix as it is, none at all included', () => {
    expect(invoiceReference('CN', 7)).toBe('CN0007')
    expect(invoiceReference('', 7)).toBe('0007')
  })
})

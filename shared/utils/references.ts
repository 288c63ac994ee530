// The references people read and say on the phone: a job's J-0001, a quote's Q-0001, an
// invoice's or credit note's firm prefix and four-digit number. One definition for the server, the
// pages and the demo data alike.

/** The number, at least four digits: 7 -> "0007", 12345 -> "12345". */
const fourDigits = (n: number) => String(n).padStart(4, '0')

/** A job's reference: J-0007. */
export const jobReference = (n: number) => `J-${fourDigits(n)}`

/** A quote's reference: Q-0007. */
export const quoteReference = (n: number) => `Q-${fourDigits(n)}`

/** An invoice's or credit note's reference: the firm's prefix then the number, INV-0007. */
export const invoiceReference = (prefix: string, n: number) => `${prefix}${fourDigits(n)}`

import { z } from 'zod'

// The secrets in customers' and people's links, matched whole by a strict pattern: a wrong one
// (a NUL, anything else) fails it and the route answers 404. A raw string schema is allowed here only
// (tests/unit/schema-fields.test.ts names these lines).

/** A public enquiry form's key (/f/<key>). */
export const formKeyParam = z.object({ key: z.string().regex(/^[0-9a-f]{32}$/, { error: 'Not found.' }) })

/** A customer's quote link (/q/<token>). */
export const quoteTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,60}$/, { error: 'Not found.' }) })

/** A customer's invoice link (/i/<token>). */
export const invoiceTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,60}$/, { error: 'Not found.' }) })

/** A person's calendar feed (/calendar/<token>.ics). */
export const calendarTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,60}\.ics$/, { error: 'Not found.' }) })

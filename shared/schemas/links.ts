import { z } from 'zod'

// The secrets in customers' and people's links, matched whole by a strict pattern: a wrong one
// (a NUL, anything else) fails it and the route answers 404. A raw string schema is allowed here only
// (tests/unit/schema-fields.test.ts names these lines).

/** A public enquiry form's key (/enquire/<key>): the firm's part (22), then the key (32 hex); or the key alone, as links made before 2026-12. */
export const formKeyParam = z.object({ key: z.string().regex(/^(?:[\w-]{22})?[0-9a-f]{32}$/, { error: 'Not found.' }) })

/** A customer's quote link (/q/<token>): the firm's part (22) then the secret (43), or the secret alone (older links). */
export const quoteTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,70}$/, { error: 'Not found.' }) })

/** A customer's invoice link (/i/<token>). */
export const invoiceTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,70}$/, { error: 'Not found.' }) })

/** A person's calendar feed (/calendar/<token>.ics). */
export const calendarTokenParam = z.object({ token: z.string().regex(/^[\w-]{40,70}\.ics$/, { error: 'Not found.' }) })

import { and, eq } from 'drizzle-orm'
import { firms } from '../db/schema'

/**
 * The firm behind a public enquiry form link, inside a transaction: only that firm is visible
 * (app.enquiry_form_key), then the transaction is scoped to it. 404 for an unknown or reset link.
 */
export function firmByFormKey(tx: Tx, key: string) {
  return withSecretLink(tx, {
    setting: 'app.enquiry_form_key',
    secret: key,
    hashed: false, // the firm resets the key to end the link; it is not a password
    secretLength: FORM_KEY_LENGTH,
    find: async (tx, key, firmId) => {
      const found = await tx.select({ id: firms.id, tradingName: firms.tradingName, email: firms.email, phone: firms.phone })
        .from(firms).where(and(eq(firms.enquiryFormKey, key), inLinkFirm(firms.id, firmId)))
      return found.map(firm => ({ ...firm, firmId: firm.id }))
    },
    open: async (_f, { firmId: _, ...firm }) => firm,
    gone: notFound,
  })
}

import { z } from 'zod'
import { eq, sql } from 'drizzle-orm'
import { firms } from '../db/schema'

export const formKeyParam = z.object({ key: z.string().regex(/^[0-9a-f]{32}$/, { error: 'Not found.' }) })

/**
 * The firm behind a public enquiry form link, inside a transaction: only that firm is visible
 * (app.enquiry_form_key), then the transaction is scoped to it. 404 for an unknown or reset link.
 */
export async function firmByFormKey(tx: Tx, key: string) {
  await tx.execute(sql`select set_config('app.enquiry_form_key', ${key}, true)`)
  const [firm] = await tx.select({ id: firms.id, tradingName: firms.tradingName, email: firms.email, phone: firms.phone })
    .from(firms).where(eq(firms.enquiryFormKey, key))
  if (!firm) notFound()
  await scopeTransaction(tx, firm.id, null)
  return firm
}

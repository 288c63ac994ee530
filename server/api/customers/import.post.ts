import { customers } from '../../db/schema'
import { checkImportBatch, customerImportBatchSchema, type CustomerImportResult } from '#shared/utils/customer-import'

/**
 * One batch of an import (the page sends a file's rows 200 at a time). Each row is checked with
 * customerSchema on its own: a bad row is answered with its index and a message per field, and
 * never stops the good ones. The good rows are written in one transaction; a row whose import key
 * (e-mail, or name and postcode) the firm already has is skipped, so re-running a file writes
 * nothing new. One audit entry per batch.
 */
export default defineEventHandler(async (event): Promise<CustomerImportResult> => {
  const auth = await requireAuth(event, 'ledger:write')
  const { rows } = await readBodyWith(event, customerImportBatchSchema)
  const { valid, rejected } = checkImportBatch(rows)
  return withFirm(auth, async (f) => {
    const written = valid.length
      ? await f.tx.insert(customers)
          .values(valid.map(v => f.values({ ...v.customer, importKey: v.key })))
          .onConflictDoNothing({ target: [customers.firmId, customers.importKey] })
          .returning({ id: customers.id })
      : []
    const created = written.length
    const skipped = valid.length - created
    await f.audit('customers.imported', 'customer', null, { created, skipped, rejected: rejected.length })
    return { created, skipped, rejected }
  })
})

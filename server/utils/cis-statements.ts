// Contractors' monthly CIS statements, as recorded by the office (with the PDF or photo of the
// statement as a document). One per contractor and tax month: a second is a 409.
import { and, asc, desc, eq, gte, lte } from 'drizzle-orm'
import { cisStatements, customers } from '../db/schema'
import type { FirmScope } from './db'

/** The contractor must be the firm's customer paying under CIS (another firm's id reads as missing). */
export async function checkContractor(f: FirmScope, customerId: string) {
  const [c] = await f.tx.select({ id: customers.id, paysUnderCis: customers.paysUnderCis }).from(customers).where(f.where(customers, eq(customers.id, customerId)))
  if (!c) throw fieldError({ customerId: 'Choose one of your customers.' })
  if (!c.paysUnderCis) throw fieldError({ customerId: 'This customer is not set up as paying under CIS: change that on the customer first.' })
}

export function duplicateStatement(): never {
  throw createError({ statusCode: 409, statusMessage: 'Statement already recorded', data: { fields: { taxMonthStart: 'A statement for this contractor and tax month is already recorded: change that one.' } } })
}

export async function cisStatementDetail(f: FirmScope, id: string) {
  const s = await findOr404(f, cisStatements, id)
  const [c] = await f.tx.select({ name: customers.name }).from(customers).where(f.where(customers, eq(customers.id, s.customerId)))
  return { ...s, customerName: c?.name ?? '', documents: await documentsOf(f, { cisStatementId: id }) }
}

export async function listCisStatements(f: FirmScope, q: { from?: string, to?: string, customerId?: string }) {
  return f.tx.select({
    id: cisStatements.id, customerId: cisStatements.customerId, customerName: customers.name, taxMonthStart: cisStatements.taxMonthStart,
    grossPence: cisStatements.grossPence, materialsPence: cisStatements.materialsPence, deductionPence: cisStatements.deductionPence,
    reference: cisStatements.reference, notes: cisStatements.notes,
  })
    .from(cisStatements).innerJoin(customers, and(eq(customers.firmId, cisStatements.firmId), eq(customers.id, cisStatements.customerId)))
    .where(f.where(cisStatements, q.from ? gte(cisStatements.taxMonthStart, q.from) : undefined, q.to ? lte(cisStatements.taxMonthStart, q.to) : undefined, q.customerId ? eq(cisStatements.customerId, q.customerId) : undefined))
    .orderBy(desc(cisStatements.taxMonthStart), asc(customers.name)).limit(1000)
}

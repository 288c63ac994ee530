import { asc, count, desc, eq, like } from 'drizzle-orm'
import { customers } from '../../db/schema'
import { customerListQuery } from '#shared/schemas/customer'

const ORDER = {
  'name': [asc(customers.name), asc(customers.id)],
  '-name': [desc(customers.name), desc(customers.id)],
  'created': [asc(customers.createdAt), asc(customers.id)],
  '-created': [desc(customers.createdAt), desc(customers.id)],
  'postcode': [asc(customers.billingPostcode), asc(customers.name)],
  '-postcode': [desc(customers.billingPostcode), asc(customers.name)],
} as const

/** Escape LIKE wildcards in what was typed. */
const likeEscape = (s: string) => s.replace(/[\\%_]/g, ch => `\\${ch}`)

/**
 * Customers, searched by name, e-mail, postcode or phone (a trigram index on search_text keeps it
 * fast at tens of thousands per firm), paged and sorted.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'customers:read')
  const { q, page, pageSize, sort, cis } = await readQueryWith(event, customerListQuery)
  const needle = q.toLowerCase()
  // phone numbers are matched on their digits, postcodes without spaces
  const digits = needle.replace(/[\s()+-]/g, '')
  const term = /^\d{3,}$/.test(digits) ? digits : needle.replace(/\s+/g, /^[a-z]{1,2}\d/.test(needle) ? '' : ' ')
  return withFirm(auth, async (f) => {
    const where = f.where(customers, term ? like(customers.searchText, `%${likeEscape(term)}%`) : undefined, cis ? eq(customers.paysUnderCis, true) : undefined)
    const [total] = await f.tx.select({ n: count() }).from(customers).where(where)
    const rows = await f.tx.select({
      id: customers.id,
      kind: customers.kind,
      name: customers.name,
      email: customers.email,
      phone: customers.phone,
      billingTown: customers.billingTown,
      billingPostcode: customers.billingPostcode,
      createdAt: customers.createdAt,
    }).from(customers).where(where).orderBy(...ORDER[sort]).limit(pageSize).offset((page - 1) * pageSize)
    return { rows, total: total?.n ?? 0, page, pageSize, sort, q }
  })
})

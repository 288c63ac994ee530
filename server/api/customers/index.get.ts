import { asc, count, desc, eq, inArray, like, sql } from 'drizzle-orm'
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

/** Without a search, the count stops this many pages after the page asked for (a busy firm has tens of thousands). */
const COUNT_PAGES_AHEAD = 10

/**
 * Customers, searched by name, e-mail, postcode or phone (a trigram index on search_text keeps it
 * fast at tens of thousands per firm), paged and sorted, in one statement. `hasMore`: a row
 * follows this page. `total`: how many match, counted in the same statement: every match when
 * searching (a search sorts all its matches anyway), else at most to ten pages beyond this one,
 * with `totalAtLeast` when there are more (counting all of a busy firm's customers on every
 * page cost more than the page itself: npm run bench).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'customers:read')
  const { q, page, pageSize, sort, cis } = await readQueryWith(event, customerListQuery)
  const needle = q.toLowerCase()
  // phone numbers are matched on their digits, postcodes without spaces
  const digits = needle.replace(/[\s()+-]/g, '')
  const term = /^\d{3,}$/.test(digits) ? digits : needle.replace(/\s+/g, /^[a-z]{1,2}\d/.test(needle) ? '' : ' ')
  const offset = (page - 1) * pageSize
  const cap = offset + pageSize * (COUNT_PAGES_AHEAD + 1)
  return withFirm(auth, async (f) => {
    const where = f.where(customers, term ? like(customers.searchText, `%${likeEscape(term)}%`) : undefined, cis ? eq(customers.paysUnderCis, true) : undefined)
    const counted = term
      ? sql<number>`(count(*) over ())::int`
      : sql<number>`(select count(*) from (select 1 from ${customers} where ${where} limit ${cap + 1}) c)::int`
    // without a search, the page's ids are found first, from the index alone (customers_firm_name_idx
    // holds name and id), and only those rows are read: a deep page skips its offset in the index
    const onPage = term
      ? where
      : f.where(customers, inArray(customers.id,
          f.tx.select({ id: customers.id }).from(customers).where(where).orderBy(...ORDER[sort]).limit(pageSize + 1).offset(offset)))
    const found = await f.tx.select({
      id: customers.id,
      kind: customers.kind,
      name: customers.name,
      email: customers.email,
      phone: customers.phone,
      billingTown: customers.billingTown,
      billingPostcode: customers.billingPostcode,
      createdAt: customers.createdAt,
      counted,
    }).from(customers).where(onPage).orderBy(...ORDER[sort]).limit(pageSize + 1).offset(term ? offset : 0)
    // past the last page no row carries the count: count on its own (rare)
    const n = found[0]?.counted ?? (await f.tx.select({ n: count() }).from(sql`(select 1 from ${customers} where ${where} limit ${cap + 1}) c`))[0]?.n ?? 0
    const rows = found.slice(0, pageSize).map(({ counted: _c, ...r }) => r)
    const capped = !term && n > cap
    return { rows, total: capped ? cap : n, totalAtLeast: capped, hasMore: found.length > pageSize, page, pageSize, sort, q }
  })
})

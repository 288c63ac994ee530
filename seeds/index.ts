// npm run db:seed: the demo firm, once, and every firm's missing defaults (server/db/firm-defaults.ts) each time. Runs outside Nitro as the owner role; row-level security
// still applies (FORCE), so every firm write sets app.firm_id first, as the server does.
import { randomUUID } from 'node:crypto'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { eq, sql } from 'drizzle-orm'
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import * as schema from '../server/db/schema'
import { firmLetters, jobReference } from '../shared/utils/references'
import { DEMO_CUSTOMERS, DEMO_ENQUIRIES, DEMO_FIRM, DEMO_PEOPLE, DEMO_PRICE_BOOK, SECOND_FIRM } from './demo'
import { seedVisit } from './visit'
import { seedJob } from './job'
import { seedInvoices } from './invoices'
import { seedQuarter } from './quarter'
import { RECENT_INVOICES, seedRecent } from './recent'
import { DEMO_BANK_ACCOUNT, DEMO_STATEMENT_PATH, writeDemoStatement } from './statement'
import { DEFAULT_MATERIALS, defaultMaterialRow } from '../shared/utils/materials'
import { addDefaultsToEveryFirm } from '../server/db/firm-defaults'

// the same scrypt driver and defaults nuxt-auth-utils uses, so the server verifies these hashes
const hash = new Hash(new Scrypt({}))

export async function seed(url: string): Promise<'seeded' | 'already'> {
  const pool = new pg.Pool({ connectionString: url, max: 1 })
  const db = drizzle({ client: pool, schema, casing: 'snake_case' })
  try {
    const [existing] = await db.select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, DEMO_PEOPLE[0]!.email))
    if (!existing) await seedDemo(db)
    // every firm gets what it is missing of the defaults (firms made before they were written at sign-up)
    await addDefaultsToEveryFirm(db)
    return existing ? 'already' : 'seeded'
  }
  finally {
    await pool.end()
  }
}

/** The invented demo firm, its people and a quarter of its work, and the second firm the accountant serves. */
async function seedDemo(db: NodePgDatabase<typeof schema>) {
  await db.transaction(async (tx) => {
    const userIds: Record<string, string> = {}
    for (const p of [...DEMO_PEOPLE, { key: 'second-owner', ...SECOND_FIRM.owner }]) {
      const [u] = await tx.insert(schema.users).values({ email: p.email, name: p.name, passwordHash: await hash.make(p.password) }).returning({ id: schema.users.id })
      userIds[p.key] = u!.id
    }
    const firmId = randomUUID()
    await tx.execute(sql`select set_config('app.firm_id', ${firmId}, true)`)
    await tx.insert(schema.firms).values({ id: firmId, ...DEMO_FIRM })
    for (const p of DEMO_PEOPLE) await tx.insert(schema.memberships).values({ firmId, userId: userIds[p.key]!, role: p.role })
    await tx.insert(schema.auditLog).values({ firmId, actorUserId: userIds.owner, action: 'firm.created', entity: 'firm', entityId: firmId, detail: { seeded: true } })

    await tx.insert(schema.priceBooks).values({ firmId, ...DEMO_PRICE_BOOK })
    // the generic catalogue (coverage from DOMAIN.md; prices invented for the demo)
    for (const m of DEFAULT_MATERIALS) await tx.insert(schema.materials).values({ firmId, ...defaultMaterialRow(m) })

    // customers, sites and enquiries, each with its history
    const customerIds: Record<string, { id: string, sites: string[] }> = {}
    for (const { key, sites, ...c } of DEMO_CUSTOMERS) {
      const [row] = await tx.insert(schema.customers).values({ firmId, ...c }).returning({ id: schema.customers.id })
      const siteIds: string[] = []
      for (const site of sites) {
        const [s] = await tx.insert(schema.sites).values({ firmId, customerId: row!.id, ...site }).returning({ id: schema.sites.id })
        siteIds.push(s!.id)
      }
      customerIds[key] = { id: row!.id, sites: siteIds }
    }
    const path = { 'new': [], 'visit-booked': ['visit-booked'], 'quoted': ['visit-booked', 'quoted'], 'won': ['visit-booked', 'quoted', 'won'], 'lost': ['lost'] } as const
    let bookedEnquiry: { id: string, customerId: string, siteId: string } | null = null
    for (const { customer, site, status, lostReason, ...e } of DEMO_ENQUIRIES as (typeof DEMO_ENQUIRIES[number] & { lostReason?: string })[]) {
      const c = customerIds[customer]!
      const [row] = await tx.insert(schema.enquiries).values({ firmId, customerId: c.id, siteId: c.sites[site]!, status, lostReason: lostReason ?? null, ...e }).returning({ id: schema.enquiries.id })
      let from: typeof status | null = null
      for (const to of ['new', ...path[status]] as const) {
        await tx.insert(schema.enquiryEvents).values({ firmId, enquiryId: row!.id, fromStatus: from, toStatus: to, reason: to === 'lost' ? lostReason ?? null : null, byUserId: e.source === 'web-form' && to === 'new' ? null : userIds.office })
        from = to
      }
      if (status === 'visit-booked') bookedEnquiry = { id: row!.id, customerId: c.id, siteId: c.sites[site]! }
    }
    if (bookedEnquiry) await seedVisit(tx, { firmId, ...bookedEnquiry, visitorUserId: userIds.owner! })
    const millbeck = customerIds.millbeck!
    const pribbleworth = customerIds.pribbleworth!
    // last quarter first, so job and invoice numbers follow the dates
    const quarter = await seedQuarter(tx, { firmId, prefix: DEMO_FIRM.invoicePrefix, termsDays: DEMO_FIRM.paymentTermsDays, people: { ownerId: userIds.owner!, officeId: userIds.office!, crewId: userIds.crew! }, pribbleworth: pribbleworth.id })
    const job = await seedJob(tx, { firmId, customerId: millbeck.id, siteId: millbeck.sites[1]!, ownerId: userIds.owner!, officeId: userIds.office!, crewId: userIds.crew!, number: quarter.jobs + 1 })
    // numbered as they were issued: the builder's overdue invoice, the last six weeks' (seeds/recent.ts), then the deposit
    const overdueNumber = quarter.invoices + 1
    await seedInvoices(tx, {
      firmId, prefix: DEMO_FIRM.invoicePrefix, termsDays: DEMO_FIRM.paymentTermsDays, officeId: userIds.office!, firstNumber: overdueNumber, depositNumber: overdueNumber + RECENT_INVOICES.length + 1,
      job: { id: job.jobId, reference: jobReference(firmLetters(DEMO_FIRM.tradingName), quarter.jobs + 1), customerId: millbeck.id, siteId: millbeck.sites[1]!, labourNetPence: job.labourNetPence, materialsNetPence: job.materialsNetPence },
      builder: { id: pribbleworth.id, siteId: pribbleworth.sites[0]! },
    })
    await seedRecent(tx, { firmId, prefix: DEMO_FIRM.invoicePrefix, termsDays: DEMO_FIRM.paymentTermsDays, officeId: userIds.office!, firstNumber: overdueNumber + 1 })
    // its bank account, empty: the statement the seed writes (seeds/statement.ts) is there to import
    await tx.insert(schema.bankAccounts).values({ firmId, name: DEMO_BANK_ACCOUNT })

    // the second firm has no invoices, payments or purchases: no bank account or statement to import
    const secondId = randomUUID()
    const { owner: _o, ...second } = SECOND_FIRM
    await tx.execute(sql`select set_config('app.firm_id', ${secondId}, true)`)
    await tx.insert(schema.firms).values({ id: secondId, ...second })
    await tx.insert(schema.memberships).values({ firmId: secondId, userId: userIds['second-owner']!, role: 'owner' })
    await tx.insert(schema.memberships).values({ firmId: secondId, userId: userIds.accountant!, role: 'accountant' })
  })
}

const isMain = process.argv[1] && import.meta.url.endsWith(process.argv[1].replace(/^.*\/seeds\//, '/seeds/'))
if (isMain) {
  const url = process.env.NUXT_DATABASE_OWNER_URL
  if (!url) {
    console.error('NUXT_DATABASE_OWNER_URL is not set (npm start sets it)')
    process.exit(1)
  }
  const result = await seed(url)
  console.log(result === 'seeded' ? '[seed] demo firm created' : '[seed] demo firm already there')
  // the demo firm's bank statement, from what the seed wrote (the same file for the same database,
  // whenever it is written); the test run writes its own elsewhere (SETWELL_DEMO_STATEMENT_PATH)
  try {
    const written = await writeDemoStatement(url, process.env.SETWELL_DEMO_STATEMENT_PATH || DEMO_STATEMENT_PATH)
    console.log(`[seed] the demo firm's bank statement (${written.lines} lines) to import into "${DEMO_BANK_ACCOUNT}": ${written.path}`)
  }
  catch (err) {
    console.log(`[seed] no demo bank statement written: ${(err as Error).message}`)
  }
}

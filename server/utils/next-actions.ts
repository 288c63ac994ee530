// Today, worked out by the server in one request (GET /api/today): the next actions for the owner
// and the office, each list chosen, limited and counted in SQL (a window count, so the rows beyond
// the first few are never loaded), from indexes (drizzle/0030_today_next_actions.sql adds the ones the
// lists lacked); crew's day; the accountant's firms. The words are shared/utils/next-actions.ts.
import { and, asc, eq, gte, isNull, lt, lte, ne, or, sql, type SQLWrapper } from 'drizzle-orm'
import {
  bankAccounts, bankLines, chaseNotes, customers, documents, enquiries, firms, invitations, invoices, jobDays, jobs, memberships, purchases,
  quotes, quoteVersions, rooms, setLogs, sites, users, visits,
} from '../db/schema'
import type { FirmScope } from './db'
import { owing } from './invoices'
import { brokenPromiseActions } from './promises'
import type { Role } from '#shared/utils/roles'
import { addDays } from '#shared/utils/dates'
import { cisTaxMonth, vatQuarter } from '#shared/utils/periods'
import { jobReference, quoteReference } from '#shared/utils/references'
import {
  ACTIONS_PER_KIND, DEFAULT_QUOTE_CHASE_DAYS, RECEIPT_LOOKBACK_DAYS, SET_LOG_LOOKBACK_DAYS,
  bankLinesAction, cisReturnAction, dayNoSetAction, enquiryAction, invoiceOverdueAction, jobNotInvoicedAction, onceEach, promiseOverOverdue,
  purchaseNoReceiptAction, quoteNotBookedAction, quoteUnansweredAction, setupActions, sortActions,
  vatReturnAction, visitNotMarkedAction, visitNotWrittenUpAction,
  type MoneySummary, type NextAction, type NextActionKind, type OnSiteJob, type ServedFirm, type ServedQuarter, type TodayView, type VisitToCome,
} from '#shared/utils/next-actions'

/** How many rows of a list there are in all: counted by the database beside the few it sends. */
const total = sql<number>`(count(*) over ())::int`
/** A count of another query as a column of this one (one statement, not two). */
const countOf = (query: SQLWrapper) => sql<number>`(${query})::int`
/** A visit is looked at for writing up this long after it was done. */
export const WRITE_UP_LOOKBACK_DAYS = 90

interface Who { role: Role, userId: string }
/** One list: its rows turned into actions, and how many there are in all. */
interface Listed { actions: NextAction[], total: number }
type Source = (f: FirmScope, today: string, who: Who) => Promise<Listed>

const listed = <T extends { total: number }>(rows: T[], make: (r: T) => NextAction): Listed =>
  ({ actions: rows.map(make), total: rows[0]?.total ?? 0 })

const place = (line1: string | null, postcode: string | null) => [line1, postcode].filter(Boolean).join(', ')

// ---------------------------------------------------------------------------------------------
// The lists

/** New enquiries not yet answered (enquiries_status_idx). */
const newEnquiries: Source = async (f, today) => listed(await f.tx.select({
  id: enquiries.id, createdAt: enquiries.createdAt, description: enquiries.description, customer: customers.name, phone: customers.phone, total,
}).from(enquiries)
  .innerJoin(customers, and(eq(customers.firmId, enquiries.firmId), eq(customers.id, enquiries.customerId)))
  .where(f.where(enquiries, eq(enquiries.status, 'new')))
  .orderBy(asc(enquiries.createdAt), asc(enquiries.id)).limit(ACTIONS_PER_KIND), r => enquiryAction(r, today))

/** Visits whose time is over and that are still booked: neither marked done nor moved (visits_booked_idx). Crew: their own. */
const visitsNotMarked: Source = async (f, today, who) => listed(await f.tx.select({
  id: visits.id, startsAt: visits.startsAt, customer: customers.name, line1: sites.line1, postcode: sites.postcode, total,
}).from(visits)
  .innerJoin(customers, and(eq(customers.firmId, visits.firmId), eq(customers.id, visits.customerId)))
  .innerJoin(sites, and(eq(sites.firmId, visits.firmId), eq(sites.id, visits.siteId)))
  .where(f.where(visits, eq(visits.status, 'booked'), lt(visits.startsAt, sql`now()`),
    sql`${visits.startsAt} + make_interval(mins => ${visits.durationMinutes}) < now()`,
    who.role === 'crew' ? eq(visits.visitorUserId, who.userId) : undefined))
  .orderBy(asc(visits.startsAt), asc(visits.id)).limit(ACTIONS_PER_KIND),
r => visitNotMarkedAction({ ...r, place: place(r.line1, r.postcode) }, today))

/** Visits done with no quote made from them, unless their enquiry was lost or won since (visits_done_idx, quotes_visit_idx). */
const visitsNotWrittenUp: Source = async (f, today) => listed(await f.tx.select({
  id: visits.id, doneAt: sql<string>`coalesce(${visits.doneAt}, ${visits.startsAt})`, customer: customers.name,
  rooms: sql<number>`(select count(*) from ${rooms} r where r.firm_id = ${visits.firmId} and r.visit_id = ${visits.id})::int`, total,
}).from(visits)
  .innerJoin(customers, and(eq(customers.firmId, visits.firmId), eq(customers.id, visits.customerId)))
  .where(f.where(visits, eq(visits.status, 'done'), gte(visits.doneAt, sql`now() - make_interval(days => ${WRITE_UP_LOOKBACK_DAYS})`),
    sql`not exists (select 1 from ${quotes} q where q.firm_id = ${visits.firmId} and q.visit_id = ${visits.id})`,
    sql`not exists (select 1 from ${enquiries} e where e.firm_id = ${visits.firmId} and e.id = ${visits.enquiryId} and e.status in ('lost', 'won'))`))
  .orderBy(asc(visits.doneAt), asc(visits.id)).limit(ACTIONS_PER_KIND), r => visitNotWrittenUpAction(r, today))

const currentVersion = and(eq(quoteVersions.firmId, quotes.firmId), eq(quoteVersions.quoteId, quotes.id), eq(quoteVersions.version, quotes.currentVersion))

/** Quotes sent and unanswered after the firm's chase interval (quote_versions_open_idx). */
function quotesUnanswered(chaseDays: number): Source {
  return async (f, today) => {
    const letters = await referenceLettersOf(f)
    return listed(await f.tx.select({
      id: quotes.id, number: quotes.number, sentAt: quoteVersions.sentAt, customer: customers.name,
      grossPence: sql<number>`coalesce((${quoteVersions.totals}->>'grossPence')::int, 0)`, total,
    }).from(quoteVersions)
      .innerJoin(quotes, currentVersion)
      .innerJoin(customers, and(eq(customers.firmId, quotes.firmId), eq(customers.id, quotes.customerId)))
      .where(f.where(quoteVersions, eq(quoteVersions.status, 'sent'), lt(quoteVersions.sentAt, sql`now() - make_interval(days => ${chaseDays})`)))
      .orderBy(asc(quoteVersions.sentAt), asc(quotes.id)).limit(ACTIONS_PER_KIND),
    r => quoteUnansweredAction({ ...r, sentAt: r.sentAt!, reference: quoteReference(letters, r.number) }, today))
  }
}

/** Accepted quotes with no job yet, or whose job has no day booked (quote_versions_open_idx, jobs_quote_unique). */
const quotesNotBooked: Source = async (f, today) => {
  const letters = await referenceLettersOf(f)
  return listed(await f.tx.select({
    id: quotes.id, number: quotes.number, acceptedAt: sql<string>`coalesce(${quoteVersions.respondedAt}, ${quoteVersions.updatedAt})`,
    customer: customers.name, jobId: jobs.id, jobNumber: jobs.number, total,
  }).from(quoteVersions)
    .innerJoin(quotes, currentVersion)
    .innerJoin(customers, and(eq(customers.firmId, quotes.firmId), eq(customers.id, quotes.customerId)))
    .leftJoin(jobs, and(eq(jobs.firmId, quotes.firmId), eq(jobs.quoteId, quotes.id)))
    .where(f.where(quoteVersions, eq(quoteVersions.status, 'accepted'), or(isNull(jobs.id), and(eq(jobs.status, 'booked'),
      sql`not exists (select 1 from ${jobDays} d where d.firm_id = ${jobs.firmId} and d.job_id = ${jobs.id})`))))
    .orderBy(asc(quoteVersions.respondedAt), asc(quotes.id)).limit(ACTIONS_PER_KIND),
  r => quoteNotBookedAction({ ...r, reference: quoteReference(letters, r.number), jobReference: r.jobNumber === null ? null : jobReference(letters, r.jobNumber) }, today))
}

/**
 * Jobs finished and not invoiced in full (jobs_finished_idx): since they were marked finished.
 * The oldest five and how many are found from the jobs alone; when each was finished and what is
 * invoiced on it are read for those five only (worked out for every finished job, a busy firm's
 * Today cost 80 to 130 ms here: npm run bench).
 */
const jobsNotInvoiced: Source = async (f, today) => {
  const letters = await referenceLettersOf(f)
  const first = f.tx.select({ id: jobs.id, total: sql<number>`(count(*) over ())::int`.as('total') }).from(jobs)
    .where(f.where(jobs, sql`${jobs.finished}`))
    .orderBy(asc(jobs.updatedAt), asc(jobs.id)).limit(ACTIONS_PER_KIND).as('first')
  return listed(await f.tx.select({
    id: jobs.id, number: jobs.number, customer: customers.name, grossPence: jobs.grossPence,
    finishedAt: sql<string>`coalesce((select max(c.changed_at) from job_status_changes c where c.firm_id = ${jobs.firmId} and c.job_id = ${jobs.id} and c.to_status = 'finished'), ${jobs.updatedAt})`,
    invoicedPence: sql<number>`(select coalesce(sum(i.amount_due_pence), 0) from ${invoices} i where i.firm_id = ${jobs.firmId} and i.job_id = ${jobs.id} and i.issued_on is not null and i.kind <> 'credit-note')::int`,
    total: first.total,
  }).from(first)
    .innerJoin(jobs, and(eq(jobs.firmId, f.firmId), eq(jobs.id, first.id)))
    .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
    .orderBy(asc(jobs.updatedAt), asc(jobs.id)),
  r => jobNotInvoicedAction({ ...r, reference: jobReference(letters, r.number) }, today))
}

/** Invoices past their due date with something still to pay (invoices_owing_idx). Paid: gone at once. */
const invoicesOverdue: Source = async (f, today) => listed(await f.tx.select({
  id: invoices.id, reference: invoices.reference, dueOn: invoices.dueOn, customer: customers.name,
  outstandingPence: sql<number>`(${invoices.amountDuePence} - ${invoices.settledPence})::int`, total,
}).from(invoices)
  .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
  .where(owing(f, lt(invoices.dueOn, today),
    // a customer who promised to pay by today or later is left until that day has passed
    sql`not exists (select 1 from ${chaseNotes} c where c.firm_id = ${invoices.firmId} and c.invoice_id = ${invoices.id} and c.promised_on >= ${today})`))
  .orderBy(asc(invoices.dueOn), asc(invoices.number)).limit(ACTIONS_PER_KIND),
r => invoiceOverdueAction({ ...r, reference: r.reference ?? '', dueOn: r.dueOn! }, today))

/**
 * Days booked in the last two weeks (before today) on which no set was logged on the job: one
 * action per job and day, with everyone who was on it (job_days_firm_day_idx, set_logs_job_idx).
 * Crew: the days they were on.
 */
const daysNoSetLogged: Source = async (f, today, who) => {
  const letters = await referenceLettersOf(f)
  const rows = await f.tx.select({
    jobId: jobDays.jobId, day: jobDays.day, number: jobs.number, customer: customers.name,
    people: sql<string[]>`array_agg(distinct ${users.name} order by ${users.name})`, total,
  }).from(jobDays)
    .innerJoin(jobs, and(eq(jobs.firmId, jobDays.firmId), eq(jobs.id, jobDays.jobId)))
    .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
    .innerJoin(users, eq(users.id, jobDays.userId))
    .where(f.where(jobDays, gte(jobDays.day, addDays(today, -SET_LOG_LOOKBACK_DAYS)), lt(jobDays.day, today), ne(jobs.status, 'cancelled'),
      who.role === 'crew' ? eq(jobDays.userId, who.userId) : undefined,
      sql`not exists (select 1 from ${setLogs} s where s.firm_id = ${jobDays.firmId} and s.job_id = ${jobDays.jobId} and s.kind = 'set'
        and (coalesce(s.started_at, s.created_at) at time zone 'Europe/London')::date = ${jobDays.day}::date)`))
    .groupBy(jobDays.jobId, jobDays.day, jobs.number, customers.name)
    .orderBy(asc(jobDays.day), asc(jobs.number)).limit(ACTIONS_PER_KIND)
  return listed(rows, r => dayNoSetAction({ ...r, reference: jobReference(letters, r.number) }, today))
}

/** Purchases of the last three months with no receipt kept (purchases_firm_date_idx, documents_purchase_idx). */
const purchasesNoReceipt: Source = async (f, today) => listed(await f.tx.select({
  id: purchases.id, supplier: purchases.supplier, boughtOn: purchases.boughtOn,
  grossPence: sql<number>`(${purchases.netPence} + ${purchases.vatPence})::int`, total,
}).from(purchases)
  .where(f.where(purchases, gte(purchases.boughtOn, addDays(today, -RECEIPT_LOOKBACK_DAYS)), lte(purchases.boughtOn, today),
    sql`not exists (select 1 from ${documents} d where d.firm_id = ${purchases.firmId} and d.purchase_id = ${purchases.id})`))
  .orderBy(asc(purchases.boughtOn), asc(purchases.id)).limit(ACTIONS_PER_KIND), r => purchaseNoReceiptAction(r, today))

/** Each bank account's statement lines still to match, counted (bank_lines_open_idx). */
const bankLinesOpen: Source = async (f, today) => listed(await f.tx.select({
  accountId: bankLines.accountId, account: bankAccounts.name, open: sql<number>`count(*)::int`, oldest: sql<string>`min(${bankLines.postedOn})::text`, total,
}).from(bankLines)
  .innerJoin(bankAccounts, and(eq(bankAccounts.firmId, bankLines.firmId), eq(bankAccounts.id, bankLines.accountId)))
  .where(f.where(bankLines, eq(bankLines.state, 'open')))
  .groupBy(bankLines.accountId, bankAccounts.name)
  .orderBy(sql`min(${bankLines.postedOn})`, asc(bankLines.accountId)).limit(ACTIONS_PER_KIND), r => bankLinesAction(r, today))

/**
 * Where broken promises to pay join the list: `brokenPromiseActions(f, today)` from
 * server/utils/promises.ts. Each answers its actions; the first five are shown, the rest counted.
 */
export const PROMISE_SOURCES: ((f: FirmScope, today: string) => Promise<NextAction[]>)[] = [brokenPromiseActions]
const promiseSource = (s: (f: FirmScope, today: string) => Promise<NextAction[]>): Source => async (f, today) => {
  const all = await s(f, today)
  return { actions: all.slice(0, ACTIONS_PER_KIND), total: all.length }
}

// ---------------------------------------------------------------------------------------------
// The firm: its tax dates and what is missing from its set-up

interface FirmFacts { createdAt: Date, quoteChaseDays: number, vatRegistered: boolean, vatStagger: 1 | 2 | 3, cisStatus: string, dayRatePence: number, hasAddress: boolean, hasPhoneOrEmail: boolean, bankMissing: boolean }

async function firmFacts(f: FirmScope): Promise<FirmFacts> {
  const [firm] = await f.tx.select({
    createdAt: firms.createdAt, quoteChaseDays: firms.quoteChaseDays, vatRegistered: firms.vatRegistered, vatStagger: firms.vatStagger, cisStatus: firms.cisStatus, dayRatePence: firms.dayRatePence,
    hasAddress: sql<boolean>`${firms.addressLine1} <> '' and ${firms.postcode} <> ''`,
    hasPhoneOrEmail: sql<boolean>`${firms.phone} <> '' or ${firms.email} <> ''`,
    bankMissing: sql<boolean>`${firms.takesTransfer} and (${firms.bankAccountName} = '' or ${firms.bankSortCode} = '' or ${firms.bankAccountNumber} = '')`,
  }).from(firms).where(eq(firms.id, f.firmId))
  return firm!
}

/** The VAT return of the quarter just ended, for a VAT-registered firm only. */
function vatDue(firm: FirmFacts, today: string): NextAction[] {
  if (!firm.vatRegistered) return []
  const last = vatQuarter(addDays(vatQuarter(today, firm.vatStagger).start, -1), firm.vatStagger)
  const a = vatReturnAction(last, today)
  return a ? [a] : []
}

/** The CIS monthly return, for a firm registered for CIS that paid labour to others in the tax month just ended. */
async function cisDue(f: FirmScope, firm: FirmFacts, today: string): Promise<NextAction[]> {
  if (firm.cisStatus === 'not-registered') return []
  const last = cisTaxMonth(addDays(cisTaxMonth(today).start, -1))
  const action = cisReturnAction(last, today)
  if (!action) return []
  const [paid] = await f.tx.select({ one: sql<number>`1` }).from(purchases)
    .where(f.where(purchases, eq(purchases.category, 'labour'), gte(purchases.boughtOn, last.start), lte(purchases.boughtOn, last.end))).limit(1)
  return paid ? [action] : []
}

/** The roles the firm has someone in, or has invited someone to (an invitation still open). */
async function rolesIn(f: FirmScope): Promise<string[]> {
  const rows = await f.tx.selectDistinct({ role: memberships.role }).from(memberships).where(f.where(memberships))
    .union(f.tx.selectDistinct({ role: invitations.role }).from(invitations)
      .where(f.where(invitations, isNull(invitations.acceptedAt), isNull(invitations.revokedAt), sql`${invitations.expiresAt} > now()`)))
  return rows.map(r => r.role)
}

// ---------------------------------------------------------------------------------------------
// Today's work: the jobs on site (once each, with their people) and the visits to come

async function onSiteToday(f: FirmScope, today: string, who: Who): Promise<OnSiteJob[]> {
  const letters = await referenceLettersOf(f)
  const rows = await f.tx.select({
    jobId: jobDays.jobId, number: jobs.number, customer: customers.name, line1: sites.line1, postcode: sites.postcode,
    people: sql<{ name: string, halfDay: boolean }[]>`json_agg(json_build_object('name', ${users.name}, 'halfDay', ${jobDays.portion} = 'half-day') order by ${users.name})`,
    setsLoggedToday: sql<number>`(select count(*) from ${setLogs} s where s.firm_id = ${jobDays.firmId} and s.job_id = ${jobDays.jobId} and s.kind = 'set'
      and (coalesce(s.started_at, s.created_at) at time zone 'Europe/London')::date = ${today}::date)::int`,
  }).from(jobDays)
    .innerJoin(jobs, and(eq(jobs.firmId, jobDays.firmId), eq(jobs.id, jobDays.jobId)))
    .innerJoin(customers, and(eq(customers.firmId, jobs.firmId), eq(customers.id, jobs.customerId)))
    .leftJoin(sites, and(eq(sites.firmId, jobs.firmId), eq(sites.id, jobs.siteId)))
    .innerJoin(users, eq(users.id, jobDays.userId))
    .where(f.where(jobDays, eq(jobDays.day, today), ne(jobs.status, 'cancelled'),
      who.role === 'crew' ? sql`exists (select 1 from ${jobDays} mine where mine.firm_id = ${jobDays.firmId} and mine.job_id = ${jobDays.jobId} and mine.day = ${today} and mine.user_id = ${who.userId})` : undefined))
    .groupBy(jobDays.firmId, jobDays.jobId, jobs.number, customers.name, sites.line1, sites.postcode)
    .orderBy(asc(jobs.number))
  return rows.map(r => ({ jobId: r.jobId, reference: jobReference(letters, r.number), customer: r.customer, place: place(r.line1, r.postcode), people: r.people, setsLoggedToday: r.setsLoggedToday }))
}

/** The next booked visits not yet over, soonest first (visits_booked_idx). A visit gone by is a next action instead. */
async function visitsToCome(f: FirmScope, who: Who): Promise<VisitToCome[]> {
  const rows = await f.tx.select({
    id: visits.id, startsAt: visits.startsAt, customer: customers.name, line1: sites.line1, postcode: sites.postcode, visitor: users.name,
  }).from(visits)
    .innerJoin(customers, and(eq(customers.firmId, visits.firmId), eq(customers.id, visits.customerId)))
    .innerJoin(sites, and(eq(sites.firmId, visits.firmId), eq(sites.id, visits.siteId)))
    .leftJoin(users, eq(users.id, visits.visitorUserId))
    .where(f.where(visits, eq(visits.status, 'booked'), sql`${visits.startsAt} + make_interval(mins => ${visits.durationMinutes}) >= now()`,
      who.role === 'crew' ? eq(visits.visitorUserId, who.userId) : undefined))
    .orderBy(asc(visits.startsAt), asc(visits.id)).limit(ACTIONS_PER_KIND)
  return rows.map(r => ({ id: r.id, startsAt: r.startsAt.toISOString(), customer: r.customer, place: place(r.line1, r.postcode), visitor: r.visitor }))
}

/** What is owed in all and how many quotes wait for an answer (the owing index; the open quotes index). */
async function moneySummary(f: FirmScope, today: string): Promise<MoneySummary> {
  // one statement: the quotes waiting counted beside the sums
  const waiting = f.tx.select({ n: sql<number>`count(*)` }).from(quoteVersions).innerJoin(quotes, currentVersion)
    .where(f.where(quoteVersions, eq(quoteVersions.status, 'sent')))
  const [owed] = await f.tx.select({
    owedPence: sql<number>`coalesce(sum(${invoices.amountDuePence} - ${invoices.settledPence}), 0)::bigint::text`,
    overduePence: sql<number>`coalesce(sum(${invoices.amountDuePence} - ${invoices.settledPence}) filter (where ${invoices.dueOn} < ${today}), 0)::bigint::text`,
    quotesWaiting: countOf(waiting),
  }).from(invoices)
    .where(owing(f))
  return { owedPence: Number(owed?.owedPence ?? 0), overduePence: Number(owed?.overduePence ?? 0), quotesWaiting: owed?.quotesWaiting ?? 0 }
}

// ---------------------------------------------------------------------------------------------
// The accountant: every firm they serve, with the quarter's dates

async function firmsServed(f: FirmScope, today: string, userId: string): Promise<ServedFirm[]> {
  // the firms table shows a person every firm they belong to (firms_visible): names and tax settings only
  const rows = await f.tx.select({ firmId: firms.id, tradingName: firms.tradingName, vatRegistered: firms.vatRegistered, vatStagger: firms.vatStagger })
    .from(memberships).innerJoin(firms, eq(firms.id, memberships.firmId))
    .where(and(eq(memberships.userId, userId), eq(memberships.role, 'accountant')))
    .orderBy(asc(firms.tradingName))
  const served: ServedFirm[] = []
  for (const r of rows) {
    const current = r.firmId === f.firmId
    const quarter = async (q: { start: string, end: string, returnDue: string }): Promise<ServedQuarter> => {
      // a firm that is not VAT-registered has no return to make: no due date, no boxes
      if (!r.vatRegistered) return { start: q.start, end: q.end, returnDue: null, vat: null }
      // the boxes for the firm on screen only: another firm's figures are read in that firm
      const v = current ? await vatSummary(f, { ...q, isQuarter: true }) : null
      return { ...q, vat: v ? { box5: v.boxes[5], box6: v.boxes[6], toPay: v.toPay } : null }
    }
    const now = vatQuarter(today, r.vatStagger)
    served.push({
      firmId: r.firmId, tradingName: r.tradingName, current, vatRegistered: r.vatRegistered,
      lastQuarter: await quarter(vatQuarter(addDays(now.start, -1), r.vatStagger)),
      thisQuarter: await quarter(now),
    })
  }
  return served
}

// ---------------------------------------------------------------------------------------------
// The whole of Today for one person

/** Which lists each role is given. */
export const LISTS_BY_ROLE: Record<Role, readonly NextActionKind[]> = {
  owner: ['promise-broken', 'invoice-overdue', 'enquiry-new', 'visit-not-marked', 'quote-not-booked', 'job-not-invoiced', 'vat-return-due', 'cis-return-due', 'quote-unanswered', 'visit-not-written-up', 'day-no-set-logged', 'purchase-no-receipt', 'setup-missing', 'bank-lines-open'],
  office: ['promise-broken', 'invoice-overdue', 'bank-lines-open', 'enquiry-new', 'visit-not-marked', 'quote-not-booked', 'job-not-invoiced', 'vat-return-due', 'cis-return-due', 'quote-unanswered', 'visit-not-written-up', 'day-no-set-logged', 'purchase-no-receipt'],
  crew: ['visit-not-marked', 'day-no-set-logged'],
  accountant: [],
}

export async function todayFor(f: FirmScope, who: Who, today: string): Promise<TodayView> {
  const wants = new Set(LISTS_BY_ROLE[who.role])
  const firm = await firmFacts(f)
  const sources: [NextActionKind, Source][] = [
    ['enquiry-new', newEnquiries],
    ['visit-not-marked', visitsNotMarked],
    ['visit-not-written-up', visitsNotWrittenUp],
    ['quote-unanswered', quotesUnanswered(firm.quoteChaseDays || DEFAULT_QUOTE_CHASE_DAYS)],
    ['quote-not-booked', quotesNotBooked],
    ['job-not-invoiced', jobsNotInvoiced],
    ['invoice-overdue', invoicesOverdue],
    ['day-no-set-logged', daysNoSetLogged],
    ['purchase-no-receipt', purchasesNoReceipt],
    ['bank-lines-open', bankLinesOpen],
    ...PROMISE_SOURCES.map(s => ['promise-broken', promiseSource(s)] as [NextActionKind, Source]),
  ]
  // one transaction, so the statements run one after another on its connection
  const more: Partial<Record<NextActionKind, number>> = {}
  const actions: NextAction[] = []
  for (const [kind, source] of sources) {
    if (!wants.has(kind)) continue
    const got = await source(f, today, who)
    actions.push(...got.actions)
    const beyond = got.total - got.actions.length
    if (beyond > 0) more[kind] = (more[kind] ?? 0) + beyond
  }
  if (wants.has('vat-return-due')) actions.push(...vatDue(firm, today))
  if (wants.has('cis-return-due')) actions.push(...await cisDue(f, firm, today))
  if (wants.has('setup-missing')) {
    actions.push(...setupActions({
      createdAt: firm.createdAt, hasAddress: firm.hasAddress, hasPhoneOrEmail: firm.hasPhoneOrEmail, bankMissing: firm.bankMissing,
      dayRateSet: firm.dayRatePence > 0, rolesIn: await rolesIn(f),
    }, today))
  }
  const seesWork = who.role !== 'accountant'
  return {
    today,
    role: who.role,
    actions: sortActions(promiseOverOverdue(onceEach(actions))),
    more,
    onSite: seesWork ? await onSiteToday(f, today, who) : [],
    visits: seesWork ? await visitsToCome(f, who) : [],
    money: who.role === 'owner' || who.role === 'office' ? await moneySummary(f, today) : null,
    firms: who.role === 'accountant' ? await firmsServed(f, today, who.userId) : [],
  }
}

// A firm's day (issue 19): the requests a small plastering firm makes in a working day, from the
// three journeys (the plasterer on a phone, the office at a desk, the accountant now and then),
// written below as data; then that mix, spread over many firms, sent at rising fixed rates until
// p95 passes 300 ms. What one 2-core server sustains, divided by what one firm asks of it in its
// busiest hour, is how many firms the server carries. Called by scripts/bench.ts (the server is
// already running against the bench's cluster, with its busy firm seeded).
//
// What a page costs: a page opened in the browser's address bar (or fetched by the service
// worker to keep it for no signal) is rendered by the server, which calls the page's API routes
// in-process (GET /api/me and the page's own data); a page reached by a link inside the app is
// drawn by the phone, which asks only for the page's data (its useFetch calls). Scripts, styles
// and fonts are precached by the service worker and hashed: after the first visit they cost the
// server nothing, and they are not in the mix.
//
// Left out, and why: photo uploads (each a phone photo of several megabytes, decoded and
// re-encoded twice by sharp on the server: a different kind of load, of CPU and upload bandwidth,
// that would need real photos in the bench; not measured here), the rooms of a visit saved as
// they are measured (each save is
// checked against the room's revision, so sends to one room must go one at a time: a paced
// open-loop load cannot honour that), quotes drafted and sent, invoices drafted and issued (mail
// and PDF work), sign-in (a password hash by design slow, a few a week per person).
import { randomUUID } from 'node:crypto'
import http from 'node:http'
import { performance } from 'node:perf_hooks'
import pg from 'pg'
import { DEMO_PEOPLE } from '../../seeds/demo'

// ---------------------------------------------------------------------------------------------
// The model: a firm's working day

export type Who = 'plasterer' | 'office' | 'accountant'
/** One request. `path` has {placeholders} filled in per firm (see fill()); `page`: a server-rendered page. */
export interface Call { method: 'GET' | 'POST', path: string, page?: boolean, body?: (ids: Filled) => Record<string, unknown> }
/** Something a person does, how many times a firm does it in a working day, and the requests it makes. */
export interface Step { who: Who, what: string, perDay: number, calls: Call[] }

/** A firm's working day: 8 hours, the busiest of them carrying a quarter of the day (twice the average hour). */
export const WORKING_HOURS = 8
export const BUSIEST_HOUR_SHARE = 0.25

const get = (path: string, page = false): Call => ({ method: 'GET', path, ...(page ? { page } : {}) })
/** The page of a job opened in the app: the job (its set plan, days, log), the team (to book days), and the photos of each set logged (one request per entry: PhotoPicker). */
const jobPage = (job: string): Call[] => [get(`/api/jobs/${job}`), get('/api/members'), ...[0, 1, 2, 3].map(i => get(`/api/photos?setLogId={${job.slice(1, -1)}.log${i}}`))]
/** What app/utils/offline-cache.ts asks the service worker to keep (shared/utils/offline-plan.ts), for someone booked on two jobs this week and one visit. */
const keepForPlasterer: Call[] = [
  get('/api/diary?from={today}&to={week}'), get('/api/visits?limit=200'),
  get('/', true), get('/api/me'), get('/api/today'),
  ...['{job1}', '{job2}'].flatMap(j => [get(`/jobs/${j}`, true), get(`/jobs/${j}/sheet`, true), get(`/api/jobs/${j}`), get(`/jobs/${j}/log`, true)]),
  get('/visits/{visit}', true), get('/api/visits/{visit}'), get('/api/visits/{visit}/rooms'),
]

export const FIRM_DAY: Step[] = [
  // the plasterer (the owner, on site, on a phone): Today, the jobs on and their set plans, sets logged as they are done, a visit
  { who: 'plasterer', what: 'opens Setwell: Today, rendered by the server', perDay: 4, calls: [get('/', true)] },
  { who: 'plasterer', what: 'back to Today inside the app', perDay: 4, calls: [get('/api/today')] },
  // startOffline(): on opening if an hour has passed, and hourly while on screen; a phone is looked at about
  // hourly over a 9-hour day, and an hour has not always quite passed: about 5 a day (it was 6, every 15 minutes)
  { who: 'plasterer', what: 'the phone keeps the week for no signal (service worker)', perDay: 5, calls: keepForPlasterer },
  { who: 'plasterer', what: 'opens a job and its set plan', perDay: 6, calls: jobPage('{job1}') },
  { who: 'plasterer', what: 'the day sheet', perDay: 2, calls: [get('/api/jobs/{job1}')] },
  {
    who: 'plasterer', what: 'logs a set (the log page, then the entry)', perDay: 4, calls: [get('/api/jobs/{job1}'), {
      method: 'POST', path: '/api/jobs/{job1}/logs',
      body: ids => ({ kind: 'set', setNumber: ids.job1.setNumber, coat: 'second', surfaceIds: [ids.job1.surfaceId], notes: 'Bench set: skimmed, good suction.', clientId: randomUUID() }),
    }],
  },
  { who: 'plasterer', what: 'the diary', perDay: 1, calls: [get('/api/diary?from={today}&to={week}')] },
  { who: 'plasterer', what: 'a visit to measure: the list, the visit, its rooms and photos', perDay: 1, calls: [get('/api/visits?show=to-do'), get('/api/visits/{visit}'), get('/api/visits/{visit}/rooms'), get('/api/photos?visitId={visit}')] },
  { who: 'plasterer', what: 'the quotes', perDay: 1, calls: [get('/api/quotes')] },

  // the office (at a desk, Setwell open all day): Today, invoices, payments, what is owed, chasing
  { who: 'office', what: 'opens Setwell in the morning: Today, rendered by the server', perDay: 1, calls: [get('/', true)] },
  // open and on screen for 8 hours: a keep every hour (it was 16, every 15 minutes: every 30 in practice); the
  // office is booked on no job and visits no one, so it keeps Today
  { who: 'office', what: 'the browser keeps Today for no signal (service worker)', perDay: 8, calls: [get('/api/diary?from={today}&to={week}'), get('/api/visits?limit=200'), get('/', true), get('/api/me'), get('/api/today')] },
  { who: 'office', what: 'back to Today inside the app', perDay: 8, calls: [get('/api/today')] },
  { who: 'office', what: 'the invoice list', perDay: 6, calls: [get('/api/invoices?pageSize=50')] },
  { who: 'office', what: 'an invoice', perDay: 12, calls: [get('/api/invoices/{invoice}')] },
  {
    who: 'office', what: 'records a payment (the invoice, then the payment)', perDay: 3, calls: [get('/api/invoices/{owed}'), {
      method: 'POST', path: '/api/invoices/{owed}/payments',
      body: ids => ({ method: 'transfer', amountPence: 500, receivedOn: ids.today, reference: 'Bench transfer', requestId: randomUUID() }),
    }],
  },
  { who: 'office', what: 'what is owed', perDay: 3, calls: [get('/api/owed')] },
  {
    who: 'office', what: 'chases: a call logged on an invoice', perDay: 3, calls: [get('/api/invoices/{owed}'), {
      method: 'POST', path: '/api/invoices/{owed}/chase-notes',
      body: () => ({ kind: 'call', outcome: 'no-reply', note: 'Bench call: left a message.' }),
    }],
  },
  { who: 'office', what: 'customers: the list and one customer', perDay: 4, calls: [get('/api/customers?q=&page=1&sort=name&pageSize=25'), get('/api/customers/{customer}')] },
  { who: 'office', what: 'the jobs and one job', perDay: 3, calls: [get('/api/jobs?pageSize=50'), ...jobPage('{job3}')] },
  { who: 'office', what: 'the diary', perDay: 2, calls: [get('/api/diary?from={today}&to={week}')] },

  // the accountant (serves many firms: a firm's books about once a week, exports about once a month)
  { who: 'accountant', what: 'opens Setwell: Today, rendered by the server', perDay: 0.2, calls: [get('/', true)] },
  { who: 'accountant', what: 'the browser keeps Today for no signal (service worker)', perDay: 0.2, calls: [get('/', true), get('/api/me'), get('/api/today')] },
  { who: 'accountant', what: 'the quarter: the VAT return', perDay: 0.2, calls: [get('/api/firm'), get('/api/vat-return?quarterOf={today}')] },
  { who: 'accountant', what: 'profit by job over the year', perDay: 0.1, calls: [get('/api/profit?from={yearAgo}&to={today}')] },
  { who: 'accountant', what: 'invoices and what is owed', perDay: 0.2, calls: [get('/api/invoices?pageSize=50'), get('/api/owed')] },
  { who: 'accountant', what: 'exports the quarter (invoices and payments CSV)', perDay: 0.05, calls: [get('/exports/invoices.csv?quarterOf={today}'), get('/exports/payments.csv?quarterOf={today}')] },
]

/** Each request of the day with its share of all of them. */
export function dayMix(steps: Step[] = FIRM_DAY) {
  const perDay = steps.reduce((n, s) => n + s.perDay * s.calls.length, 0)
  const requests = steps.flatMap(s => s.calls.map(call => ({ step: s, call, perDay: s.perDay, share: s.perDay / perDay })))
  const busyHour = perDay * BUSIEST_HOUR_SHARE
  return { perDay, busyHour, busyHourRps: busyHour / 3600, pages: requests.filter(r => r.call.page).reduce((n, r) => n + r.perDay, 0), requests }
}

// ---------------------------------------------------------------------------------------------
// The firms: the bench's busy firm and many small ones, seeded set-based

interface LiveJob { id: string, logs: string[], surfaceId: string, setNumber: number }
interface Firm { id: string, cookies: Record<Who, string>, jobs: LiveJob[], visit: string, invoices: string[], owed: string[], customers: string[] }
interface Filled { today: string, job1: LiveJob, job2: LiveJob, job3: LiveJob }

export interface FirmDayContext {
  url: string
  /** The cluster's superuser on the app's database: the seed writes every firm in one statement, which row-level security (forced) would refuse a role bound to one firm. */
  superuserUrl: string
  busyFirmId: string
  add: (row: { group: string, name: string, value: number, unit: string, ratio?: number, budget?: string, met?: boolean, note?: string }) => void
}

const FIRMS = Number(process.env.SETWELL_FIRM_DAY_FIRMS ?? 200)
const STEP_SECONDS = Number(process.env.SETWELL_FIRM_DAY_SECONDS ?? 15)
const P95_LIMIT_MS = 300
const GOAL_FIRMS = 5000
/** Requests in flight at most; an arrival beyond it is counted as an error (the server is not keeping up). */
const IN_FLIGHT_CAP = 256
/** A small firm's history: about two years of a one- or two-person firm. */
const SMALL = { customers: 60, jobs: 80, invoices: 150, logsPerJob: 4 }

/** Everything set-based: each statement writes every small firm's share at once. */
export async function seedFirms(ctx: FirmDayContext) {
  const db = new pg.Client({ connectionString: ctx.superuserUrl })
  await db.connect()
  const demo = ctx.busyFirmId
  const q = (text: string, values: unknown[] = []) => db.query(text, values)
  const columnsOf = async (table: string, skip: string[]) => (await q(`select column_name from information_schema.columns where table_schema = 'public' and table_name = $1 and is_generated = 'NEVER' order by ordinal_position`, [table])).rows
    .map(r => String(r.column_name)).filter(c => !skip.includes(c))
  const t = performance.now()
  try {
    await q('begin')
    const [ownerHash] = (await q('select password_hash from users where email = $1', [DEMO_PEOPLE[0]!.email])).rows
    // the firms and their people (each signs in with the demo owner's password: one hash, copied)
    await q(`create temp table fd_firm on commit drop as select g as n, gen_random_uuid() as id, gen_random_uuid() as owner_id, gen_random_uuid() as office_id, gen_random_uuid() as accountant_id from generate_series(1, ${FIRMS}) g`)
    await q(`insert into firms (id, trading_name, town, postcode, reference_letters, payment_terms_days, vat_registered, vat_number) select id, 'Bench Plastering ' || n, 'Kettlebury', 'KB' || (1 + n % 9) || ' 1BN', 'BP', 30, true, 'GB999999973' from fd_firm`)
    await q(`insert into users (id, email, name, password_hash) select u.id, 'bench-' || u.role || '-' || f.n || '@firm-day.example.invalid', 'Bench ' || u.role || ' ' || f.n, $1
             from fd_firm f cross join lateral (values (f.owner_id, 'owner'), (f.office_id, 'office'), (f.accountant_id, 'accountant')) u(id, role)`, [ownerHash!.password_hash])
    await q(`insert into memberships (firm_id, user_id, role) select f.id, u.id, u.role::member_role
             from fd_firm f cross join lateral (values (f.owner_id, 'owner'), (f.office_id, 'office'), (f.accountant_id, 'accountant')) u(id, role)`)
    // what every firm starts with (price book, materials, reminders, Bank Rate), copied from the demo firm
    for (const table of ['price_books', 'materials', 'reminder_rules', 'bank_rates']) {
      const cols = await columnsOf(table, ['firm_id', 'id'])
      await q(`insert into ${table} (firm_id, ${cols.join(', ')}) select f.id, ${cols.map(c => `t.${c}`).join(', ')} from ${table} t cross join fd_firm f where t.firm_id = $1`, [demo])
    }
    // customers with a site each, jobs, invoices (3 lines, VAT 20%), payments (one in five invoices half paid: owed), set logs
    await q(`insert into customers (firm_id, kind, name, email, phone, billing_line1, billing_town, billing_postcode)
             select f.id, (array['homeowner','landlord','builder','business'])[1 + g % 4]::customer_kind, 'Bench customer ' || g, 'bench' || g || '@example.invalid',
                    '07700 ' || lpad(g::text, 6, '0'), g || ' Bench Street', 'Kettlebury', 'KB' || (1 + g % 9) || ' ' || (g % 10) || 'BN'
             from fd_firm f cross join generate_series(1, ${SMALL.customers}) g`)
    await q(`insert into sites (firm_id, customer_id, line1, town, postcode) select c.firm_id, c.id, 'Bench Street', 'Kettlebury', 'KB1 1BN' from customers c where c.firm_id in (select id from fd_firm)`)
    await q(`create temp table fd_customer on commit drop as select c.firm_id, c.id, s.id as site_id, row_number() over (partition by c.firm_id order by c.id) as n
             from customers c join sites s on s.firm_id = c.firm_id and s.customer_id = c.id where c.firm_id in (select id from fd_firm)`)
    await q(`insert into jobs (firm_id, number, title, customer_id, site_id, status, labour_net_pence, materials_net_pence, net_pence, gross_pence, created_by)
             select f.id, g, 'Bench job ' || g, c.id, c.site_id,
                    (array['finished','invoiced','paid','paid'])[1 + g % 4]::job_status, 90000, 15000, 105000, 126000, f.owner_id
             from fd_firm f cross join generate_series(1, ${SMALL.jobs}) g join fd_customer c on c.firm_id = f.id and c.n = 1 + g % ${SMALL.customers}`)
    await q(`create temp table fd_job on commit drop as select j.firm_id, j.id, j.customer_id, row_number() over (partition by j.firm_id order by j.number) as n from jobs j where j.firm_id in (select id from fd_firm)`)
    await q(`insert into invoices (firm_id, kind, series, number, reference, customer_id, job_id, vat, issued_on, due_on, totals, amount_due_pence, created_by)
             select f.id, 'final', 'invoice', g, 'BP-' || g, j.customer_id, j.id, 'standard', current_date - (g * 5 % 730), current_date - (g * 5 % 730) + 30,
                    jsonb_build_object('labourNetPence', 42500 + (g % 40) * 1000, 'materialsNetPence', 8000, 'netPence', 50500 + (g % 40) * 1000,
                      'vatPence', (50500 + (g % 40) * 1000) / 5, 'reverseChargeVatPence', 0, 'grossPence', (50500 + (g % 40) * 1000) * 6 / 5, 'cisDeductionPence', 0,
                      'amountDuePence', (50500 + (g % 40) * 1000) * 6 / 5),
                    (50500 + (g % 40) * 1000) * 6 / 5, f.office_id
             from fd_firm f cross join generate_series(1, ${SMALL.invoices}) g join fd_job j on j.firm_id = f.id and j.n = 1 + g % ${SMALL.jobs}`)
    await q(`insert into invoice_lines (firm_id, invoice_id, position, kind, description, quantity_x_1000, unit, unit_pence, vat_rate_percent)
             select i.firm_id, i.id, k, (array['labour','materials','labour'])[k + 1]::line_kind, (array['Skim walls and ceilings','Finish plaster and beads','Making good'])[k + 1],
                    1000, 'item', case k when 0 then 40000 + (i.number % 40) * 1000 when 1 then 8000 else 2500 end, 20
             from invoices i cross join generate_series(0, 2) k where i.firm_id in (select id from fd_firm)`)
    await q(`insert into payments (firm_id, invoice_id, method, amount_pence, received_on, reference, recorded_by)
             select i.firm_id, i.id, 'transfer', case when i.number % 5 = 1 then i.amount_due_pence / 2 else i.amount_due_pence end, i.issued_on + 7, 'Bench ' || i.number, f.office_id
             from invoices i join fd_firm f on f.id = i.firm_id`)
    await q(`insert into set_logs (firm_id, job_id, set_number, coat, notes, logged_by, started_at, ended_at)
             select j.firm_id, j.id, 1 + k, (array['fill','tight-coat','first','second'])[1 + k % 4]::log_coat, 'Bench set ' || k, f.owner_id, now() - interval '30 days', now() - interval '30 days' + interval '2 hours'
             from fd_job j join fd_firm f on f.id = j.firm_id cross join generate_series(0, ${SMALL.logsPerJob - 1}) k`)

    // the work on now, in every firm the load reaches (the busy one too): three jobs on site and a
    // visit booked for tomorrow, each with the rooms of the demo firm's measured job (a living room
    // with a chimney breast, a window, a patch and a crack), so each job has a set plan
    const [busy] = (await q(`select c.id as customer_id, s.id as site_id, (select id from users where email = $2) as owner_id, (select id from users where email = $3) as office_id
                             from customers c join sites s on s.firm_id = c.firm_id and s.customer_id = c.id where c.firm_id = $1 order by c.name limit 1`, [demo, DEMO_PEOPLE[0]!.email, DEMO_PEOPLE[1]!.email])).rows
    const [template] = (await q(`select visit_id from jobs where firm_id = $1 and visit_id is not null order by number desc limit 1`, [demo])).rows
    await q(`create temp table fd_slot on commit drop as
             select f.id as firm_id, k as slot, gen_random_uuid() as visit_id, gen_random_uuid() as job_id, c.id as customer_id, c.site_id, f.owner_id, f.office_id
             from fd_firm f cross join generate_series(1, 4) k join fd_customer c on c.firm_id = f.id and c.n = k
             union all select $1::uuid, k, gen_random_uuid(), gen_random_uuid(), $2::uuid, $3::uuid, $4::uuid, $5::uuid from generate_series(1, 4) k`, [demo, busy!.customer_id, busy!.site_id, busy!.owner_id, busy!.office_id])
    await q(`insert into visits (firm_id, id, customer_id, site_id, starts_at, duration_minutes, visitor_user_id, status, notes, done_at)
             select firm_id, visit_id, customer_id, site_id, case when slot = 4 then date_trunc('day', now()) + interval '1 day 10 hours' else now() - interval '12 days' end, 45, owner_id,
                    (case when slot = 4 then 'booked' else 'done' end)::visit_status, 'Bench visit', case when slot = 4 then null else now() - interval '12 days' end from fd_slot`)
    await q(`create temp table fd_map (tbl text, firm_id uuid, slot int, old_id uuid, new_id uuid) on commit drop`)
    await q(`insert into fd_map select 'visits', firm_id, slot, $1, visit_id from fd_slot`, [template!.visit_id])
    /** Copy the template visit's rows of `table` into every slot, new ids for old, each reference to a copied row pointed at its copy. */
    const copy = async (table: string, parent: [string, string], refs: [string, string][] = []) => {
      await q(`insert into fd_map select '${table}', p.firm_id, p.slot, t.id, gen_random_uuid() from ${table} t join fd_map p on p.tbl = '${parent[1]}' and p.old_id = t.${parent[0]} where t.firm_id = $1`, [demo])
      const all = [parent, ...refs]
      const cols = await columnsOf(table, ['firm_id', 'id', ...all.map(([c]) => c)])
      await q(`insert into ${table} (firm_id, id, ${all.map(([c]) => c).join(', ')}, ${cols.join(', ')})
               select m.firm_id, m.new_id, ${all.map((_, i) => `r${i}.new_id`).join(', ')}, ${cols.map(c => `t.${c}`).join(', ')}
               from ${table} t join fd_map m on m.tbl = '${table}' and m.old_id = t.id
               ${all.map(([c, tbl], i) => `join fd_map r${i} on r${i}.tbl = '${tbl}' and r${i}.old_id = t.${c} and r${i}.firm_id = m.firm_id and r${i}.slot = m.slot`).join(' ')}
               where t.firm_id = $1`, [demo])
    }
    await copy('rooms', ['visit_id', 'visits'])
    await copy('surfaces', ['room_id', 'rooms'])
    await copy('openings', ['surface_id', 'surfaces'])
    await copy('conditions', ['surface_id', 'surfaces'])
    await copy('corners', ['room_id', 'rooms'], [['surface_a_id', 'surfaces'], ['surface_b_id', 'surfaces']])
    await q(`insert into jobs (firm_id, id, number, title, customer_id, site_id, visit_id, status, labour_net_pence, materials_net_pence, net_pence, gross_pence, plan_options, created_by)
             select firm_id, job_id, 900000 + slot, 'Bench: patch and skim the living room', customer_id, site_id, visit_id, 'in-progress', 90000, 15000, 105000, 126000,
                    '{"people": 2, "bagsPerPersonPerSet": 3, "coverageM2PerBag": 10}'::jsonb, owner_id from fd_slot where slot <= 3`)
    // the owner booked on the first two this week (the phone keeps those two); four sets logged on each
    await q(`insert into job_days (firm_id, job_id, day, user_id) select s.firm_id, s.job_id, to_char(current_date + d, 'YYYY-MM-DD'), s.owner_id
             from fd_slot s cross join generate_series(-1, 2) d where s.slot <= 2`)
    await q(`insert into set_logs (firm_id, job_id, kind, set_number, coat, surface_ids, user_ids, notes, logged_by, started_at, ended_at)
             select s.firm_id, s.job_id, 'set', 1, 'fill', jsonb_build_array(m.new_id), jsonb_build_array(s.owner_id), 'Bench set ' || k, s.owner_id, now() - interval '1 day', now() - interval '22 hours'
             from fd_slot s join fd_map m on m.tbl = 'surfaces' and m.firm_id = s.firm_id and m.slot = s.slot
             join surfaces ts on ts.firm_id = $1 and ts.id = m.old_id and ts.position = 0
             cross join generate_series(1, 4) k where s.slot <= 3`, [demo])
    await q('commit')
  }
  catch (err) {
    await q('rollback')
    throw err
  }
  finally {
    await db.end()
  }
  const vacuum = new pg.Client({ connectionString: ctx.superuserUrl })
  await vacuum.connect()
  await vacuum.query('vacuum analyze')
  await vacuum.end()
  return (performance.now() - t) / 1000
}

/** The ids the load needs, firm by firm (the busy firm's people are the demo's). */
export async function firmIds(ctx: FirmDayContext) {
  const db = new pg.Client({ connectionString: ctx.superuserUrl })
  await db.connect()
  try {
    const { rows } = await db.query(`
      select f.id,
        (select array_agg(u.email order by m.role) from memberships m join users u on u.id = m.user_id where m.firm_id = f.id and u.email like 'bench-%@firm-day.example.invalid') as emails,
        (select array_agg(j.id order by j.number) from jobs j where j.firm_id = f.id and j.number > 900000) as jobs,
        (select v.id from visits v where v.firm_id = f.id and v.notes = 'Bench visit' and v.status = 'booked' limit 1) as visit,
        (select array_agg(id) from (select id from invoices i where i.firm_id = f.id and i.issued_on is not null order by i.issued_on desc limit 20) x) as invoices,
        (select array_agg(id) from (select id from invoices i where i.firm_id = f.id and i.issued_on is not null and i.kind <> 'credit-note' and i.settled_pence < i.amount_due_pence order by i.issued_on limit 20) x) as owed,
        (select array_agg(id) from (select id from customers c where c.firm_id = f.id order by c.name limit 10) x) as customers
      from firms f where f.trading_name like 'Bench Plastering %' or f.id = $1`, [ctx.busyFirmId])
    const logs = await db.query(`select job_id, array_agg(id order by id) as ids from set_logs where job_id in (select id from jobs where number > 900000) and notes like 'Bench set %' group by job_id`)
    const logsOf = new Map(logs.rows.map(r => [String(r.job_id), r.ids as string[]]))
    return rows.map(r => ({
      id: String(r.id), emails: (r.emails ?? []) as string[], visit: String(r.visit), invoices: r.invoices as string[], owed: r.owed as string[], customers: r.customers as string[],
      jobs: (r.jobs as string[]).map(id => ({ id, logs: logsOf.get(id) ?? [] })),
    }))
  }
  finally {
    await db.end()
  }
}

// ---------------------------------------------------------------------------------------------
// Requests

function client(base: string) {
  const origin = new URL(base)
  const agent = new http.Agent({ keepAlive: true, maxSockets: IN_FLIGHT_CAP })
  return {
    agent,
    /** One request, its body read to the end; status 0 when it never got an answer. */
    send(method: string, path: string, cookie: string, body?: unknown, keepBody = false): Promise<{ status: number, setCookie?: string[], text?: string }> {
      return new Promise((resolve) => {
        const data = body === undefined ? undefined : JSON.stringify(body)
        const req = http.request({
          host: origin.hostname, port: origin.port, path, method, agent,
          headers: { origin: origin.origin, cookie, ...(data ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(data) } : {}) },
        }, (res) => {
          const chunks: Buffer[] = []
          // the body is read to the end either way; kept only when asked for, or to say why it was refused
          const keep = keepBody || (res.statusCode ?? 0) >= 400
          res.on('data', (c: Buffer) => keep && chunks.push(c))
          res.on('end', () => resolve({ status: res.statusCode ?? 0, setCookie: res.headers['set-cookie'], text: keep ? Buffer.concat(chunks).toString('utf8') : undefined }))
          res.on('error', () => resolve({ status: 0 }))
        })
        req.setTimeout(60_000, () => req.destroy(new Error('timeout')))
        req.on('error', () => resolve({ status: 0 }))
        req.end(data)
      })
    },
  }
}

/** Sign each firm's people in (a few at a time: each checks a password hash) and read what the load needs of their live jobs. */
async function prepare(ctx: FirmDayContext, http_: ReturnType<typeof client>): Promise<Firm[]> {
  const raw = await firmIds(ctx)
  const signIn = async (email: string, password: string) => {
    const res = await http_.send('POST', '/api/auth/sign-in', '', { email, password })
    if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}`)
    return (res.setCookie ?? []).map(c => c.split(';')[0]).join('; ')
  }
  const firms: Firm[] = []
  const queue = [...raw]
  const worker = async () => {
    for (let r = queue.shift(); r; r = queue.shift()) {
      const busy = r.id === ctx.busyFirmId
      const people = busy
        ? { plasterer: DEMO_PEOPLE[0]!, office: DEMO_PEOPLE[1]!, accountant: DEMO_PEOPLE[3]! }
        : { plasterer: { email: r.emails.find(e => e.startsWith('bench-owner'))!, password: DEMO_PEOPLE[0]!.password }, office: { email: r.emails.find(e => e.startsWith('bench-office'))!, password: DEMO_PEOPLE[0]!.password }, accountant: { email: r.emails.find(e => e.startsWith('bench-accountant'))!, password: DEMO_PEOPLE[0]!.password } }
      const cookies = {} as Record<Who, string>
      for (const who of ['plasterer', 'office', 'accountant'] as Who[]) cookies[who] = await signIn(people[who].email, people[who].password)
      // the demo accountant also serves a second firm: this session works in the busy one
      if (busy) await http_.send('PUT', '/api/me/firm', cookies.accountant, { firmId: r.id })
      const jobs: LiveJob[] = []
      for (const j of r.jobs) {
        const res = await http_.send('GET', `/api/jobs/${j.id}`, cookies.plasterer, undefined, true)
        const detail = JSON.parse(res.text ?? '{}') as { plan?: { plan?: { sets?: { number: number, tasks: { surfaceId: string }[] }[] } } }
        const set = detail.plan?.plan?.sets?.[0]
        if (res.status !== 200 || !set?.tasks[0]) throw new Error(`job ${j.id} answered ${res.status} with no set plan`)
        jobs.push({ id: j.id, logs: j.logs, surfaceId: set.tasks[0].surfaceId, setNumber: set.number })
      }
      firms.push({ id: r.id, cookies, jobs, visit: r.visit, invoices: r.invoices, owed: r.owed, customers: r.customers })
    }
  }
  await Promise.all([1, 2, 3, 4].map(worker))
  return firms
}

const isoDay = (offset = 0) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10)

/** The call's path for a firm: {today}, {week}, {yearAgo}, {job1..3}, {jobN.logK}, {visit}, {invoice}, {owed}, {customer}. */
function fill(call: Call, firm: Firm, rand: () => number) {
  const pick = <T>(xs: T[]) => xs[Math.floor(rand() * xs.length)]!
  const ids: Filled = { today: isoDay(), job1: firm.jobs[0]!, job2: firm.jobs[1]!, job3: firm.jobs[2]! }
  const owed = pick(firm.owed)
  const path = call.path.replace(/\{(\w+)(?:\.log(\d))?\}/g, (_, key: string, log?: string) => {
    if (key.startsWith('job')) {
      const job = ids[key as 'job1']
      return log === undefined ? job.id : job.logs[Number(log)] ?? job.logs[0]!
    }
    switch (key) {
      case 'today': return ids.today
      case 'week': return isoDay(6)
      case 'yearAgo': return isoDay(-364)
      case 'visit': return firm.visit
      case 'invoice': return pick(firm.invoices)
      case 'owed': return owed
      case 'customer': return pick(firm.customers)
      default: throw new Error(`no value for {${key}}`)
    }
  })
  return { path, body: call.body?.(ids) }
}

function mulberry(seed: number) {
  let a = seed
  return () => {
    a = (a + 0x6D2B79F5) | 0
    let t = Math.imul(a ^ (a >>> 15), 1 | a)
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296
  }
}

interface StepResult { rate: number, sent: number, done: number, p50: number, p95: number, errors: number, serverErrors: Map<string, number>, refused: Map<string, number>, byCall: Map<string, number[]>, byStep: Map<Step, number> }

/** `rate` requests a second for `seconds`, at evenly spaced moments (open loop: each one's time counts from when it was due, not from when it went). */
async function runAt(rate: number, seconds: number, firms: Firm[], http_: ReturnType<typeof client>, rand: () => number): Promise<StepResult> {
  const mix = dayMix()
  const cumulative: number[] = []
  let sum = 0
  for (const r of mix.requests) cumulative.push(sum += r.share)
  const times: number[] = []
  const result: StepResult = { rate, sent: 0, done: 0, p50: 0, p95: 0, errors: 0, serverErrors: new Map(), refused: new Map(), byCall: new Map(), byStep: new Map() }
  const total = Math.round(rate * seconds)
  const interval = 1000 / rate
  let inFlight = 0
  const pending: Promise<void>[] = []
  const start = performance.now()
  for (let i = 0; i < total; i++) {
    const due = start + i * interval
    const wait = due - performance.now()
    if (wait > 1) await new Promise(r => setTimeout(r, wait))
    const x = rand() * sum
    const { step, call } = mix.requests[Math.max(0, cumulative.findIndex(c => c >= x))]!
    const firm = firms[Math.floor(rand() * firms.length)]!
    const key = `${call.method} ${call.path}`
    result.sent++
    if (inFlight >= IN_FLIGHT_CAP) {
      result.errors++
      result.refused.set('(not sent: too many in flight)', (result.refused.get('(not sent: too many in flight)') ?? 0) + 1)
      continue
    }
    const { path, body } = fill(call, firm, rand)
    inFlight++
    pending.push(http_.send(call.method, path, firm.cookies[step.who], body).then(({ status, text }) => {
      inFlight--
      const ms = performance.now() - due
      times.push(ms)
      result.done++
      const list = result.byCall.get(key) ?? []
      list.push(ms)
      result.byCall.set(key, list)
      result.byStep.set(step, (result.byStep.get(step) ?? 0) + ms)
      if (status >= 200 && status < 300) return
      result.errors++
      const where = `${status} ${key}${status >= 400 && status < 500 && text ? ` ${text.slice(0, 160)}` : ''}`
      const into = status >= 500 || status === 0 ? result.serverErrors : result.refused
      into.set(where, (into.get(where) ?? 0) + 1)
    }))
  }
  await Promise.all(pending)
  times.sort((a, b) => a - b)
  const q = (f: number) => times[Math.min(times.length - 1, Math.floor(f * times.length))] ?? Number.NaN
  result.p50 = q(0.5)
  result.p95 = q(0.95)
  return result
}

// ---------------------------------------------------------------------------------------------

export async function firmDay(ctx: FirmDayContext) {
  const mix = dayMix()
  console.log(`\n[bench] a firm's day: ${mix.perDay.toFixed(0)} requests a working day (${mix.pages.toFixed(0)} of them pages rendered by the server), ${mix.busyHour.toFixed(0)} in its busiest hour (${(BUSIEST_HOUR_SHARE * 100).toFixed(0)}% of ${WORKING_HOURS} hours), ${mix.busyHourRps.toFixed(4)} requests/s`)
  for (const who of ['plasterer', 'office', 'accountant'] as Who[]) {
    for (const s of FIRM_DAY.filter(x => x.who === who)) {
      const n = s.perDay * s.calls.length
      console.log(`  ${who.padEnd(10)} ${String(s.perDay).padStart(4)} a day × ${String(s.calls.length).padStart(2)} = ${n.toFixed(1).padStart(5)} (${(100 * n / mix.perDay).toFixed(1).padStart(4)}%)  ${s.what}`)
    }
  }
  ctx.add({ group: 'firm day', name: 'requests a firm makes in a working day (model)', value: mix.perDay, unit: 'requests', note: `${mix.pages.toFixed(0)} server-rendered pages; writes: sets logged, payments, chase calls; ${WORKING_HOURS} h day` })
  ctx.add({ group: 'firm day', name: `a firm at its busiest hour (${(BUSIEST_HOUR_SHARE * 100).toFixed(0)}% of its day)`, value: mix.busyHour, unit: 'requests/h', note: `${mix.busyHourRps.toFixed(4)} requests/s` })
  const keep = FIRM_DAY.filter(s => s.what.includes('for no signal')).reduce((n, s) => n + s.perDay * s.calls.length, 0)
  ctx.add({ group: 'firm day', name: 'share of a firm\'s requests: kept for no signal by the service worker', value: 100 * keep / mix.perDay, unit: '%', note: `${keep.toFixed(0)} of ${mix.perDay.toFixed(0)} a day, hourly while the app is on screen` })

  const seconds = await seedFirms(ctx)
  ctx.add({ group: 'firm day', name: `seed: ${FIRMS} small firms beside the busy one, set-based`, value: seconds, unit: 's', note: `each ${SMALL.customers} customers, ${SMALL.jobs} jobs, ${SMALL.invoices} invoices, 3 jobs on site with a set plan, a visit booked` })
  const http_ = client(ctx.url)
  try {
    const t = performance.now()
    const firms = await prepare(ctx, http_)
    console.log(`[bench] ${firms.length} firms, ${firms.length * 3} people signed in, in ${((performance.now() - t) / 1000).toFixed(1)} s`)
    const rand = mulberry(19)
    // warm up: every kind of request a few times, at a low rate (not measured)
    await runAt(10, 5, firms, http_, rand)

    const results: StepResult[] = []
    const rates = [10, 15, 20, 30, 40, 50, 65, 80, 100, 125, 150, 200, 250, 300, 400, 500]
    const ok = (r: StepResult) => r.p95 < P95_LIMIT_MS && r.errors === 0
    let refined = 0
    for (let i = 0; i < rates.length; i++) {
      const rate = rates[i]!
      const r = await runAt(rate, STEP_SECONDS, firms, http_, rand)
      results.push(r)
      const fives = [...r.serverErrors].map(([k, n]) => `${n}× ${k}`).join('; ')
      const fours = [...r.refused].map(([k, n]) => `${n}× ${k}`).join('; ')
      console.log(`  ${String(rate).padStart(4)} requests/s offered: p50 ${r.p50.toFixed(1)} ms, p95 ${r.p95.toFixed(1)} ms, ${r.done}/${r.sent} answered, ${r.errors} errors${fives ? ` (server: ${fives})` : ''}${fours ? ` (refused: ${fours})` : ''}`)
      ctx.add({ group: 'firm day', name: `${rate} requests/s offered, p95`, value: r.p95, unit: 'ms', budget: `< ${P95_LIMIT_MS} ms, 0 errors`, met: r.p95 < P95_LIMIT_MS && r.errors === 0, note: `p50 ${r.p50.toFixed(1)} ms, ${r.sent} sent over ${STEP_SECONDS} s, ${r.errors} errors${fives ? ` (5xx or no answer: ${fives})` : ''}${fours ? ` (4xx: ${fours.slice(0, 300)})` : ''}` })
      // let the server finish what is queued before the next rate
      await new Promise(res => setTimeout(res, 2000))
      if (r.p95 < P95_LIMIT_MS) continue
      // past it: halfway between the last rate that held and this one (twice at most), then stop
      const below = results.filter(ok).at(-1)?.rate ?? 0
      const half = Math.round((below + rate) / 2)
      if (refined++ < 2 && below && half > below && half < rate && !rates.includes(half)) rates.splice(i + 1, rates.length, half)
      else break
    }
    const best = results.filter(ok).sort((a, b) => a.rate - b.rate).at(-1)
    const sustainable = best?.rate ?? 0
    // where the time went at the highest sustainable rate (or the first): by request, and by what the person did
    // (response time, queueing included: a proxy for the server's time while it keeps up)
    const look = best ?? results[0]!
    const costs = [...look.byCall].map(([k, ms]) => ({ k, n: ms.length, total: ms.reduce((a, b) => a + b, 0), p50: [...ms].sort((a, b) => a - b)[Math.floor(ms.length / 2)]! }))
      .sort((a, b) => b.total - a.total)
    const all = costs.reduce((a, c) => a + c.total, 0)
    console.log(`  where the time went at ${look.rate} requests/s, by request (share of all response time, count, p50):`)
    for (const c of costs.slice(0, 15)) console.log(`    ${(100 * c.total / all).toFixed(1).padStart(5)}%  ${String(c.n).padStart(5)}  ${c.p50.toFixed(1).padStart(7)} ms  ${c.k}`)
    const bySteps = FIRM_DAY.map(s => ({ s, total: look.byStep.get(s) ?? 0 })).sort((a, b) => b.total - a.total)
    console.log(`  by what the person did:`)
    for (const { s, total } of bySteps.filter(x => x.total > 0)) console.log(`    ${(100 * total / all).toFixed(1).padStart(5)}%  ${s.who.padEnd(10)} ${s.what}`)
    const pages = costs.filter(c => !c.k.startsWith('GET /api/') && !c.k.startsWith('POST') && !c.k.startsWith('GET /exports/')).reduce((a, c) => a + c.total, 0)
    const kept = bySteps.filter(x => x.s.what.includes('for no signal')).reduce((a, x) => a + x.total, 0)
    ctx.add({ group: 'firm day', name: `share of response time at ${look.rate} requests/s: pages rendered by the server`, value: 100 * pages / all, unit: '%', note: `${(100 * mix.pages / mix.perDay).toFixed(0)}% of the requests` })
    ctx.add({ group: 'firm day', name: `share of response time at ${look.rate} requests/s: kept for no signal`, value: 100 * kept / all, unit: '%', note: 'the service worker\'s keep, pages and data' })
    const firmsPerServer = sustainable / mix.busyHourRps
    ctx.add({ group: 'firm day', name: 'sustainable requests/s (p95 < 300 ms, no errors)', value: sustainable, unit: 'requests/s', note: best ? `p50 ${best.p50.toFixed(1)} ms, p95 ${best.p95.toFixed(1)} ms; rates tried ${results.map(r => r.rate).join(', ')}` : 'not even the lowest rate' })
    ctx.add({ group: 'firm day', name: 'firms per 2-core server at their busiest hour', value: firmsPerServer, unit: 'firms', budget: `>= ${GOAL_FIRMS}`, met: firmsPerServer >= GOAL_FIRMS, note: `${sustainable} requests/s × 3600 ÷ ${mix.busyHour.toFixed(1)} requests a firm's busiest hour; every firm's busiest hour at the same time` })
  }
  finally {
    http_.agent.destroy()
  }
}

// A year's bank statement of the busy firm (issue 20), imported and matched through the production
// server, as the owner. Called by scripts/bench.ts (the server is running against the bench's
// cluster, with the busy firm seeded); `npm run bench -- --only=bank` runs the seed and this alone.
//
// The statement is made here, from the busy firm's own rows, with a seeded random order so every
// run makes the same file: about 5,000 lines over the last 365 days, as a CSV with paid-in,
// paid-out and balance columns (the layout most UK banks export):
// - money in paying its real owing invoices: by reference (several spellings: "BEN-001501",
//   "BEN 1501", "ben1501"), in part by reference, by amount with the payer's name and no reference;
// - CIS: 300 invoices to builders with a 20% deduction on labour are added for the run (none of the
//   seeded invoices has one); most are paid net by reference, some the whole before the deduction;
// - card purchases: 1,000 purchases are added for the run and 600 of them paid by card within three
//   days, the supplier's name cut short as banks do; 1,000 more card payments with nothing recorded;
// - noise: wages, subcontractors, direct debits, standing orders, HMRC, bank charges, interest,
//   cash paid in, transfers to and from savings.
// Measured: the upload (POST .../statements/uploads, one transaction), and the server's memory
// growth during it (RSS from /proc, sampled every 20 ms, against its RSS at rest just before); the
// proposals for the newest 200 open lines (GET .../lines, the route's default, as the page asks);
// the proposals for the whole year (GET .../lines?limit=5000: every open line matched against every
// owing invoice and the year's purchases), with the server's memory again, and how many proposals
// name the invoice or purchase the line was made to pay (of the rest: paid by amount to another of
// the payer's invoices owed the same, or naming a reference whose invoice an earlier line's
// proposal took); then the same file again (no new lines).
// Everything added here stays in the busy firm: the full bench runs this section last.
import { readFileSync } from 'node:fs'
import { performance } from 'node:perf_hooks'
import pg from 'pg'
import { format } from 'date-fns'
import { addDays, isoDay } from '../../shared/utils/dates'
import { seeded } from '../../tests/support/plan-rooms'

export interface BankRow { group: string, name: string, value: number, unit: string, ratio?: number, budget?: string, met?: boolean, note?: string }
export interface BankContext {
  url: string
  /** The owner's session cookie. */
  cookie: string
  /** The owner role's connection string (row-level security on: each query sets the firm). */
  ownerUrl: string
  busyFirmId: string
  serverPid: number
  add: (r: BankRow) => void
}

/** The goals (issue 20): a year's import under 5 s and 100 MB of server memory; matching the year under 5 s. */
export const IMPORT_BUDGET_MS = 5000
export const IMPORT_MEMORY_BUDGET_MB = 100
export const MATCH_BUDGET_MS = 5000
/** How many lines the whole-year request asks for (the route's most). */
const YEAR_LIMIT = 5000

const SHAPE = {
  byReference: 1100, partByReference: 100, byAmountAndName: 400,
  cisInvoices: 300, cisNet: 200, cisGross: 40, moneyInNoise: 300,
  purchases: 1000, cardRecorded: 600, cardNotRecorded: 1000, moneyOutNoise: 1260,
}

// Invented names (suppliers, people, places) for the lines that are not the firm's customers.
const SUPPLIERS = ['Corley Plaster Supplies', 'Amberlow Builders Merchant', 'Tansey Fuel Stop', 'Drewmoor Tool Hire', 'Feldham Beads and Trims', 'Quillsby Timber Yard', 'Hobcross Sand and Ballast', 'Marrowby Fixings']
const CARD_ONLY = ['Pellow Cafe', 'Tansey Fuel Stop', 'Brindle Motor Factors', 'Okeham Hardware', 'Swalecliffe Parking', 'Kettlebury Snack Van', 'Ravelstone Skip Hire', 'Wrenfold Workwear']
const PEOPLE = ['T HALLORAN', 'D ORCHARD', 'M KESTEVEN', 'R BELLWOOD']

/** How a line was made to pay what it pays (for the share of proposals that name it). */
type How = 'reference' | 'part by reference' | 'amount and name' | 'CIS net' | 'CIS gross' | 'card'
interface Planned {
  date: string
  description: string
  amountPence: number
  /** What the line pays; `alike`: the payer's other invoices owed the same amount (paid by amount and name, no rule can tell them apart). */
  pays?: { how: How, invoiceId?: string, purchaseId?: string, alike?: string[] }
}
interface Owing { id: string, reference: string, name: string, outstanding: number, issued_on: string, cis: number, untouched: boolean }

async function firmQuery<T>(c: pg.Client, firmId: string, text: string, values: unknown[] = []): Promise<T[]> {
  await c.query(`select set_config('app.firm_id', $1, true)`, [firmId])
  return (await c.query(text, values)).rows as T[]
}

/** The run's own rows (CIS invoices to builders, purchases), then the busy firm's owing invoices and the year's purchases. */
async function prepare(ctx: BankContext) {
  const c = new pg.Client({ connectionString: ctx.ownerUrl })
  await c.connect()
  try {
    await c.query('begin')
    const q = <T>(text: string, values: unknown[] = []) => firmQuery<T>(c, ctx.busyFirmId, text, values)
    const [{ today, owner }] = await q<{ today: string, owner: string }>(`select current_date::text as today, (select created_by from invoices where firm_id = $1 limit 1) as owner`, [ctx.busyFirmId]) as [{ today: string, owner: string }]
    // labour 600.00 + 10.00 a step and materials 90.00, reverse-charge VAT, 20% CIS on the labour
    await q(`insert into invoices (firm_id, kind, series, number, reference, customer_id, vat, cis_rate_percent, issued_on, due_on, totals, amount_due_pence, created_by)
             select $1, 'final', 'invoice', 900000 + g, 'BEN-' || (900000 + g), b.id, 'reverse-charge', 20, current_date - 20 - (g * 330 / ${SHAPE.cisInvoices}), current_date - (g * 330 / ${SHAPE.cisInvoices}) + 10,
                    jsonb_build_object('labourNetPence', 60000 + (g % 30) * 1000, 'materialsNetPence', 9000, 'netPence', 69000 + (g % 30) * 1000, 'vatPence', 0,
                      'reverseChargeVatPence', (69000 + (g % 30) * 1000) / 5, 'grossPence', 69000 + (g % 30) * 1000, 'cisDeductionPence', (60000 + (g % 30) * 1000) / 5,
                      'amountDuePence', 69000 + (g % 30) * 1000 - (60000 + (g % 30) * 1000) / 5),
                    69000 + (g % 30) * 1000 - (60000 + (g % 30) * 1000) / 5, $2
             from generate_series(1, ${SHAPE.cisInvoices}) g
             join (select id, row_number() over (order by id) as n from customers where firm_id = $1 and kind = 'builder' and name like 'Bench customer %' limit ${SHAPE.cisInvoices}) b on b.n = g`, [ctx.busyFirmId, owner])
    await q(`insert into purchases (firm_id, supplier, bought_on, category, net_pence, vat_pence, reference, created_by)
             select $1, (array[${SUPPLIERS.map(s => `'${s}'`).join(',')}])[1 + g % ${SUPPLIERS.length}], current_date - 5 - (g * 355 / ${SHAPE.purchases}),
                    (array['materials','tools','fuel','materials'])[1 + g % 4]::purchase_category, 2000 + (g * 7919) % 60000, (2000 + (g * 7919) % 60000) / 5, 'Bench receipt ' || g, $2
             from generate_series(1, ${SHAPE.purchases}) g`, [ctx.busyFirmId, owner])
    const owing = await q<Owing>(`select i.id, i.reference, c.name, i.amount_due_pence - i.settled_pence as outstanding, i.issued_on::text, coalesce((i.totals->>'cisDeductionPence')::int, 0) as cis, i.settled_pence = 0 as untouched
                                  from invoices i join customers c on c.firm_id = i.firm_id and c.id = i.customer_id where i.firm_id = $1 and i.owing order by i.number`, [ctx.busyFirmId])
    const bought = await q<{ id: string, supplier: string, bought_on: string, gross: number }>(`select id, supplier, bought_on::text, net_pence + vat_pence as gross from purchases where firm_id = $1 and bought_on > current_date - 365 and reference like 'Bench receipt %' order by bought_on, id`, [ctx.busyFirmId])
    await q('commit')
    return { today, owing, bought }
  }
  catch (err) {
    await c.query('rollback')
    throw err
  }
  finally {
    await c.end()
  }
}

/** The year's lines (unsorted), each money-in line of an invoice and each card line of a recorded purchase saying which. */
export function planStatement(today: string, owing: readonly Owing[], bought: readonly { id: string, supplier: string, bought_on: string, gross: number }[], seed = 20) {
  const rand = seeded(seed)
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!
  const first = addDays(today, -364)
  const dayIn = (from: string, most: number) => {
    const d = addDays(from, Math.floor(rand() * most))
    return d > today ? today : d < first ? first : d
  }
  const anyDay = () => addDays(first, Math.floor(rand() * 365))
  const shuffled = <T>(xs: readonly T[]) => {
    const out = [...xs]
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(rand() * (i + 1))
      const x = out[i]!
      out[i] = out[j]!
      out[j] = x
    }
    return out
  }
  const refSpelling = (ref: string) => {
    const [letters, digits] = ref.split('-') as [string, string]
    return pick([ref, `${letters} ${Number(digits)}`, `${letters.toLowerCase()}${Number(digits)}`, `${letters}${digits}`])
  }
  const payer = (name: string) => name.toUpperCase()
  const lines: Planned[] = []
  // invoices paid at least a few days after they were issued, within the year
  const plain = shuffled(owing.filter(i => i.cis === 0 && i.issued_on < addDays(today, -3) && i.issued_on >= first))
  const cis = shuffled(owing.filter(i => i.cis > 0 && i.untouched))
  if (plain.length < SHAPE.byReference + SHAPE.partByReference + SHAPE.byAmountAndName) throw new Error(`bank bench: ${plain.length} owing invoices, too few for the statement`)
  let n = 0
  for (const i of plain.slice(n, n += SHAPE.byReference)) {
    lines.push({ date: dayIn(addDays(i.issued_on, 3), 40), description: pick([`FASTER PAYMENT ${payer(i.name)} ${refSpelling(i.reference)}`, `BGC ${refSpelling(i.reference)} ${payer(i.name)}`, `${payer(i.name)} INV ${refSpelling(i.reference)}`]), amountPence: i.outstanding, pays: { how: 'reference', invoiceId: i.id } })
  }
  for (const i of plain.slice(n, n += SHAPE.partByReference)) {
    lines.push({ date: dayIn(addDays(i.issued_on, 3), 40), description: `FASTER PAYMENT ${payer(i.name)} PART ${refSpelling(i.reference)}`, amountPence: Math.floor(i.outstanding / 2), pays: { how: 'part by reference', invoiceId: i.id } })
  }
  const sameOwed = new Map<string, string[]>()
  for (const i of owing) sameOwed.set(`${i.name}|${i.outstanding}`, [...sameOwed.get(`${i.name}|${i.outstanding}`) ?? [], i.id])
  for (const i of plain.slice(n, n += SHAPE.byAmountAndName)) {
    lines.push({ date: dayIn(addDays(i.issued_on, 3), 40), description: pick([`BGC ${payer(i.name)} PLASTERING`, `FASTER PAYMENT ${payer(i.name)}`, `${payer(i.name)} THANK YOU`]), amountPence: i.outstanding, pays: { how: 'amount and name', invoiceId: i.id, alike: sameOwed.get(`${i.name}|${i.outstanding}`)!.filter(id => id !== i.id) } })
  }
  for (const i of cis.slice(0, SHAPE.cisNet)) {
    lines.push({ date: dayIn(addDays(i.issued_on, 10), 30), description: `BACS ${payer(i.name)} CIS NET ${refSpelling(i.reference)}`, amountPence: i.outstanding, pays: { how: 'CIS net', invoiceId: i.id } })
  }
  for (const i of cis.slice(SHAPE.cisNet, SHAPE.cisNet + SHAPE.cisGross)) {
    lines.push({ date: dayIn(addDays(i.issued_on, 10), 30), description: `BACS ${payer(i.name)} ${refSpelling(i.reference)}`, amountPence: i.outstanding + i.cis, pays: { how: 'CIS gross', invoiceId: i.id } })
  }
  for (let k = 0; k < SHAPE.moneyInNoise; k++) {
    const r = rand()
    if (k < 12) lines.push({ date: addDays(first, 30 * k + 27), description: 'INTEREST PAID', amountPence: 100 + Math.floor(rand() * 900) })
    else if (r < 0.2) lines.push({ date: anyDay(), description: 'TRANSFER FROM RESERVE ACCOUNT', amountPence: 100_000 * (1 + Math.floor(rand() * 20)) })
    else if (r < 0.23) lines.push({ date: anyDay(), description: 'HMRC VAT REPAYMENT', amountPence: 50_000 + Math.floor(rand() * 400_000) })
    else lines.push({ date: anyDay(), description: `CASH DEPOSIT ${pick(['KETTLEBURY', 'OKEHAM', 'SWALECLIFFE'])} BRANCH`, amountPence: 2_000 + Math.floor(rand() * 80_000) + 1 })
  }
  // card payments: a recorded purchase (its gross, up to three days later, the name cut to 18 letters) or nothing recorded
  const card = (supplier: string, on: string) => `${pick(['CARD PAYMENT TO', 'CONTACTLESS', 'CARD PAYMENT'])} ${supplier.toUpperCase().slice(0, 18)} ON ${format(isoDay(on), 'dd MMM').toUpperCase()}`
  for (const b of shuffled(bought).slice(0, SHAPE.cardRecorded)) {
    const date = dayIn(b.bought_on, 4)
    lines.push({ date, description: card(b.supplier, b.bought_on), amountPence: -b.gross, pays: { how: 'card', purchaseId: b.id } })
  }
  for (let k = 0; k < SHAPE.cardNotRecorded; k++) {
    const date = anyDay()
    lines.push({ date, description: card(pick(CARD_ONLY), date), amountPence: -(150 + Math.floor(rand() * 12_000)) })
  }
  for (let k = 0; k < SHAPE.moneyOutNoise; k++) {
    const r = rand()
    const week = Math.floor(rand() * 52)
    if (r < 0.25) lines.push({ date: addDays(first, 7 * week + 4), description: `FPO ${PEOPLE[k % 2]} WAGES WK ${week + 1}`, amountPence: -(45_000 + Math.floor(rand() * 15_000)) })
    else if (r < 0.55) lines.push({ date: addDays(first, 7 * week + 4), description: `FPO ${PEOPLE[2 + (k % 2)]} SUBCONTRACT WK ${week + 1}`, amountPence: -(60_000 + Math.floor(rand() * 60_000)) })
    else if (r < 0.7) lines.push({ date: anyDay(), description: pick(['DD WENLOCK VAN LEASING', 'DD HARTSWELL TRADE INSURANCE', 'DD NETHERBY MOBILE', 'DD KETTLEBURY COUNCIL RATES']), amountPence: -(3_000 + Math.floor(rand() * 40_000)) })
    else if (r < 0.8) lines.push({ date: anyDay(), description: 'SO RENT UNIT 4 ASHCOMBE WAY', amountPence: -85_000 })
    else if (r < 0.85) lines.push({ date: anyDay(), description: pick(['HMRC VAT', 'HMRC PAYE CIS', 'HMRC SELF ASSESSMENT']), amountPence: -(100_000 + Math.floor(rand() * 600_000)) })
    else if (r < 0.92) lines.push({ date: anyDay(), description: 'TRANSFER TO RESERVE ACCOUNT', amountPence: -100_000 * (1 + Math.floor(rand() * 10)) })
    else lines.push({ date: anyDay(), description: pick(['ACCOUNT FEE', 'CHARGES FOR SERVICES', 'CASH WITHDRAWAL OKEHAM']), amountPence: -(500 + Math.floor(rand() * 5_000)) })
  }
  return lines
}

const pounds = (p: number) => (p / 100).toFixed(2)
const ukDate = (iso: string) => format(isoDay(iso), 'dd/MM/yyyy')

/** The CSV as a bank exports it (oldest first, a running balance), and each line's key (date, amount, balance) to what it pays. */
export function statementCsv(lines: readonly Planned[], openingPence = 2_500_000) {
  const sorted = [...lines].sort((a, b) => a.date.localeCompare(b.date))
  let balance = openingPence
  const pays = new Map<string, Planned['pays']>()
  const rows = ['Date,Description,Paid in,Paid out,Balance']
  for (const l of sorted) {
    balance += l.amountPence
    if (l.pays) pays.set(`${l.date}|${l.amountPence}|${balance}`, l.pays)
    rows.push(`${ukDate(l.date)},${l.description},${l.amountPence > 0 ? pounds(l.amountPence) : ''},${l.amountPence < 0 ? pounds(-l.amountPence) : ''},${pounds(balance)}`)
  }
  return { csv: `${rows.join('\r\n')}\r\n`, pays }
}

function rssMb(pid: number) {
  return Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))![1]) / 1024
}

/** One request, timed, with the server's RSS at rest just before and its peak during (sampled every 20 ms). */
async function measured<T>(pid: number, send: () => Promise<T>) {
  await new Promise(r => setTimeout(r, 1500))
  const restMb = rssMb(pid)
  let peakMb = restMb
  const sampler = setInterval(() => {
    peakMb = Math.max(peakMb, rssMb(pid))
  }, 20)
  const t = performance.now()
  try {
    const result = await send()
    const ms = performance.now() - t
    peakMb = Math.max(peakMb, rssMb(pid))
    return { result, ms, restMb, peakMb, growthMb: peakMb - restMb }
  }
  finally {
    clearInterval(sampler)
  }
}

interface AnsweredLine {
  id: string
  date: string
  amountPence: number
  balancePence: number | null
  proposal: null | { certainty: string, parts?: { invoiceId: string }[], match?: { kind: string, purchaseId?: string } }
}
interface LinesAnswer { lines: AnsweredLine[] }

export async function bankStatement(ctx: BankContext) {
  const { url, cookie, serverPid: pid } = ctx
  const headers = { cookie, origin: url }
  const t = performance.now()
  const { today, owing, bought } = await prepare(ctx)
  const planned = planStatement(today, owing, bought)
  const { csv, pays } = statementCsv(planned)
  const moneyIn = planned.filter(l => l.amountPence > 0).length
  console.log(`\n[bench] bank: ${planned.length} lines (${moneyIn} in, ${planned.length - moneyIn} out), ${(csv.length / 1024).toFixed(0)} KB; the firm owes on ${owing.length} invoices and recorded ${bought.length} purchases this year; made in ${((performance.now() - t) / 1000).toFixed(1)} s`)

  const made = await fetch(`${url}/api/bank-accounts`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench current account' }) })
  if (made.status !== 201) throw new Error(`POST /api/bank-accounts answered ${made.status}: ${await made.text()}`)
  const { id: accountId } = await made.json() as { id: string }
  const upload = async () => {
    const form = new FormData()
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'bench-current-account-year.csv')
    const res = await fetch(`${url}/api/bank-accounts/${accountId}/statements/uploads`, { method: 'POST', headers, body: form })
    if (res.status !== 200) throw new Error(`the upload answered ${res.status}: ${await res.text()}`)
    return await res.json() as { linesNew: number, linesAlready: number }
  }
  const getLines = async (query = '') => {
    const res = await fetch(`${url}/api/bank-accounts/${accountId}/lines${query}`, { headers })
    if (res.status !== 200) throw new Error(`GET lines${query} answered ${res.status}: ${await res.text()}`)
    return await res.json() as LinesAnswer
  }

  const imported = await measured(pid, upload)
  const kb = (csv.length / 1024).toFixed(0)
  ctx.add({ group: 'bank', name: `import a year's statement, ${planned.length} lines (CSV upload)`, value: imported.ms, unit: 'ms', budget: `< ${IMPORT_BUDGET_MS} ms`, met: imported.ms < IMPORT_BUDGET_MS && imported.result.linesNew === planned.length, note: `${imported.result.linesNew} new, ${imported.result.linesAlready} already; ${kb} KB; ${(planned.length / imported.ms * 1000).toFixed(0)} lines/s` })
  ctx.add({ group: 'bank', name: 'server memory growth during the import', value: imported.growthMb, unit: 'MB', budget: `< ${IMPORT_MEMORY_BUDGET_MB} MB`, met: imported.growthMb < IMPORT_MEMORY_BUDGET_MB, note: `at rest ${imported.restMb.toFixed(0)} MB, peak ${imported.peakMb.toFixed(0)} MB` })

  const certainties = (a: LinesAnswer) => {
    const by = new Map<string, number>()
    for (const l of a.lines) if (l.proposal) by.set(l.proposal.certainty, (by.get(l.proposal.certainty) ?? 0) + 1)
    return ['sure', 'likely', 'possible'].map(c => `${by.get(c) ?? 0} ${c}`).join(', ')
  }
  const page = await measured(pid, () => getLines())
  ctx.add({ group: 'bank', name: `proposals for the newest ${page.result.lines.length} open lines (GET lines, default)`, value: page.ms, unit: 'ms', note: `${page.result.lines.filter(l => l.proposal).length} proposed (${certainties(page.result)}); memory growth ${page.growthMb.toFixed(1)} MB` })

  const year = await measured(pid, () => getLines(`?limit=${YEAR_LIMIT}`))
  const lines = year.result.lines
  // how many proposals name what the line was made to pay, by how it was paid; of those that do not,
  // how many were paid by amount to one of the payer's alike invoices, and how many name a reference
  // whose invoice an earlier line's proposal took (proposeAll goes oldest first)
  const named = new Map<How, { right: number, of: number }>()
  const proposedFor = new Set(lines.flatMap(l => l.proposal?.parts?.map(p => p.invoiceId) ?? []))
  let alike = 0
  let taken = 0
  for (const l of lines) {
    const meant = pays.get(`${l.date}|${l.amountPence}|${l.balancePence}`)
    if (!meant) continue
    const tally = named.get(meant.how) ?? { right: 0, of: 0 }
    named.set(meant.how, tally)
    tally.of++
    if (meant.invoiceId ? l.proposal?.parts?.some(p => p.invoiceId === meant.invoiceId) : l.proposal?.match?.purchaseId === meant.purchaseId) tally.right++
    else if (meant.alike && l.proposal?.parts?.some(p => meant.alike!.includes(p.invoiceId))) alike++
    else if (meant.how !== 'amount and name' && meant.invoiceId && proposedFor.has(meant.invoiceId)) taken++
  }
  const invoices = [...named].filter(([how]) => how !== 'card').map(([, t]) => t)
  const invoiceRight = invoices.reduce((n, t) => n + t.right, 0)
  const invoiceOf = invoices.reduce((n, t) => n + t.of, 0)
  ctx.add({ group: 'bank', name: `matching the whole year: proposals for all ${lines.length} open lines (GET lines?limit=${YEAR_LIMIT})`, value: year.ms, unit: 'ms', budget: `< ${MATCH_BUDGET_MS} ms`, met: year.ms < MATCH_BUDGET_MS && lines.length === planned.length, note: `${lines.filter(l => l.proposal).length} proposed (${certainties(year.result)}); against ${owing.length} owing invoices and ${bought.length} purchases` })
  ctx.add({ group: 'bank', name: 'server memory growth while matching the year', value: year.growthMb, unit: 'MB', note: `at rest ${year.restMb.toFixed(0)} MB, peak ${year.peakMb.toFixed(0)} MB` })
  ctx.add({ group: 'bank', name: 'money in proposed to the invoice it paid', value: 100 * invoiceRight / invoiceOf, unit: '%', note: `${invoiceRight} of ${invoiceOf} lines made to pay an invoice (${[...named].filter(([how]) => how !== 'card').map(([how, t]) => `${how} ${t.right}/${t.of}`).join(', ')}); of the rest, ${alike} paid by amount to another of the payer's invoices owed the same, ${taken} naming a reference whose invoice an earlier line's proposal took; card lines to their recorded purchase: ${named.get('card')?.right ?? 0}/${named.get('card')?.of ?? 0}` })

  const again = await measured(pid, upload)
  const same = again.result.linesNew === 0 && again.result.linesAlready === planned.length
  ctx.add({ group: 'bank', name: 'the same file again', value: again.ms, unit: 'ms', budget: '0 new lines', met: same, note: `${again.result.linesNew} new, ${again.result.linesAlready} already; memory growth ${again.growthMb.toFixed(1)} MB` })
  if (!same) console.log(`[bench] bank: MISSED: the same file again added ${again.result.linesNew} lines`)
}

// Jobs on the server: finding one as the signed-in person may see it (crew: only jobs they are
// booked on), numbering, making one from an accepted quote, moving its status, and its set plan
// worked out from the visit's rooms (shared/utils/set-plan.ts).
import { and, asc, eq, exists, inArray, max, sql } from 'drizzle-orm'
import { customers, firms, jobDays, jobs, jobStatusChanges, materials, materialUses, memberships, quotes, setLogs, sites, users } from '../db/schema'
import { canMoveJob, daysWorked, JOB_STATUS_LABELS, materialsAgainstEstimate, READY_CAUTION, roomReadyToDecorate, safePlanOptions, skimCoverageM2, SYSTEM_ONLY_MOVES, type JobStatus, type LogCoat } from '#shared/utils/jobs'
import { londonDay } from '#shared/utils/dates'
import { mayChangeLog } from '#shared/utils/set-log'
import { planInputsFromRooms } from '#shared/utils/set-plan-inputs'
import { undercoatTakeoff } from '#shared/utils/materials'
import { planSets, type PlanCorner, type PlanSurface } from '#shared/utils/set-plan'
import { replan } from '#shared/utils/plan-moves'
import { invoiceTotals } from '#shared/utils/tax'
import { JOB_PRICE_FIELDS } from '#shared/schemas/job'
import type { SavedRoom } from './rooms'

export type JobRow = typeof jobs.$inferSelect

/** The job with this id, as the person may see it: crew only when booked on it. 404 otherwise. */
export async function findJob(f: FirmScope, auth: FirmContext, id: string, lock = false) {
  const crewOnly = !can(auth.role, 'jobs:read-all')
  const assigned = exists(f.tx.select({ one: sql`1` }).from(jobDays).where(and(eq(jobDays.firmId, jobs.firmId), eq(jobDays.jobId, jobs.id), eq(jobDays.userId, auth.userId))))
  return findOr404(f, jobs, id, { lock, where: crewOnly ? assigned : undefined })
}

/** The condition for the jobs a person may list. */
export function visibleJobs(f: FirmScope, auth: FirmContext) {
  if (can(auth.role, 'jobs:read-all')) return undefined
  return exists(f.tx.select({ one: sql`1` }).from(jobDays).where(and(eq(jobDays.firmId, jobs.firmId), eq(jobDays.jobId, jobs.id), eq(jobDays.userId, auth.userId))))
}

export async function nextJobNumber(f: FirmScope) {
  await f.tx.execute(sql`select 1 from firms where id = ${f.firmId} for update`)
  const [row] = await f.tx.select({ n: max(jobs.number) }).from(jobs).where(f.where(jobs))
  return (row?.n ?? 0) + 1
}

export async function recordJobStatus(f: FirmScope, jobId: string, from: JobStatus | null, to: JobStatus, reason = '') {
  await f.tx.insert(jobStatusChanges).values(f.values({ jobId, fromStatus: from, toStatus: to, reason, changedBy: f.userId }))
}

/** Move a job's status by hand and record it; 409 for a move the rules refuse. */
export async function moveJob(f: FirmScope, job: JobRow, to: JobStatus, reason: string, byHand = true) {
  if (job.status === to) return job
  if (!canMoveJob(job.status, to, byHand)) {
    throw createError({ statusCode: 409, statusMessage: 'Not a move it can make', data: { message: `A job that is ${JOB_STATUS_LABELS[job.status].toLowerCase()} cannot become ${JOB_STATUS_LABELS[to].toLowerCase()}${SYSTEM_ONLY_MOVES.includes(to) ? ' by hand: that follows from its invoices' : ''}.` } })
  }
  const [row] = await f.tx.update(jobs).set({ status: to, updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, job.id))).returning()
  await recordJobStatus(f, job.id, job.status, to, reason)
  await f.audit('job.moved', 'job', job.id, { from: job.status, to })
  return row!
}

/** Make the job of an accepted quote, in one step. 409 if the quote is not accepted or already has its job. */
export async function jobFromQuote(f: FirmScope, quoteId: string) {
  const quote = await findOr404(f, quotes, quoteId, { lock: true })
  const version = await currentVersion(f, quote)
  if (version.status !== 'accepted') throw createError({ statusCode: 409, statusMessage: 'Not accepted', data: { message: 'Only an accepted quote becomes a job.' } })
  const [already] = await f.tx.select({ id: jobs.id }).from(jobs).where(f.where(jobs, eq(jobs.quoteId, quoteId)))
  if (already) throw createError({ statusCode: 409, statusMessage: 'Already a job', data: { message: 'This quote is already a job.', jobId: already.id } })
  const totals = version.totals as Record<string, number>
  const lines = await versionLines(f, version.id)
  const description = lines.find(l => l.kind === 'labour')?.description ?? 'Plastering'
  const number = await nextJobNumber(f)
  const [job] = await f.tx.insert(jobs).values(f.values({
    number,
    title: `${quoteReference(await referenceLettersOf(f), quote.number)}: ${description}`.slice(0, 200),
    customerId: quote.customerId,
    siteId: quote.siteId,
    quoteId: quote.id,
    quoteVersionId: version.id,
    visitId: quote.visitId,
    labourNetPence: totals.labourNetPence ?? 0,
    materialsNetPence: totals.materialsNetPence ?? 0,
    netPence: totals.netPence ?? 0,
    grossPence: totals.grossPence ?? 0,
    estimatedDaysX100: version.estimatedDaysX100,
    materialsEstimate: quote.visitId ? await materialsEstimateForVisit(f, quote.visitId) : [],
    planOptions: await defaultPlanOptions(f),
    createdBy: f.userId,
  })).returning()
  await recordJobStatus(f, job!.id, null, 'booked')
  await f.audit('job.created', 'job', job!.id, { fromQuote: quote.id })
  return job!
}

export async function defaultPlanOptions(f: FirmScope) {
  const book = await usePriceBook(f)
  const finish = (await catalogue(f)).find(m => m.type === 'finish' && m.coverage.kind === 'area')
  // a bag's coverage at the skim thickness the estimates use (2 mm), never under the plan's floor
  // (0.1 m²): a tiny figure in the catalogue must not stop the job's plan (the plan warns instead)
  const coverage = (finish && finish.coverage.kind === 'area' ? skimCoverageM2(finish.coverage.m2PerPack, finish.coverage.atThicknessMm) : null) ?? 10
  return { people: 1, bagsPerPersonPerSet: book.bagsPerPersonPerSet, coverageM2PerBag: coverage }
}

/** What the room picture draws: each room's surfaces with their size, openings and findings, and the corners. */
export interface PlanPictureRoom {
  name: string
  surfaces: { id: string, kind: SavedRoom['surfaces'][number]['kind'], label: string, lengthMm: number, secondMm: number, openings: { kind: string, widthMm: number, heightMm: number, fromLeftMm: number | null, fromFloorMm: number | null }[], conditions: { kind: string, areaCm2: number | null, lengthMm: number | null, scrimmed: boolean }[] }[]
  corners: { surfaceAId: string, surfaceBId: string, kind: 'internal' | 'external', returnWidthMm: number | null, needsBead: boolean, packedOut: boolean }[]
}

const NO_PLAN = { sets: [], warnings: [] }

/** The set plan of a job: from its visit's rooms, planned, with the plasterer's moves applied and checked again. */
export async function jobPlan(f: FirmScope, job: JobRow) {
  const book = await usePriceBook(f)
  if (!job.visitId) {
    return {
      plan: NO_PLAN, planner: NO_PLAN, labels: {} as Record<string, string>, notes: ['This job has no measured visit, so there are no surfaces to plan.'],
      surfaces: [] as { id: string, label: string, roomName: string, areaM2: number }[],
      inputs: { surfaces: [] as PlanSurface[], corners: [] as PlanCorner[], options: { ...safePlanOptions(job.planOptions).options, ceilingsFirst: book.ceilingsFirst } },
      rooms: [] as PlanPictureRoom[],
    }
  }
  const rooms = await loadRooms(f, job.visitId)
  // the fill and undercoat bags from the quote's own take-off: the catalogue's undercoat at the estimate's thickness, plus the firm's waste
  const takeoff = undercoatTakeoff(await catalogue(f), { wastePercent: book.materialsWastePercent })
  const inputs = planInputsFromRooms(rooms, { cornerTrowelMm: book.cornerTrowelMm, outOfTrueToleranceMm: book.outOfTrueToleranceMm, minDeductCm2: book.minDeductCm2 }, takeoff)
  // options stored before the floor (or written by hand) are raised to it, with a warning, never a 500
  const { options: safe, warnings: optionWarnings } = safePlanOptions(job.planOptions)
  const options = { ...safe, ceilingsFirst: book.ceilingsFirst }
  const planned = planSets(inputs.surfaces, inputs.corners, options, inputs.labels)
  const planner = optionWarnings.length ? { ...planned, warnings: [...optionWarnings, ...planned.warnings] } : planned
  const plan = replan(planner, job.planMoves, { surfaces: inputs.surfaces, corners: inputs.corners, options, labels: inputs.labels })
  const roomOf = new Map<string, string>()
  for (const r of rooms) for (const s of r.surfaces) roomOf.set(s.id, r.name)
  return {
    plan,
    planner,
    labels: inputs.labels,
    notes: inputs.notes,
    surfaces: inputs.surfaces.map(s => ({ id: s.id, label: inputs.labels[s.id] ?? s.id, roomName: roomOf.get(s.id) ?? '', areaM2: s.areaM2 })),
    /** What the plan was made from, so the phone can apply a move and show its consequences at once (replan). */
    inputs: { surfaces: inputs.surfaces, corners: inputs.corners, options },
    rooms: rooms.map((r): PlanPictureRoom => ({
      name: r.name,
      surfaces: r.surfaces.map(s => ({
        id: s.id, kind: s.kind, label: s.label, lengthMm: s.lengthMm, secondMm: s.secondMm,
        openings: s.openings.map(o => ({ kind: o.kind, widthMm: o.widthMm, heightMm: o.heightMm, fromLeftMm: o.fromLeftMm ?? null, fromFloorMm: o.fromFloorMm ?? null })),
        conditions: s.conditions.map(c => ({ kind: c.kind, areaCm2: c.areaCm2 ?? null, lengthMm: c.lengthMm ?? null, scrimmed: c.scrimmed ?? false })),
      })),
      corners: r.corners.map(c => ({ surfaceAId: c.surfaceAId, surfaceBId: c.surfaceBId, kind: c.kind, returnWidthMm: c.returnWidthMm ?? null, needsBead: c.needsBead ?? false, packedOut: c.packedOut ?? false })),
    })),
  }
}

/** Everything about a job for its screen; money only for those who may see it. */
export async function jobDetail(f: FirmScope, auth: FirmContext, id: string) {
  const job = await findJob(f, auth, id)
  const money = can(auth.role, 'money:read')
  const [customer] = await f.tx.select({ id: customers.id, name: customers.name, phone: customers.phone }).from(customers).where(f.where(customers, eq(customers.id, job.customerId)))
  const [site] = job.siteId ? await f.tx.select({ line1: sites.line1, line2: sites.line2, town: sites.town, postcode: sites.postcode, accessNotes: sites.accessNotes }).from(sites).where(f.where(sites, eq(sites.id, job.siteId))) : []
  const days = await f.tx.select({ id: jobDays.id, day: jobDays.day, userId: jobDays.userId, name: users.name, portion: jobDays.portion, worked: jobDays.worked })
    .from(jobDays).innerJoin(users, eq(users.id, jobDays.userId)).where(f.where(jobDays, eq(jobDays.jobId, id))).orderBy(asc(jobDays.day), asc(users.name))
  const history = await f.tx.select({ fromStatus: jobStatusChanges.fromStatus, toStatus: jobStatusChanges.toStatus, reason: jobStatusChanges.reason, at: jobStatusChanges.changedAt, by: users.name })
    .from(jobStatusChanges).leftJoin(users, eq(users.id, jobStatusChanges.changedBy)).where(f.where(jobStatusChanges, eq(jobStatusChanges.jobId, id))).orderBy(asc(jobStatusChanges.changedAt))
  const logs = await f.tx.select().from(setLogs).where(f.where(setLogs, eq(setLogs.jobId, id))).orderBy(asc(setLogs.createdAt))
  const uses = await f.tx.select({ logId: materialUses.logId, materialId: materialUses.materialId, name: materials.name, packLabel: materials.packLabel, packsX1000: materialUses.packsX1000, costPencePerPack: materialUses.costPencePerPack })
    .from(materialUses).innerJoin(materials, and(eq(materials.firmId, materialUses.firmId), eq(materials.id, materialUses.materialId)))
    .where(f.where(materialUses, eq(materialUses.jobId, id)))
  const planned = await jobPlan(f, job)
  const book = await usePriceBook(f)
  // the plan counts bags of this material (the finish whose coverage it plans with): the log
  // form starts its bags box from the plan's bags
  const planMaterialId = (await catalogueRows(f)).find(r => r.active && r.type === 'finish' && !r.coverageMmPerPack)?.id ?? null
  const drying = { skimDays: book.drySkimDays, undercoatDays: book.dryUndercoatDays, coldOrDampExtraDays: book.dryColdOrDampExtraDays }
  const comparison = materialsAgainstEstimate(job.materialsEstimate, uses)
  const names = new Map(days.map(d => [d.userId, d.name]))
  const worked = [...daysWorked(days)].map(([userId, halves]) => ({ userId, name: names.get(userId) ?? '', halfDays: halves }))
  // ready to decorate, per room: not until every surface has its final skim coat logged; each
  // coat on the day it was done in Britain (a set finished at 00:30 BST is that day, not the one before)
  const roomNames = [...new Set(planned.surfaces.map(s => s.roomName))]
  // an entry with the plan's tasks ticked is read task by task (a skim is the surface's final coat,
  // a fill or tight coat is that, an undercoat a fill: both dry by the undercoat days); one made
  // before entries carried tasks, by its coat
  const coatLogs = logs.filter(l => l.kind === 'set' && l.coat).flatMap((l) => {
    const day = londonDay(l.endedAt ?? l.startedAt ?? l.createdAt)
    if (!l.tasks.length) return [{ day, coat: l.coat!, coldOrDamp: l.coldOrDamp, surfaceIds: l.surfaceIds, setNumber: l.setNumber }]
    return l.tasks.map(t => ({ day, coat: (t.action === 'skim' ? 'second' : t.action === 'undercoat' ? 'fill' : t.action) as LogCoat, coldOrDamp: l.coldOrDamp, surfaceIds: [t.surfaceId], setNumber: l.setNumber }))
  })
  const ready = roomNames.map((room) => {
    const ids = planned.surfaces.filter(s => s.roomName === room).map(s => s.id)
    return { room, ...roomReadyToDecorate(ids, coatLogs, planned.plan, drying) }
  })
  const jobInvoices = money
    ? (await listInvoices(f, undefined, { jobId: job.id })).map(i => ({ id: i.id, kind: i.kind, reference: i.reference, status: i.status, amountDuePence: i.amountDuePence, outstandingPence: i.outstandingPence }))
    : []
  const { labourNetPence, materialsNetPence, netPence, grossPence, materialsEstimate, ...rest } = job
  return {
    ...rest,
    reference: jobReference(await referenceLettersOf(f), job.number),
    customer: customer ?? null,
    site: site ?? null,
    days,
    history,
    plan: planned,
    planMaterialId,
    /** The firm's figures for the day's timeline (shared/utils/set-timeline.ts): rules of thumb it can change. */
    timing: { mixMinutes: book.mixMinutes, goOffMinutes: book.goOffMinutes, dayStartMinutes: book.dayStartMinutes, dayEndMinutes: book.dayEndMinutes },
    logs: logs.map(({ clientId: _c, ...l }) => ({ ...l, canChange: mayChangeLog(auth, l, job.status), materials: uses.filter(u => u.logId === l.id).map(u => ({ materialId: u.materialId, name: u.name, packLabel: u.packLabel, packsX1000: u.packsX1000, ...(money ? { costPencePerPack: u.costPencePerPack } : {}) })) })),
    worked,
    ready,
    dryingCaution: READY_CAUTION,
    materials: comparison.map(c => money ? c : { materialId: c.materialId, name: c.name, estimatedPacksX1000: c.estimatedPacksX1000, usedPacksX1000: c.usedPacksX1000, differencePacksX1000: c.differencePacksX1000 }),
    ...(money ? { money: { labourNetPence, materialsNetPence, netPence, grossPence }, invoices: jobInvoices } : {}),
  }
}

/** The people of a job's booked days, for checks: every id must be a member of the firm. */
export async function checkMembers(f: FirmScope, userIds: string[], field: string) {
  if (!userIds.length) return
  const rows = await f.tx.select({ userId: memberships.userId }).from(memberships).where(f.where(memberships, inArray(memberships.userId, [...new Set(userIds)])))
  const known = new Set(rows.map(r => r.userId))
  const missing = userIds.findIndex(u => !known.has(u))
  if (missing >= 0) throw fieldError({ [field.replace('#', String(missing))]: 'That person is not in the firm.' })
}

/** 403 naming the field when a price field is sent by someone without money:write (crew never set prices). */
export function checkPriceAllowed(auth: FirmContext, input: Partial<Record<(typeof JOB_PRICE_FIELDS)[number], number>>) {
  const sent = JOB_PRICE_FIELDS.filter(k => input[k] !== undefined)
  if (sent.length && !can(auth.role, 'money:write')) {
    throw fieldError(Object.fromEntries(sent.map(k => [k, 'Only someone who may change money can set the price of a job.'])), 403, 'Your role does not allow this')
  }
}

/**
 * A job's price from its labour and materials net of VAT: the net, and the gross with VAT as the
 * firm and customer call for (suggestedVat: 20% when the firm is registered; none when it is not,
 * or under the reverse charge, where the customer accounts for it).
 */
export async function jobPriceTotals(f: FirmScope, customerId: string, labourNetPence: number, materialsNetPence: number) {
  const [firm] = await f.tx.select({ vatRegistered: firms.vatRegistered }).from(firms).where(eq(firms.id, f.firmId))
  const [customer] = await f.tx.select({ kind: customers.kind, vatRegistered: customers.vatRegistered, paysUnderCis: customers.paysUnderCis, endUserNotified: customers.endUserNotified })
    .from(customers).where(f.where(customers, eq(customers.id, customerId)))
  const vat = firm && customer ? suggestedVat(firm, customer) : 'not-registered'
  const t = invoiceTotals([
    { kind: 'labour', quantity: 1, unitPence: labourNetPence, vatRatePercent: 20 },
    { kind: 'materials', quantity: 1, unitPence: materialsNetPence, vatRatePercent: 20 },
  ], { vat: vat === 'standard' ? 'standard' : 'not-registered', cisRatePercent: null })
  return { labourNetPence: t.labourNetPence, materialsNetPence: t.materialsNetPence, netPence: t.netPence, grossPence: t.grossPence }
}

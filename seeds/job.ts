// A demo job under way: the living room of Flat 5, 18 Tanner Street (Millbeck Lettings), measured,
// quoted and accepted, booked over three days, its sets planned from what was found, and set 1
// logged yesterday. Everything is invented for the demo.
import { randomUUID } from 'node:crypto'
import { eq } from 'drizzle-orm'
import * as schema from '../server/db/schema'
import { DEFAULT_MATERIALS, estimateMaterials } from '../shared/utils/materials'
import { draftLines } from '../shared/utils/quote-draft'
import { planInputsFromRooms } from '../shared/utils/set-plan-inputs'
import { planSets } from '../shared/utils/set-plan'
import { takeoffRooms } from '../shared/utils/takeoff'
import { invoiceTotals } from '../shared/utils/tax'
import { DEMO_PRICE_BOOK } from './demo'
import type { Tx } from './visit'

const day = (offset: number) => {
  const d = new Date()
  d.setUTCDate(d.getUTCDate() + offset)
  return d.toISOString().slice(0, 10)
}
const at = (offset: number, hh: number, mm: number) => new Date(`${day(offset)}T${String(hh).padStart(2, '0')}:${String(mm).padStart(2, '0')}:00Z`)

export async function seedJob(tx: Tx, o: { firmId: string, customerId: string, siteId: string, ownerId: string, officeId: string, crewId: string, number?: number }) {
  const { firmId } = o
  const [visit] = await tx.insert(schema.visits).values({
    firmId, customerId: o.customerId, siteId: o.siteId, startsAt: at(-9, 9, 30), durationMinutes: 40,
    visitorUserId: o.ownerId, status: 'done', notes: 'Flat empty between tenants. Key from the letting agent.',
  }).returning({ id: schema.visits.id })
  const [room] = await tx.insert(schema.rooms).values({ firmId, visitId: visit!.id, name: 'Living room' }).returning({ id: schema.rooms.id })
  const s = (kind: 'wall' | 'ceiling' | 'chimney-breast', label: string, lengthMm: number, secondMm: number, position: number) =>
    ({ id: randomUUID(), kind, label, lengthMm, secondMm, background: 'sound-plaster' as const, position, notes: '' })
  const surfaces = [
    s('wall', 'Window wall', 4200, 2450, 0),
    s('wall', 'Alcove wall', 1100, 2450, 1),
    s('chimney-breast', 'Breast face', 1500, 2450, 2),
    s('chimney-breast', 'Breast return', 350, 2450, 3),
    s('wall', 'Door wall', 4200, 2450, 4),
    s('ceiling', 'Ceiling', 4200, 3800, 5),
  ]
  for (const x of surfaces) await tx.insert(schema.surfaces).values({ firmId, roomId: room!.id, ...x })
  const openings = [
    { surfaceId: surfaces[0]!.id, kind: 'window' as const, widthMm: 1500, heightMm: 1200 },
    { surfaceId: surfaces[4]!.id, kind: 'door' as const, widthMm: 840, heightMm: 1980 },
  ]
  await tx.insert(schema.openings).values(openings.map(x => ({ firmId, ...x })))
  const conditions = [
    { surfaceId: surfaces[0]!.id, kind: 'patch-masonry' as const, areaCm2: 4000, lengthMm: null, outOfTrueMm: null, scrimmed: false, notes: 'Blown under the sill' },
    { surfaceId: surfaces[0]!.id, kind: 'frame-gap' as const, areaCm2: null, lengthMm: 5400, outOfTrueMm: null, scrimmed: true, notes: 'Gap round the replacement window' },
    { surfaceId: surfaces[1]!.id, kind: 'out-of-true' as const, areaCm2: null, lengthMm: null, outOfTrueMm: 15, scrimmed: false, notes: 'Leans out at the top' },
  ]
  await tx.insert(schema.conditions).values(conditions.map(x => ({ firmId, ...x })))
  const corners = [
    { id: randomUUID(), surfaceAId: surfaces[1]!.id, surfaceBId: surfaces[3]!.id, kind: 'internal' as const, lengthMm: 2450, returnWidthMm: null, needsBead: false, packedOut: false },
    { id: randomUUID(), surfaceAId: surfaces[2]!.id, surfaceBId: surfaces[3]!.id, kind: 'external' as const, lengthMm: 2450, returnWidthMm: 350, needsBead: true, packedOut: true },
  ]
  await tx.insert(schema.corners).values(corners.map(x => ({ firmId, roomId: room!.id, ...x })))

  // the room as the take-off and the planner read it
  const rooms = [{
    name: 'Living room',
    surfaces: surfaces.map(x => ({ ...x, openings: openings.filter(p => p.surfaceId === x.id), conditions: conditions.filter(c => c.surfaceId === x.id) })),
    corners,
  }]
  const book = { ...DEMO_PRICE_BOOK, materialsWastePercent: 10 }
  const takeoff = takeoffRooms(rooms, { minDeductCm2: book.minDeductCm2 })
  const { lines, estimatedDaysX100 } = draftLines(takeoff, book, DEFAULT_MATERIALS)
  const totals = invoiceTotals(lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })), { vat: 'standard', cisRatePercent: null })

  const [quote] = await tx.insert(schema.quotes).values({ firmId, number: 1, customerId: o.customerId, siteId: o.siteId, visitId: visit!.id, createdBy: o.ownerId }).returning()
  const [version] = await tx.insert(schema.quoteVersions).values({
    firmId, quoteId: quote!.id, version: 1, status: 'accepted', pricing: 'measure', estimatedDaysX100, vat: 'standard',
    validUntil: day(21), terms: 'Payment within 30 days of the invoice.', cautions: ['Drying times are estimates: a skim coat needs about a week before decorating, longer for undercoats and in cold or damp rooms.'],
    totals: { ...totals }, sentAt: at(-8, 17, 5), respondedAt: at(-7, 8, 40), acceptedName: 'Owen Sallis', createdBy: o.ownerId,
  }).returning()
  await tx.insert(schema.quoteLines).values(lines.map((l, i) => ({ firmId, versionId: version!.id, position: i, ...l })))

  // the job, with the estimate at cost against the firm's catalogue rows
  const materialRows = await tx.select({ id: schema.materials.id, key: schema.materials.key }).from(schema.materials).where(eq(schema.materials.firmId, firmId))
  const estimate = estimateMaterials(takeoff, DEFAULT_MATERIALS, { wastePercent: book.materialsWastePercent }).filter(m => m.packs > 0)
    .map(m => ({ materialId: materialRows.find(r => r.key === m.materialKey)?.id ?? null, name: m.name, packs: m.packs, costPence: m.costPence, derivation: m.derivation }))
  const planOptions = { people: 2, bagsPerPersonPerSet: 3, coverageM2PerBag: 10 }
  const [job] = await tx.insert(schema.jobs).values({
    firmId, number: o.number ?? 1, title: 'Q-0001: Patch and skim the living room', customerId: o.customerId, siteId: o.siteId, quoteId: quote!.id, quoteVersionId: version!.id, visitId: visit!.id,
    status: 'in-progress', labourNetPence: totals.labourNetPence, materialsNetPence: totals.materialsNetPence, netPence: totals.netPence, grossPence: totals.grossPence,
    estimatedDaysX100, materialsEstimate: estimate, planOptions, createdBy: o.officeId,
  }).returning()
  await tx.insert(schema.jobStatusChanges).values([
    { firmId, jobId: job!.id, fromStatus: null, toStatus: 'booked', changedBy: o.officeId, changedAt: at(-7, 9, 0) },
    { firmId, jobId: job!.id, fromStatus: 'booked', toStatus: 'in-progress', reason: 'First set logged', changedBy: o.crewId, changedAt: at(-1, 10, 15) },
  ])
  await tx.insert(schema.jobDays).values([
    { firmId, jobId: job!.id, day: day(-1), userId: o.ownerId, worked: true },
    { firmId, jobId: job!.id, day: day(-1), userId: o.crewId, worked: true },
    { firmId, jobId: job!.id, day: day(0), userId: o.ownerId },
    { firmId, jobId: job!.id, day: day(0), userId: o.crewId },
    { firmId, jobId: job!.id, day: day(1), userId: o.crewId, portion: 'half-day' },
  ])

  // set 1, as the planner has it, logged yesterday: its surfaces, its coat (a set with a skim is
  // logged as its second, final coat), a note that says what the set did, and the bags the plan
  // put in it, rounded up to the half bag mixed (fills in bonding, skims and tight coats in finish)
  const inputs = planInputsFromRooms(rooms, { cornerTrowelMm: 100, outOfTrueToleranceMm: 10, minDeductCm2: book.minDeductCm2 })
  const plan = planSets(inputs.surfaces, inputs.corners, planOptions, inputs.labels)
  const set1 = plan.sets[0]!
  const coat = set1.tasks.some(t => t.action === 'skim') ? 'second' as const : set1.tasks.some(t => t.action === 'fill') ? 'fill' as const : 'tight-coat' as const
  const label = (id: string) => surfaces.find(x => x.id === id)!.label.toLowerCase()
  const done = set1.tasks.map(t => t.action === 'skim'
    ? `${label(t.surfaceId)} skimmed, two coats`
    : t.action === 'fill' ? `patch on the ${label(t.surfaceId)} dubbed out` : `first tight coat over the scrim on the ${label(t.surfaceId)}`)
  const notes = `${done.join('; ').replace(/^./, c => c.toUpperCase())}. Good suction, no problems.`
  const [log] = await tx.insert(schema.setLogs).values({
    firmId, jobId: job!.id, kind: 'set', setNumber: 1, startedAt: at(-1, 8, 30), endedAt: at(-1, 10, 10), coat,
    surfaceIds: [...new Set(set1.tasks.map(t => t.surfaceId))], userIds: [o.ownerId, o.crewId], notes, loggedBy: o.crewId,
  }).returning()
  const finish = materialRows.find(r => r.key === 'finish-plaster')
  const bonding = materialRows.find(r => r.key === 'bonding-undercoat')
  const costs = Object.fromEntries(DEFAULT_MATERIALS.map(m => [m.key, m.costPence]))
  const halfBagsUp = (tasks: typeof set1.tasks) => Math.ceil(tasks.reduce((n, t) => n + Math.round(t.bags * 10), 0) / 5) * 500
  const bondingPacks = halfBagsUp(set1.tasks.filter(t => t.action === 'fill'))
  const finishPacks = halfBagsUp(set1.tasks.filter(t => t.action !== 'fill'))
  const uses = [
    ...(bonding && bondingPacks ? [{ materialId: bonding.id, packsX1000: bondingPacks, costPencePerPack: costs['bonding-undercoat']! }] : []),
    ...(finish && finishPacks ? [{ materialId: finish.id, packsX1000: finishPacks, costPencePerPack: costs['finish-plaster']! }] : []),
  ]
  if (uses.length) await tx.insert(schema.materialUses).values(uses.map(u => ({ firmId, jobId: job!.id, logId: log!.id, ...u })))
  return { jobId: job!.id, labourNetPence: totals.labourNetPence, materialsNetPence: totals.materialsNetPence }
}

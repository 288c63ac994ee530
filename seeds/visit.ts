// A measured demo visit: the back bedroom at 3 Wren Close, with what was found.
import { randomUUID } from 'node:crypto'
import type { NodePgDatabase } from 'drizzle-orm/node-postgres'
import * as schema from '../server/db/schema'
import { seedPhotos } from './photos'

export type Tx = Parameters<Parameters<NodePgDatabase<typeof schema>['transaction']>[0]>[0]

export async function seedVisit(tx: Tx, o: { firmId: string, id: string, customerId: string, siteId: string, visitorUserId: string }) {
  const { firmId } = o
  // yesterday at 10:00, so the visit has its measurements already
  const startsAt = new Date()
  startsAt.setUTCDate(startsAt.getUTCDate() - 1)
  startsAt.setUTCHours(10, 0, 0, 0)
  const [visit] = await tx.insert(schema.visits).values({
    firmId, customerId: o.customerId, siteId: o.siteId, enquiryId: o.id, startsAt, durationMinutes: 45,
    visitorUserId: o.visitorUserId, status: 'done', notes: 'Park on the drive. Dog is friendly.',
  }).returning({ id: schema.visits.id })
  // and a second one booked for tomorrow
  const tomorrow = new Date(startsAt)
  tomorrow.setUTCDate(tomorrow.getUTCDate() + 2)
  await tx.insert(schema.visits).values({ firmId, customerId: o.customerId, siteId: o.siteId, enquiryId: o.id, startsAt: tomorrow, visitorUserId: o.visitorUserId, notes: 'Check the ceiling once the leak is fixed.' })

  const [room] = await tx.insert(schema.rooms).values({ firmId, visitId: visit!.id, name: 'Back bedroom', notes: 'Leak above the window fixed by the roofer last week.' }).returning({ id: schema.rooms.id })
  const surfaces = [
    { id: randomUUID(), kind: 'wall' as const, label: 'Window wall', lengthMm: 3600, secondMm: 2400, background: 'sound-plaster' as const, position: 0 },
    { id: randomUUID(), kind: 'wall' as const, label: 'Door wall', lengthMm: 3600, secondMm: 2400, background: 'paper-stripped' as const, position: 1 },
    { id: randomUUID(), kind: 'wall' as const, label: 'Left wall', lengthMm: 3100, secondMm: 2400, background: 'sound-plaster' as const, position: 2 },
    { id: randomUUID(), kind: 'ceiling' as const, label: 'Ceiling', lengthMm: 3600, secondMm: 3100, background: 'sound-plaster' as const, position: 3 },
    { id: randomUUID(), kind: 'reveal' as const, label: 'Window reveal', lengthMm: 3400, secondMm: 220, background: 'sound-plaster' as const, position: 4 },
  ]
  for (const s of surfaces) await tx.insert(schema.surfaces).values({ firmId, roomId: room!.id, ...s })
  await tx.insert(schema.openings).values([
    // tight to the left wall (see the corners below), its sill 0.90 m up
    { firmId, surfaceId: surfaces[0]!.id, kind: 'window', widthMm: 1200, heightMm: 1100, fromLeftMm: 80, fromFloorMm: 900 },
    { firmId, surfaceId: surfaces[1]!.id, kind: 'door', widthMm: 840, heightMm: 2000 },
  ])
  await tx.insert(schema.conditions).values([
    { firmId, surfaceId: surfaces[0]!.id, kind: 'patch-masonry', areaCm2: 6000, notes: 'Blown below the window where the leak ran' },
    { firmId, surfaceId: surfaces[0]!.id, kind: 'frame-gap', lengthMm: 4600, scrimmed: true, notes: 'Gap round the new window frame' },
    { firmId, surfaceId: surfaces[3]!.id, kind: 'crack', lengthMm: 2200, notes: 'Along the board joint' },
    { firmId, surfaceId: surfaces[2]!.id, kind: 'out-of-true', outOfTrueMm: 9, notes: 'Bows near the chimney side' },
  ])
  await tx.insert(schema.corners).values([
    // the window sits tight to the left wall: the return beside it is 80 mm, narrower than the
    // firm's 100 mm corner trowel, so the quote makes it good by hand and the planner splits the corner
    { firmId, roomId: room!.id, surfaceAId: surfaces[0]!.id, surfaceBId: surfaces[2]!.id, kind: 'internal', lengthMm: 2400, returnWidthMm: 80 },
    { firmId, roomId: room!.id, surfaceAId: surfaces[0]!.id, surfaceBId: surfaces[4]!.id, kind: 'external', lengthMm: 3400, returnWidthMm: 220, needsBead: true, packedOut: true },
  ])
  await seedPhotos(tx, { firmId, visitId: visit!.id, surfaceId: surfaces[0]!.id, uploadedBy: o.visitorUserId })
  return { visitId: visit!.id, surfaceIds: surfaces.map(s => s.id) }
}

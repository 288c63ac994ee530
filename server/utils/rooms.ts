// What the room routes share: reading rooms whole (surfaces with their openings and conditions,
// and the corners), in the shape roomSchema takes, plus the running totals. The leading '-' keeps
// Nitro from serving this file as a route (Nuxt's ignorePrefix).
import { asc, eq, inArray } from 'drizzle-orm'
import { conditions, corners, openings, rooms, surfaces } from '../db/schema'
import type { Room } from '#shared/schemas/room'
import { roomTotals, type RoomTotals } from '#shared/utils/room-area'

/** A room as saved: what roomSchema takes, with its ids, its revision and its totals (cm²). */
export type SavedRoom = Room & { id: string, visitId: string, updatedAt: Date, totals: RoomTotals }

/** Every room of a visit (or the one room `roomId`), whole, ordered by position then name. */
export async function loadRooms(f: FirmScope, visitId: string, roomId?: string): Promise<SavedRoom[]> {
  const roomRows = await f.tx.select().from(rooms)
    .where(f.where(rooms, eq(rooms.visitId, visitId), roomId ? eq(rooms.id, roomId) : undefined))
    .orderBy(asc(rooms.position), asc(rooms.createdAt), asc(rooms.id))
  if (!roomRows.length) return []
  const roomIds = roomRows.map(r => r.id)
  const surfaceRows = await f.tx.select().from(surfaces)
    .where(f.where(surfaces, inArray(surfaces.roomId, roomIds)))
    .orderBy(asc(surfaces.position), asc(surfaces.id))
  const surfaceIds = surfaceRows.map(s => s.id)
  // openings, conditions and corners have no position column: ordered by id so a read is stable
  const openingRows = await f.tx.select().from(openings)
    .where(f.where(openings, inArray(openings.surfaceId, surfaceIds))).orderBy(asc(openings.id))
  const conditionRows = await f.tx.select().from(conditions)
    .where(f.where(conditions, inArray(conditions.surfaceId, surfaceIds))).orderBy(asc(conditions.id))
  const cornerRows = await f.tx.select().from(corners)
    .where(f.where(corners, inArray(corners.roomId, roomIds))).orderBy(asc(corners.id))

  return roomRows.map((r) => {
    const roomSurfaces = surfaceRows.filter(s => s.roomId === r.id).map(s => ({
      id: s.id,
      kind: s.kind,
      label: s.label,
      lengthMm: s.lengthMm,
      secondMm: s.secondMm,
      background: s.background,
      notes: s.notes,
      openings: openingRows.filter(o => o.surfaceId === s.id)
        .map(o => ({ id: o.id, kind: o.kind, widthMm: o.widthMm, heightMm: o.heightMm, fromLeftMm: o.fromLeftMm, fromFloorMm: o.fromFloorMm })),
      conditions: conditionRows.filter(c => c.surfaceId === s.id).map(c => ({
        id: c.id,
        kind: c.kind,
        areaCm2: c.areaCm2,
        lengthMm: c.lengthMm,
        outOfTrueMm: c.outOfTrueMm,
        scrimmed: c.scrimmed,
        notes: c.notes,
      })),
    }))
    return {
      id: r.id,
      visitId: r.visitId,
      revision: r.revision,
      name: r.name,
      position: r.position,
      notes: r.notes,
      updatedAt: r.updatedAt,
      surfaces: roomSurfaces,
      corners: cornerRows.filter(c => c.roomId === r.id).map(c => ({
        id: c.id,
        surfaceAId: c.surfaceAId,
        surfaceBId: c.surfaceBId,
        kind: c.kind,
        lengthMm: c.lengthMm,
        returnWidthMm: c.returnWidthMm,
        needsBead: c.needsBead,
        packedOut: c.packedOut,
      })),
      totals: roomTotals(roomSurfaces),
    }
  })
}

/** The one room, whole; undefined when it is not in this visit. */
export async function loadRoom(f: FirmScope, visitId: string, roomId: string): Promise<SavedRoom | undefined> {
  const [room] = await loadRooms(f, visitId, roomId)
  return room
}

/**
 * Ids in the body that are already saved under another parent in this firm (another room, another
 * surface): answered as a field error, so a save can never move a row out of where it belongs.
 * Another firm's rows are invisible here (RLS and f.where) and keyed by (firm_id, id), so a reused
 * id from another firm simply makes a row of this firm.
 */
export async function foreignIds(f: FirmScope, roomId: string, body: Room): Promise<Record<string, string>> {
  const fields: Record<string, string> = {}
  const surfaceIds = body.surfaces.map(s => s.id)
  const savedSurfaces = await f.tx.select({ id: surfaces.id, roomId: surfaces.roomId }).from(surfaces)
    .where(f.where(surfaces, inArray(surfaces.id, surfaceIds)))
  const surfaceRoom = new Map(savedSurfaces.map(s => [s.id, s.roomId]))
  body.surfaces.forEach((s, i) => {
    const at = surfaceRoom.get(s.id)
    if (at !== undefined && at !== roomId) fields[`surfaces.${i}.id`] = 'This surface is saved in another room. Add it again as a new surface.'
  })

  const children = async (table: typeof openings | typeof conditions, what: 'openings' | 'conditions', message: string) => {
    const wanted = body.surfaces.flatMap((s, i) => s[what].map((c, j) => ({ id: c.id, surfaceId: s.id, path: `surfaces.${i}.${what}.${j}.id` })))
    const saved = await f.tx.select({ id: table.id, surfaceId: table.surfaceId }).from(table)
      .where(f.where(table, inArray(table.id, wanted.map(w => w.id))))
    const parent = new Map(saved.map(s => [s.id, s.surfaceId]))
    for (const w of wanted) {
      const at = parent.get(w.id)
      if (at !== undefined && at !== w.surfaceId) fields[w.path] = message
    }
  }
  await children(openings, 'openings', 'This opening is saved on another surface. Add it again here.')
  await children(conditions, 'conditions', 'This finding is saved on another surface. Add it again here.')

  const savedCorners = await f.tx.select({ id: corners.id, roomId: corners.roomId }).from(corners)
    .where(f.where(corners, inArray(corners.id, body.corners.map(c => c.id))))
  const cornerRoom = new Map(savedCorners.map(c => [c.id, c.roomId]))
  body.corners.forEach((c, i) => {
    const at = cornerRoom.get(c.id)
    if (at !== undefined && at !== roomId) fields[`corners.${i}.id`] = 'This corner is saved in another room. Add it again here.'
  })
  return fields
}

/** Every id in the body, once: two items sharing an id would overwrite each other. */
export function duplicateIds(body: Room): Record<string, string> {
  const seen = new Set<string>()
  const fields: Record<string, string> = {}
  const check = (id: string, path: string) => {
    if (seen.has(id)) fields[path] = 'This id is used twice in the room.'
    seen.add(id)
  }
  body.surfaces.forEach((s, i) => {
    check(s.id, `surfaces.${i}.id`)
    s.openings.forEach((o, j) => check(o.id, `surfaces.${i}.openings.${j}.id`))
    s.conditions.forEach((c, j) => check(c.id, `surfaces.${i}.conditions.${j}.id`))
  })
  body.corners.forEach((c, i) => check(c.id, `corners.${i}.id`))
  return fields
}

/** `surface_id in (the surfaces of this room)`, for scoping openings and conditions to the room. */
export function inRoom(f: FirmScope, column: typeof openings.surfaceId | typeof conditions.surfaceId, roomId: string) {
  return inArray(column, f.tx.select({ id: surfaces.id }).from(surfaces).where(f.where(surfaces, eq(surfaces.roomId, roomId))))
}

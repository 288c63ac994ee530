import { eq, notInArray, sql } from 'drizzle-orm'
import { conditions, corners, openings, rooms, surfaces } from '../../../../db/schema'
import { roomParams, roomSchema } from '#shared/schemas/room'

/**
 * Create or replace a room, whole: the phone made every id, so a draft kept offline saves to the
 * same rows when it is sent. `revision` is the one the draft started from (0 for a new room); if
 * the room has moved on since, 409 with the saved room, so nothing typed is lost and the person
 * chooses. Owner, office, and crew on their own visits.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  if (!canMeasure(auth)) throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  const { id: visitId, roomId } = await readParamsWith(event, roomParams)
  const body = await readBodyWith(event, roomSchema)

  const dupes = duplicateIds(body)
  if (Object.keys(dupes).length) throw fieldError(dupes)

  try {
    return await withFirm(auth, async (f) => {
      // one save at a time per visit: the lock orders saves of its rooms
      const visit = await findVisit(f, auth, visitId, { lock: true })
      const [saved] = await f.tx.select().from(rooms).where(f.where(rooms, eq(rooms.id, roomId))).for('update')
      // a room of another visit is not this visit's room (and is never moved here)
      if (saved && saved.visitId !== visit.id) notFound()
      if (saved ? body.revision !== saved.revision : body.revision !== 0) {
        const current = saved ? await loadRoom(f, visit.id, roomId) : null
        throw createError({
          statusCode: 409,
          statusMessage: 'Changed elsewhere',
          data: {
            message: current
              ? `${current.name} was changed on another phone or screen since you opened it.`
              : 'This room was deleted on another phone or screen since you opened it.',
            current,
          },
        })
      }

      const foreign = await foreignIds(f, roomId, body)
      if (Object.keys(foreign).length) throw fieldError(foreign)

      const revision = saved ? saved.revision + 1 : 1
      if (saved) {
        await f.tx.update(rooms)
          .set({ name: body.name, position: body.position, notes: body.notes, revision, updatedAt: sql`now()` })
          .where(f.where(rooms, eq(rooms.id, roomId), eq(rooms.visitId, visit.id)))
      }
      else {
        await f.tx.insert(rooms).values(f.values({ id: roomId, visitId: visit.id, name: body.name, position: body.position, notes: body.notes, revision }))
      }

      // delete what the body no longer has (a surface takes its openings, conditions and corners with it)
      const surfaceIds = body.surfaces.map(s => s.id)
      const openingIds = body.surfaces.flatMap(s => s.openings.map(o => o.id))
      const conditionIds = body.surfaces.flatMap(s => s.conditions.map(c => c.id))
      await f.tx.delete(corners).where(f.where(corners, eq(corners.roomId, roomId), notInArray(corners.id, body.corners.map(c => c.id))))
      await f.tx.delete(surfaces).where(f.where(surfaces, eq(surfaces.roomId, roomId), notInArray(surfaces.id, surfaceIds)))
      await f.tx.delete(openings).where(f.where(openings, inRoom(f, openings.surfaceId, roomId), notInArray(openings.id, openingIds)))
      await f.tx.delete(conditions).where(f.where(conditions, inRoom(f, conditions.surfaceId, roomId), notInArray(conditions.id, conditionIds)))

      // then insert the new and update the changed. An update only touches a row that is already
      // where the body puts it (setWhere); a row elsewhere is not returned, and the count says so.
      const expectAll = (got: unknown[], want: number) => {
        if (got.length !== want) throw createError({ statusCode: 409, statusMessage: 'Changed elsewhere', data: { message: 'Part of this room was saved somewhere else at the same moment. Try again.' } })
      }
      if (body.surfaces.length) {
        const got = await f.tx.insert(surfaces).values(body.surfaces.map((s, position) => f.values({
          id: s.id, roomId, kind: s.kind, label: s.label, position, lengthMm: s.lengthMm, secondMm: s.secondMm, background: s.background, notes: s.notes,
        }))).onConflictDoUpdate({
          target: [surfaces.firmId, surfaces.id],
          set: {
            kind: sql`excluded.kind`,
            label: sql`excluded.label`,
            position: sql`excluded.position`,
            lengthMm: sql`excluded.length_mm`,
            secondMm: sql`excluded.second_mm`,
            background: sql`excluded.background`,
            notes: sql`excluded.notes`,
          },
          setWhere: eq(surfaces.roomId, roomId),
        }).returning({ id: surfaces.id })
        expectAll(got, body.surfaces.length)
      }
      const openingRows = body.surfaces.flatMap(s => s.openings.map(o => f.values({ id: o.id, surfaceId: s.id, kind: o.kind, widthMm: o.widthMm, heightMm: o.heightMm, fromLeftMm: o.fromLeftMm, fromFloorMm: o.fromFloorMm })))
      if (openingRows.length) {
        const got = await f.tx.insert(openings).values(openingRows).onConflictDoUpdate({
          target: [openings.firmId, openings.id],
          set: { kind: sql`excluded.kind`, widthMm: sql`excluded.width_mm`, heightMm: sql`excluded.height_mm`, fromLeftMm: sql`excluded.from_left_mm`, fromFloorMm: sql`excluded.from_floor_mm` },
          setWhere: sql`${openings.surfaceId} = excluded.surface_id`,
        }).returning({ id: openings.id })
        expectAll(got, openingRows.length)
      }
      const conditionRows = body.surfaces.flatMap(s => s.conditions.map(c => f.values({
        id: c.id, surfaceId: s.id, kind: c.kind, areaCm2: c.areaCm2, lengthMm: c.lengthMm, outOfTrueMm: c.outOfTrueMm, scrimmed: c.scrimmed, notes: c.notes,
      })))
      if (conditionRows.length) {
        const got = await f.tx.insert(conditions).values(conditionRows).onConflictDoUpdate({
          target: [conditions.firmId, conditions.id],
          set: {
            kind: sql`excluded.kind`,
            areaCm2: sql`excluded.area_cm2`,
            lengthMm: sql`excluded.length_mm`,
            outOfTrueMm: sql`excluded.out_of_true_mm`,
            scrimmed: sql`excluded.scrimmed`,
            notes: sql`excluded.notes`,
          },
          setWhere: sql`${conditions.surfaceId} = excluded.surface_id`,
        }).returning({ id: conditions.id })
        expectAll(got, conditionRows.length)
      }
      if (body.corners.length) {
        const got = await f.tx.insert(corners).values(body.corners.map(c => f.values({
          id: c.id, roomId, surfaceAId: c.surfaceAId, surfaceBId: c.surfaceBId, kind: c.kind, lengthMm: c.lengthMm, returnWidthMm: c.returnWidthMm, needsBead: c.needsBead, packedOut: c.packedOut,
        }))).onConflictDoUpdate({
          target: [corners.firmId, corners.id],
          set: {
            surfaceAId: sql`excluded.surface_a_id`,
            surfaceBId: sql`excluded.surface_b_id`,
            kind: sql`excluded.kind`,
            lengthMm: sql`excluded.length_mm`,
            returnWidthMm: sql`excluded.return_width_mm`,
            needsBead: sql`excluded.needs_bead`,
            packedOut: sql`excluded.packed_out`,
          },
          setWhere: eq(corners.roomId, roomId),
        }).returning({ id: corners.id })
        expectAll(got, body.corners.length)
      }

      const room = (await loadRoom(f, visit.id, roomId))!
      await f.audit('room.saved', 'room', roomId, {
        visitId: visit.id,
        name: room.name,
        revision,
        created: !saved,
        surfaces: room.surfaces.length,
        totalCm2: room.totals.totalCm2,
      })
      return room
    })
  }
  catch (err) {
    // two saves of new rows with the same ids at the same moment (another visit): ask to try again
    if (isUniqueViolation(err)) throw createError({ statusCode: 409, statusMessage: 'Changed elsewhere', data: { message: 'Part of this room was saved somewhere else at the same moment. Try again.' } })
    throw err
  }
})

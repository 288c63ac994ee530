import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { planSets, type PlanSurface } from '../../shared/utils/set-plan'
import { applyMoves, plannerSetNumber } from '../../shared/utils/plan-moves'
import { addMove, movesToSend, replayMoves, type PendingMove } from '../../shared/utils/pending-moves'

// Sources: our product's own rule. The phone keeps the plasterer's unsaved moves as the set
// numbers they SAW (what PUT /api/jobs/:id/plan takes, server/api/jobs/[id]/plan.put.ts), and
// must show the plan the server will keep once they are sent. The server replays them one by one
// with plannerSetNumber; `serverKeeps` below is that loop, copied from the route.
// Five walls of 15 m² at 10 m² a bag, 1 person x 2 bags a set: one wall a set, five sets (invented figures).

const walls: PlanSurface[] = ['A', 'B', 'C', 'D', 'E'].map(id => ({ id, areaM2: 15 }))
const planner = planSets(walls, [], { people: 1, bagsPerPersonPerSet: 2, coverageM2PerBag: 10 })

/** What the route does with each request's moves, after the moves it already has. */
function serverKeeps(saved: Record<string, number>, bodies: Record<string, number>[]) {
  const moves = { ...saved }
  for (const body of bodies) for (const [surfaceId, shown] of Object.entries(body)) moves[surfaceId] = plannerSetNumber(planner, moves, shown)
  return moves
}
// which surfaces each set holds (the order inside a set follows the order the moves were made in)
const layout = (moves: Record<string, number>) => applyMoves(planner, moves).sets.map(s => s.tasks.map(t => t.surfaceId).sort().join(''))

describe('pending moves: what the phone shows is what the server keeps', () => {
  it.each<[string, Record<string, number>, PendingMove[], string[]]>([
    ['one move to an earlier set', {}, [{ surfaceId: 'E', shown: 1 }], ['AE', 'B', 'C', 'D']],
    ['two moves, the second seen after the first closed a set up', {}, [{ surfaceId: 'A', shown: 2 }, { surfaceId: 'C', shown: 1 }], ['ABC', 'D', 'E']],
    ['a move to a new set (seen 5 of 4), after a saved move', { B: 1 }, [{ surfaceId: 'C', shown: 5 }], ['AB', 'D', 'E', 'C']],
  ])('%s', (_name, saved, pending, expected) => {
    const moves = replayMoves(planner, saved, pending)
    expect(layout(moves)).toEqual(expected)
    expect(serverKeeps(saved, movesToSend(pending))).toEqual(moves)
  })

  it('a surface moved again replaces its earlier move when one request can still say it', () => {
    let pending = addMove(planner, {}, [], { surfaceId: 'A', shown: 3 })
    pending = addMove(planner, {}, pending, { surfaceId: 'A', shown: 4 })
    expect(pending).toHaveLength(1)
    expect(movesToSend(pending)).toHaveLength(1)
    expect(layout(replayMoves(planner, {}, pending))).toEqual(['B', 'C', 'D', 'AE'])
  })

  it('any sequence of moves, saved in as few requests as it takes, ends where the phone showed (property)', () => {
    const move = fc.record({ surfaceId: fc.constantFrom('A', 'B', 'C', 'D', 'E'), shown: fc.integer({ min: 1, max: 6 }) })
    fc.assert(fc.property(fc.array(move, { maxLength: 8 }), fc.dictionary(fc.constantFrom('A', 'B', 'C', 'D', 'E'), fc.integer({ min: 1, max: 6 })), (made, saved) => {
      // the phone offers the sets it shows and one new set: a move is a number from 1 to that
      let pending: PendingMove[] = []
      let seen = replayMoves(planner, saved, pending)
      for (const m of made) {
        const sets = applyMoves(planner, seen).sets.length
        const shown = Math.min(m.shown, sets + 1)
        pending = addMove(planner, saved, pending, { surfaceId: m.surfaceId, shown })
        const straight = { ...seen, [m.surfaceId]: plannerSetNumber(planner, seen, shown) }
        seen = replayMoves(planner, saved, pending)
        // the plan shown is the plan of the moves made one after another
        expect(layout(seen)).toEqual(layout(straight))
      }
      expect(layout(serverKeeps(saved, movesToSend(pending)))).toEqual(layout(seen))
      for (const body of movesToSend(pending)) expect(Object.keys(body).length).toBeGreaterThan(0)
    }), { numRuns: 300 })
  })
})

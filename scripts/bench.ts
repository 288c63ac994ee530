// `npm run bench`: speed and memory of the computations, measured here rather than in timed
// tests. For now the set planner (issue 5: a 30-surface house well under 50 ms, 2,000 surfaces
// under a second); the server's routes join it later. Prints one line per case and exits 1 when
// a budget is missed, so a slow change is noticed.
import { performance } from 'node:perf_hooks'
import { planSets, type PlanCorner, type PlanSurface } from '../shared/utils/set-plan'

/** A repeatable pseudo-random house: rooms of four walls and a ceiling, some patched, some scrimmed, difficult corners and packed beads. */
function house(surfaceCount: number, seed = 1) {
  let x = seed
  const rand = () => {
    x = (x * 1_103_515_245 + 12_345) % 2 ** 31
    return x / 2 ** 31
  }
  const surfaces: PlanSurface[] = []
  const corners: PlanCorner[] = []
  for (let i = 0; i < surfaceCount; i++) {
    surfaces.push({
      id: `s${i}`,
      areaM2: Math.round((3 + rand() * 15) * 100) / 100,
      ...(rand() < 0.2 ? { patches: [{ areaM2: Math.round(rand() * 200) / 100 }] } : {}),
      ...(rand() < 0.1 ? { scrimmedGap: true } : {}),
    })
    if (i % 5 !== 0) {
      const r = rand()
      if (r < 0.25) corners.push({ a: `s${i - 1}`, b: `s${i}`, kind: 'internal', dryCorner: true })
      else if (r < 0.35) corners.push({ a: `s${i - 1}`, b: `s${i}`, kind: 'external', packedBead: { face: `s${i - 1}` } })
    }
  }
  return { surfaces, corners }
}

function measure(name: string, surfaceCount: number, runs: number, budgetMs: number) {
  const { surfaces, corners } = house(surfaceCount)
  const options = { people: 2, bagsPerPersonPerSet: 3, coverageM2PerBag: 10 }
  planSets(surfaces, corners, options) // warm up
  const times: number[] = []
  const heapBefore = process.memoryUsage().heapUsed
  let sets = 0
  for (let i = 0; i < runs; i++) {
    const t = performance.now()
    sets = planSets(surfaces, corners, options).sets.length
    times.push(performance.now() - t)
  }
  times.sort((a, b) => a - b)
  const median = times[Math.floor(times.length / 2)]!
  const worst = times.at(-1)!
  const heapMb = (process.memoryUsage().heapUsed - heapBefore) / 1024 / 1024
  const ok = worst < budgetMs
  console.log(`${ok ? 'ok  ' : 'SLOW'} ${name}: ${surfaceCount} surfaces, ${sets} sets; median ${median.toFixed(2)} ms, worst ${worst.toFixed(2)} ms of ${runs} (budget ${budgetMs} ms); heap +${heapMb.toFixed(1)} MB`)
  return ok
}

const results = [
  measure('set planner, a house', 30, 200, 50),
  measure('set planner, a big job', 2000, 10, 1000),
]
process.exit(results.every(Boolean) ? 0 : 1)

// The firm's materials catalogue: the rows it edits on the Materials screen, and the same rows in
// the take-off's terms for estimates (shared/utils/materials.ts).
import { asc } from 'drizzle-orm'
import { materials as materialsTable } from '../db/schema'
import type { Material } from '#shared/utils/materials'

/** The firm's catalogue rows, in the order estimates pick from (the generic ones are the firm's from when it was made: server/db/firm-defaults.ts). */
export async function catalogueRows(f: FirmScope) {
  return f.tx.select().from(materialsTable).where(f.where(materialsTable)).orderBy(asc(materialsTable.type), asc(materialsTable.name), asc(materialsTable.id))
}

/** The firm's switched-on materials in the take-off's terms (the first of each kind is used). */
export async function catalogue(f: FirmScope): Promise<Material[]> {
  const rows = (await catalogueRows(f)).filter(r => r.active)
  return rows.map(r => ({
    key: r.key, type: r.type, name: r.name, packLabel: r.packLabel, costPence: r.costPence, source: r.source,
    coverage: r.coverageMmPerPack ? { kind: 'length' as const, metresPerPack: r.coverageMmPerPack / 1000 } : { kind: 'area' as const, m2PerPack: (r.coverageCm2PerPack ?? 0) / 10_000, atThicknessMm: r.atThicknessMm ?? 2 },
  }))
}

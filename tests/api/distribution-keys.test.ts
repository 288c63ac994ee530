import { readFileSync } from 'node:fs'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv } from '../support/app'

// Ready to spread firms across servers (README "Scaling out"): a distributed PostgreSQL engine
// keeps a table's rows together by one column, and every primary key, unique constraint, unique
// index and foreign key between two distributed tables must include it. The engine cannot be
// installed here, so this test reads the migrated database's catalog and checks the plan:
//   - a firm table (a firm_id column) is distributed by firm_id, `firms` by its id (co-located);
//   - `sessions` is distributed by user_id (a person's sign-ins, whichever firm they work in);
//   - `users` is a reference table (a copy on every server); two small tables stay on the
//     coordinator, undistributed. Neither kind may point at a distributed table.
// A table in none of these fails, so a new table has to be placed on purpose. The README's
// create_distributed_table calls are checked against the same plan and the foreign keys' order.

const REFERENCE_TABLES = ['users']
const COORDINATOR_TABLES = ['limit_hits', 'pending_sign_ups']
const DISTRIBUTED_BY_OTHER: Record<string, string> = { firms: 'id', sessions: 'user_id' }
/** Tables distributed together (co-located): a foreign key may join only tables of one group. */
const GROUP_OF = (table: string) => (table === 'sessions' ? 'person' : 'firm')

interface Key { table: string, name: string, kind: string, cols: string[], refTable: string | null, refCols: string[] }

let db: pg.Client
beforeAll(async () => {
  db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
})
afterAll(async () => {
  await db?.end()
})

async function readCatalog() {
  const tables = (await db.query<{ table: string }>(
    `select table_name as table from information_schema.tables
      where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`)).rows.map(r => r.table)
  const firmTables = (await db.query<{ table: string }>(
    `select table_name as table from information_schema.columns
      where table_schema = 'public' and column_name = 'firm_id' order by 1`)).rows.map(r => r.table)
  // primary keys, unique and exclusion constraints, foreign keys: their columns in key order
  const constraints = (await db.query<Key>(
    `select c.conrelid::regclass::text as table, c.conname as name,
            case c.contype when 'p' then 'primary key' when 'u' then 'unique constraint' when 'x' then 'exclusion constraint' else 'foreign key' end as kind,
            array(select a.attname::text from unnest(c.conkey) with ordinality k(n, i) join pg_attribute a on a.attrelid = c.conrelid and a.attnum = k.n order by k.i) as cols,
            case when c.contype = 'f' then c.confrelid::regclass::text end as "refTable",
            array(select a.attname::text from unnest(coalesce(c.confkey, '{}')) with ordinality k(n, i) join pg_attribute a on a.attrelid = c.confrelid and a.attnum = k.n order by k.i) as "refCols"
       from pg_constraint c
      where c.connamespace = 'public'::regnamespace and c.contype in ('p', 'u', 'x', 'f')
      order by 1, 2`)).rows
  // unique indexes made on their own (not behind a constraint): plain key columns only (0 is an expression)
  const indexes = (await db.query<Key>(
    `select i.indrelid::regclass::text as table, ic.relname as name, 'unique index' as kind,
            array(select a.attname::text from unnest(string_to_array(i.indkey::text, ' ')::int2[]) with ordinality k(n, o)
                    join pg_attribute a on a.attrelid = i.indrelid and a.attnum = k.n
                   where k.o <= i.indnkeyatts order by k.o) as cols,
            null as "refTable", '{}'::text[] as "refCols"
       from pg_index i
       join pg_class ic on ic.oid = i.indexrelid
       join pg_class t on t.oid = i.indrelid
      where t.relnamespace = 'public'::regnamespace and i.indisunique
        and not exists (select 1 from pg_constraint k where k.conindid = i.indexrelid and k.contype in ('p', 'u', 'x'))
      order by 1, 2`)).rows
  return { tables, firmTables, keys: [...constraints, ...indexes] }
}

/** The distribution column of each table in the plan; null for a reference table, undefined for a table in no plan. */
function planOf(table: string, firmTables: string[]): string | null | undefined {
  if (table in DISTRIBUTED_BY_OTHER) return DISTRIBUTED_BY_OTHER[table]
  if (firmTables.includes(table)) return 'firm_id'
  if (REFERENCE_TABLES.includes(table) || COORDINATOR_TABLES.includes(table)) return null
  return undefined
}

/** What stops the schema being distributed as planned, one line each ([] when nothing does). */
function problems({ tables, firmTables, keys }: Awaited<ReturnType<typeof readCatalog>>): string[] {
  const out: string[] = []
  for (const t of tables) {
    if (planOf(t, firmTables) === undefined) out.push(`${t}: has no firm_id and is not listed as distributed by another column or as a reference table`)
  }
  for (const k of keys) {
    const by = planOf(k.table, firmTables)
    if (!by) {
      // a reference or coordinator table may point only at a reference table
      if (by === null && k.kind === 'foreign key' && k.refTable && planOf(k.refTable, firmTables) !== null) {
        out.push(`${k.table}: foreign key ${k.name} (${k.cols.join(', ')}) points from an undistributed table at ${k.refTable}, which is not a reference table`)
      }
      if (k.kind === 'foreign key' && COORDINATOR_TABLES.includes(k.refTable ?? '')) {
        out.push(`${k.table}: foreign key ${k.name} (${k.cols.join(', ')}) points at ${k.refTable}, which stays on the coordinator`)
      }
      continue
    }
    if (k.kind !== 'foreign key') {
      if (!k.cols.includes(by)) out.push(`${k.table}: ${k.kind} ${k.name} (${k.cols.join(', ') || 'an expression'}) leaves out ${by}`)
      continue
    }
    const target = planOf(k.refTable!, firmTables)
    if (target === null) {
      // to a reference table: fine anywhere; to a coordinator table: not from a distributed one
      if (COORDINATOR_TABLES.includes(k.refTable!)) out.push(`${k.table}: foreign key ${k.name} (${k.cols.join(', ')}) points at ${k.refTable}, which stays on the coordinator`)
      continue
    }
    const at = k.cols.indexOf(by)
    if (GROUP_OF(k.table) !== GROUP_OF(k.refTable!)) {
      out.push(`${k.table}: foreign key ${k.name} (${k.cols.join(', ')}) points at ${k.refTable}, which is distributed apart from it`)
    }
    else if (at < 0 || k.refCols[at] !== target) {
      out.push(`${k.table}: foreign key ${k.name} (${k.cols.join(', ')}) -> ${k.refTable} (${k.refCols.join(', ')}) does not pair ${by} with ${k.refTable}.${target}`)
    }
  }
  return out
}

/** The README's calls, in order: `create_reference_table('t')` or `create_distributed_table('t', 'col', colocate_with => 'g')`. */
function readmeCalls() {
  const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8')
  const section = readme.split(/^## /m).find(s => s.startsWith('Scaling out\n')) ?? ''
  return [...section.matchAll(/SELECT (create_reference_table|create_distributed_table)\('(\w+)'(?:, '(\w+)')?(?:, colocate_with => '(\w+)')?\);/g)]
    .map(m => ({ fn: m[1]!, table: m[2]!, column: m[3] ?? null, colocateWith: m[4] ?? null }))
}

/** What is wrong with the README's calls against the catalog: a table missed, twice, by the wrong column, or before a table it names. */
function callProblems({ tables, firmTables, keys }: Awaited<ReturnType<typeof readCatalog>>, calls: ReturnType<typeof readmeCalls>): string[] {
  const out: string[] = []
  const position = new Map<string, number>()
  calls.forEach((c, i) => {
    if (position.has(c.table)) out.push(`${c.table}: called twice`)
    position.set(c.table, i)
    const by = planOf(c.table, firmTables)
    if (c.fn === 'create_reference_table' && !REFERENCE_TABLES.includes(c.table)) out.push(`${c.table}: made a reference table, but the plan distributes it by ${by}`)
    if (c.fn === 'create_distributed_table' && c.column !== by) out.push(`${c.table}: distributed by ${c.column}, but the plan says ${by}`)
    if (c.fn === 'create_distributed_table' && by === 'firm_id' && c.colocateWith !== 'firms') out.push(`${c.table}: not co-located with firms`)
  })
  for (const t of tables) {
    const by = planOf(t, firmTables)
    if ((by || REFERENCE_TABLES.includes(t)) && !position.has(t)) out.push(`${t}: no call in the README`)
  }
  for (const k of keys) {
    if (k.kind !== 'foreign key' || k.refTable === k.table) continue
    const from = position.get(k.table)
    const to = position.get(k.refTable!)
    if (from !== undefined && to !== undefined && to > from) out.push(`${k.table}: called before ${k.refTable}, which its foreign key ${k.name} names`)
  }
  return out
}

describe('the schema is ready to be distributed by firm (catalog)', () => {
  it('finds the firm tables and their keys (the check reads something)', async () => {
    const cat = await readCatalog()
    expect(cat.firmTables.length).toBeGreaterThan(30)
    expect(cat.firmTables).not.toContain('firms')
    expect(cat.keys.filter(k => k.kind === 'foreign key' && cat.firmTables.includes(k.table) && cat.firmTables.includes(k.refTable ?? '')).length).toBeGreaterThan(30)
  })

  it('every primary key, unique constraint, unique index and foreign key between distributed tables includes the distribution column', async () => {
    const found = problems(await readCatalog())
    expect(found, found.join('\n')).toEqual([])
  })

  it('the README\'s create_distributed_table calls place every table as planned, each after the tables it points at', async () => {
    const calls = readmeCalls()
    expect(calls.length).toBeGreaterThan(30)
    const found = callProblems(await readCatalog(), calls)
    expect(found, found.join('\n')).toEqual([])
  })

  it('the check itself catches a key without the firm (a table made and dropped in a rolled-back transaction)', async () => {
    await db.query('begin')
    try {
      await db.query(`create table scale_check_probe (firm_id uuid not null, id uuid not null, token text not null,
                        primary key (firm_id, id), unique (token),
                        foreign key (id, firm_id) references customers (firm_id, id))`)
      await db.query('create unique index scale_check_probe_token_idx on scale_check_probe (lower(token))')
      await db.query('create table scale_check_loose (id uuid primary key)')
      const found = problems(await readCatalog()).filter(p => p.startsWith('scale_check_'))
      expect(found).toEqual([
        'scale_check_loose: has no firm_id and is not listed as distributed by another column or as a reference table',
        'scale_check_probe: foreign key scale_check_probe_id_firm_id_fkey (id, firm_id) -> customers (firm_id, id) does not pair firm_id with customers.firm_id',
        'scale_check_probe: unique constraint scale_check_probe_token_key (token) leaves out firm_id',
        'scale_check_probe: unique index scale_check_probe_token_idx (an expression) leaves out firm_id',
      ])
    }
    finally {
      await db.query('rollback')
    }
  })
})

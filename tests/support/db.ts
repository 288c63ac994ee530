import pg from 'pg'

/**
 * Run one statement as a firm, straight in the database, in a transaction of its own with the
 * firm set (row-level security stays on): what a test checks behind the API's back.
 */
export async function queryAsFirm<T = Record<string, unknown>>(connectionString: string, firmId: string, text: string, values: unknown[] = []): Promise<T[]> {
  const db = new pg.Client({ connectionString })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const { rows } = await db.query(text, values)
    await db.query('commit')
    return rows as T[]
  }
  finally {
    await db.end()
  }
}

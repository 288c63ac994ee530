// The firm's letters, read once per firm scope, for the references the server sends
// (shared/utils/references.ts). Pages never rebuild a reference: the API sends `reference`.
import { eq } from 'drizzle-orm'
import { firms } from '../db/schema'

/**
 * The current firm's letters (BP); its trading name's initials should the column be blank. A
 * signed-in request has them already, read with its session (server/utils/auth.ts).
 */
export function referenceLettersOf(f: FirmScope): Promise<string> {
  f.letters ??= f.tx.select({ letters: firms.referenceLetters, name: firms.tradingName }).from(firms).where(eq(firms.id, f.firmId))
    .then(([firm]) => firm?.letters || firmLetters(firm?.name ?? ''))
  return f.letters
}

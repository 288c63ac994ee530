// Opening a row from a customer's or person's secret link (a quote, an invoice, a calendar feed,
// an invitation, a firm's enquiry form): the one way all five do it.
import { eq, sql, type SQL } from 'drizzle-orm'
import type { PgColumn } from 'drizzle-orm/pg-core'
import { FirmScope, scopeTransaction, type Tx } from './db'
import { hashToken, splitLink, TOKEN_LENGTH } from './tokens'

/**
 * The setting each link sets for row-level security: with it, the one row behind the secret is
 * visible before any firm is chosen (the policies are in drizzle/, "public links").
 */
export type SecretLinkSetting = 'app.quote_token_hash' | 'app.invoice_token_hash' | 'app.calendar_token_hash' | 'app.invite_token_hash' | 'app.enquiry_form_key'

export interface SecretLink<Found extends { firmId: string }, T> {
  setting: SecretLinkSetting
  /** The link as it came in the URL: the firm's part then the secret, or (a link made before 2026-12) the secret alone. */
  secret: string
  /** Kept hashed (tokens) or as it is (the enquiry form's key, which the firm can reset). Default: hashed. */
  hashed?: boolean
  /** The secret's length without the firm's part. Default: a token's (43). */
  secretLength?: number
  /**
   * The rows behind the secret (hashed as stored), still live: not expired, withdrawn, used or
   * reset; in the link's firm when it names one (put `inLinkFirm(table.firmId, firmId)` in the
   * conditions). Exactly one row opens the link.
   */
  find: (tx: Tx, secret: string, firmId: string | null) => Promise<Found[]>
  /** After the transaction is scoped to the row's firm: take locks, check again; undefined when it is gone after all. */
  open: (f: FirmScope, found: Found) => Promise<T | undefined>
  /** The answer to a wrong, expired or withdrawn link (a 404 in words for the person holding it). */
  gone: () => never
}

/** The condition on the firm a link names; none for a link from before links carried their firm. */
export function inLinkFirm(column: PgColumn, firmId: string | null): SQL | undefined {
  return firmId ? eq(column, firmId) : undefined
}

/**
 * Open the row behind a secret link inside `tx`: split off the firm's part, hash the secret, set
 * the link's RLS setting so that row alone is visible, look it up in its firm with its expiry and
 * revocation conditions (`find`), scope the transaction to its firm, then let `open` lock and read
 * what it needs in that firm. Nothing else about any firm is readable before the scope is set; a
 * stranger learns nothing but "gone". A secret is unique within its firm only (the database's
 * keys include firm_id), so an old link without its firm's part that matched rows of two firms
 * would open neither (a 256-bit secret never repeats, but the rule does not lean on it).
 */
export async function withSecretLink<Found extends { firmId: string }, T>(tx: Tx, link: SecretLink<Found, T>): Promise<T> {
  const { firmId, secret: bare } = splitLink(link.secret, link.secretLength ?? TOKEN_LENGTH)
  const secret = link.hashed === false ? bare : hashToken(bare)
  await tx.execute(sql`select set_config(${link.setting}, ${secret}, true)`)
  const found = await link.find(tx, secret, firmId)
  if (found.length !== 1) link.gone()
  await scopeTransaction(tx, found[0]!.firmId, null)
  const opened = await link.open(new FirmScope(tx, found[0]!.firmId, null), found[0]!)
  if (opened === undefined) link.gone()
  return opened
}

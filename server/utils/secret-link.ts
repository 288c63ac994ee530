// Opening a row from a customer's or person's secret link (a quote, an invoice, a calendar feed,
// an invitation, a firm's enquiry form): the one way all five do it.
import { sql } from 'drizzle-orm'
import { FirmScope, scopeTransaction, type Tx } from './db'
import { hashToken } from './tokens'

/**
 * The setting each link sets for row-level security: with it, the one row behind the secret is
 * visible before any firm is chosen (the policies are in drizzle/, "public links").
 */
export type SecretLinkSetting = 'app.quote_token_hash' | 'app.invoice_token_hash' | 'app.calendar_token_hash' | 'app.invite_token_hash' | 'app.enquiry_form_key'

export interface SecretLink<Found extends { firmId: string }, T> {
  setting: SecretLinkSetting
  /** The secret as it came in the URL. */
  secret: string
  /** Kept hashed (tokens) or as it is (the enquiry form's key, which the firm can reset). Default: hashed. */
  hashed?: boolean
  /** The row behind the secret (hashed as stored), still live: not expired, withdrawn, used or reset. */
  find: (tx: Tx, secret: string) => Promise<Found | undefined>
  /** After the transaction is scoped to the row's firm: take locks, check again; undefined when it is gone after all. */
  open: (f: FirmScope, found: Found) => Promise<T | undefined>
  /** The answer to a wrong, expired or withdrawn link (a 404 in words for the person holding it). */
  gone: () => never
}

/**
 * Open the row behind a secret link inside `tx`: hash the secret, set the link's RLS setting so
 * that row alone is visible, look it up with its expiry and revocation conditions, scope the
 * transaction to its firm, then let `open` lock and read what it needs in that firm. Nothing else
 * about any firm is readable before the scope is set; a stranger learns nothing but "gone".
 */
export async function withSecretLink<Found extends { firmId: string }, T>(tx: Tx, link: SecretLink<Found, T>): Promise<T> {
  const secret = link.hashed === false ? link.secret : hashToken(link.secret)
  await tx.execute(sql`select set_config(${link.setting}, ${secret}, true)`)
  const found = await link.find(tx, secret)
  if (!found) link.gone()
  await scopeTransaction(tx, found.firmId, null)
  const opened = await link.open(new FirmScope(tx, found.firmId, null), found)
  if (opened === undefined) link.gone()
  return opened
}

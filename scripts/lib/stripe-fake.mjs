// A local fake of the slice of Stripe that Setwell uses, for development and tests.
//
// What it is: a small HTTP server of our own, on loopback only, that the official `stripe` SDK
// talks to when it is given `host`, `port` and `protocol: 'http'`. It keeps everything in memory
// and nothing it does reaches the internet: webhooks go only to a loopback URL.
//
// What it fakes (Stripe's v1 shapes: form-encoded bodies with nested keys, `{ object: 'list' }`
// lists, `{ error: { type, code, message, param } }` errors, Idempotency-Key replays):
//   - Customers: create, retrieve.
//   - Checkout Sessions (mode=payment with line_items[][price_data]): create, retrieve, list,
//     expire, and their line items; a hosted pay page at /pay/<session id> with Pay and Cancel
//     buttons (plain HTML, no card asked for).
//   - PaymentIntents, Charges, Refunds (create and retrieve), Events (retrieve, list).
//   - Webhooks: checkout.session.completed, payment_intent.succeeded, checkout.session.expired and
//     charge.refunded, signed like Stripe (`Stripe-Signature: t=..,v1=..`), retried when refused,
//     with switches to deliver twice, out of order, late, or with an old signature.
//   - Test controls under /_fake/ (switches, deliveries, events, reset).
// What it does not fake: cards, declines, 3-D Secure, Prices and Products as objects, manual
// capture, subscriptions and setup mode, disputes, payouts, Connect, search, updates, `created`
// filters, rate limits. A parameter Stripe accepts but we do not model is refused with a clear
// "not supported by the Stripe fake" error rather than silently ignored (a few that only change
// how Stripe's own page looks, such as `locale`, are accepted and ignored); a parameter Stripe does
// not know is refused with `parameter_unknown`, as Stripe does.
//
// Going live is configuration only: give the app real keys and no host override, and the same
// SDK calls go to api.stripe.com. Nothing in the app should know it is talking to this fake.
//
// Use: `startStripeFake({ port, webhookUrl, webhookSecret })` from a test, or
// `node scripts/lib/stripe-fake.mjs --port 12111 --webhook-url http://127.0.0.1:3000/api/webhooks/stripe
// --webhook-secret whsec_...` (see "The Stripe fake" in DEVELOPERS.md).
import { createHmac, randomBytes } from 'node:crypto'
import { realpathSync } from 'node:fs'
import { createServer, request as httpRequest } from 'node:http'
import { isIP } from 'node:net'
import { pathToFileURL } from 'node:url'
import { parseArgs } from 'node:util'

/** The API version stripe 23.1.0 pins; events carry it as Stripe's carry the account's version. */
export const API_VERSION = '2026-10-28.endive'

const MAX_BODY_BYTES = 1024 * 1024
const MAX_FORM_DEPTH = 8
const DELIVERY_TIMEOUT_MS = 10_000

const SWITCH_DEFAULTS = Object.freeze({
  duplicate: 1, // deliver each event this many times
  reorder: false, // deliver the events of one action (a batch) last first
  delayMs: 0, // wait this long before delivering a batch
  signWithTimestampOffsetSec: 0, // sign as if the delivery was made this many seconds ago
  retries: 3, // further attempts after a refused delivery (non-2xx or no connection)
  retryDelayMs: 200, // first back-off; doubles on each retry
})

// ---------------------------------------------------------------------------------------------
// Small helpers

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz'

/** An id like Stripe's: the prefix, then `length` base-62 characters from crypto.randomBytes. */
export function randomId(prefix, length = 24) {
  let out = ''
  while (out.length < length) {
    for (const b of randomBytes(length)) {
      // 248 = 4 * 62: dropping the bytes above it keeps every character equally likely
      if (b < 248 && out.length < length) out += ALPHABET[b % 62]
    }
  }
  return prefix + out
}

const nowSec = () => Math.floor(Date.now() / 1000)
const clone = value => structuredClone(value)
const isPlainObject = v => typeof v === 'object' && v !== null && !Array.isArray(v)

function isLoopbackHost(hostname) {
  const h = hostname.replace(/^\[|\]$/g, '').toLowerCase()
  if (h === 'localhost' || h === '::1') return true
  return isIP(h) === 4 && h.startsWith('127.')
}

/** Minor units to words for people, without floats: 12345 GBP -> "£123.45". */
export function formatAmount(amount, currency) {
  const code = currency.toUpperCase()
  let nf
  try {
    nf = new Intl.NumberFormat('en-GB', { style: 'currency', currency: code })
  }
  catch {
    return `${amount} ${code} (minor units)`
  }
  const digits = nf.resolvedOptions().maximumFractionDigits ?? 2
  const sign = amount < 0 ? '-' : ''
  const s = String(Math.abs(amount)).padStart(digits + 1, '0')
  const decimal = digits ? `${s.slice(0, -digits)}.${s.slice(-digits)}` : s
  return nf.format(`${sign}${decimal}`)
}

const escapeHtml = s => String(s).replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c])

// ---------------------------------------------------------------------------------------------
// Errors in Stripe's shape

class FakeError extends Error {
  /**
   * @param {number} status
   * @param {{ type?: string, code?: string, message: string, param?: string }} fields
   * @param {{ replayable?: boolean }} [opts] replayable: false for errors found before the
   *   endpoint starts work (authentication, parameter checks), which Stripe does not keep for an
   *   Idempotency-Key
   */
  constructor(status, { type = 'invalid_request_error', code, message, param }, { replayable = true } = {}) {
    super(message)
    this.status = status
    this.replayable = replayable
    this.body = {
      error: {
        ...(code ? { code, doc_url: `https://stripe.com/docs/error-codes/${code.replace(/_/g, '-')}` } : {}),
        message,
        ...(param ? { param } : {}),
        type,
      },
    }
  }
}

const missing = param => new FakeError(400, { code: 'parameter_missing', message: `Missing required param: ${param}.`, param }, { replayable: false })
const invalid = (param, message, code) => new FakeError(400, { code, message, param }, { replayable: false })
const noSuch = (kind, id, param) => new FakeError(404, { code: 'resource_missing', message: `No such ${kind}: '${id}'`, param })
const unsupported = (param, what = `\`${param}\``) => new FakeError(400, {
  code: 'parameter_unknown',
  message: `The Stripe fake does not support ${what} (Stripe does). Add it to scripts/lib/stripe-fake.mjs if the app needs it.`,
  param,
}, { replayable: false })

// ---------------------------------------------------------------------------------------------
// Form bodies: `a[b][0][c]=v` into nested objects and arrays, as Stripe reads them

const FORBIDDEN_KEYS = new Set(['__proto__', 'constructor', 'prototype'])

/**
 * Parse an application/x-www-form-urlencoded string (or a query string) the way Stripe does:
 * `metadata[invoice_id]=7` is `{ metadata: { invoice_id: '7' } }`, `line_items[0][quantity]=1`
 * an array of objects, `expand[]=x` appends. Every value stays a string. Throws a Stripe-shaped
 * 400 for malformed names, mixed shapes (`a=1&a[b]=2`) and prototype keys.
 */
export function parseForm(text) {
  const root = {}
  if (!text) return root
  for (const pair of text.split('&')) {
    if (!pair) continue
    const eq = pair.indexOf('=')
    const name = decodeFormPart(eq < 0 ? pair : pair.slice(0, eq))
    const value = decodeFormPart(eq < 0 ? '' : pair.slice(eq + 1))
    const m = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(name)
    if (!m) throw invalid(name, `Invalid parameter name: ${name}`, 'parameter_invalid_name')
    const path = [m[1], ...[...m[2].matchAll(/\[([^[\]]*)\]/g)].map(x => x[1])]
    if (path.length > MAX_FORM_DEPTH) throw invalid(name, `Parameters are nested too deeply: ${name}`)
    let node = root
    path.forEach((seg, i) => {
      const last = i === path.length - 1
      if (FORBIDDEN_KEYS.has(seg)) throw invalid(name, `Invalid parameter name: ${name}`, 'parameter_invalid_name')
      if (seg === '') {
        if (!last) throw invalid(name, `Invalid parameter name: ${name} ([] only at the end)`, 'parameter_invalid_name')
        seg = String(Object.keys(node).length)
      }
      if (last) {
        if (isPlainObject(node[seg])) throw invalid(name, `Invalid ${name}: both a value and a hash`)
        node[seg] = value
        return
      }
      if (node[seg] === undefined) node[seg] = {}
      else if (!isPlainObject(node[seg])) throw invalid(name, `Invalid hash: ${path.slice(0, i + 1).join('.')} is both a value and a hash`)
      node = node[seg]
    })
  }
  return arraysFromIndexes(root, '')
}

function decodeFormPart(s) {
  try {
    return decodeURIComponent(s.replace(/\+/g, ' '))
  }
  catch {
    throw invalid(undefined, `Invalid URL encoding: ${s.slice(0, 40)}`)
  }
}

// objects whose keys are all 0, 1, 2... become arrays in index order; metadata keys never do
function arraysFromIndexes(node, key) {
  if (!isPlainObject(node)) return node
  const keys = Object.keys(node)
  for (const k of keys) node[k] = arraysFromIndexes(node[k], k)
  if (key !== 'metadata' && keys.length && keys.every(k => /^(0|[1-9]\d*)$/.test(k))) {
    return keys.map(Number).sort((a, b) => a - b).map(i => node[i])
  }
  return node
}

// ---------------------------------------------------------------------------------------------
// Reading parameters

/**
 * Refuse what Stripe would refuse and what we do not model. `used` and `ignored` are modelled
 * (ignored ones only change Stripe's own page); `known` are Stripe's, not modelled.
 */
function checkParams(p, { used, ignored = [], known = [] }, prefix = '') {
  if (!isPlainObject(p)) throw invalid(prefix || undefined, `Invalid object${prefix ? `: ${prefix}` : ''}`)
  for (const k of Object.keys(p)) {
    const name = prefix ? `${prefix}[${k}]` : k
    if (used.includes(k) || ignored.includes(k)) continue
    if (known.includes(k)) throw unsupported(name)
    throw invalid(name, `Received unknown parameter: ${name}`, 'parameter_unknown')
  }
}

function readString(p, key, { label = key, required = false, max = 5000, allowEmpty = false } = {}) {
  const v = p[key]
  if (v === undefined) {
    if (required) throw missing(label)
    return undefined
  }
  if (typeof v !== 'string') throw invalid(label, `Invalid string: ${label} must be a string`, 'parameter_invalid_string')
  if (v === '' && !allowEmpty) {
    if (required) throw invalid(label, `You passed an empty string for '${label}'. We assume empty values are an attempt to unset a parameter; however '${label}' cannot be unset. You should remove '${label}' from your request or supply a non-empty value.`, 'parameter_invalid_empty')
    return undefined
  }
  if (v.length > max) throw invalid(label, `Invalid ${label}: must be at most ${max} characters`, 'parameter_invalid_string')
  return v
}

function readInteger(p, key, { label = key, required = false, min, max } = {}) {
  const raw = readString(p, key, { label, required })
  if (raw === undefined) return undefined
  const n = /^-?\d+$/.test(raw) ? Number(raw) : Number.NaN
  if (!Number.isSafeInteger(n)) throw invalid(label, `Invalid integer: ${raw}`, 'parameter_invalid_integer')
  if (min !== undefined && n < min) throw invalid(label, `This value must be greater than or equal to ${min}.`, 'parameter_invalid_integer')
  if (max !== undefined && n > max) throw invalid(label, `This value must be less than or equal to ${max}.`, 'parameter_invalid_integer')
  return n
}

function readEnum(p, key, values, { label = key, required = false } = {}) {
  const v = readString(p, key, { label, required })
  if (v !== undefined && !values.includes(v)) throw invalid(label, `Invalid ${label}: must be one of ${values.join(', ')}`)
  return v
}

function readUrl(p, key) {
  const v = readString(p, key)
  if (v === undefined) return null
  let ok = false
  try {
    // `{CHECKOUT_SESSION_ID}` is a template, as on Stripe: braces are fine in the URL
    ok = ['http:', 'https:'].includes(new URL(v.replace('{CHECKOUT_SESSION_ID}', 'x')).protocol)
  }
  catch { /* not a URL */ }
  if (!ok) throw invalid(key, 'Not a valid URL', 'url_invalid')
  return v
}

function readEmail(p, key) {
  const v = readString(p, key, { max: 512 })
  if (v !== undefined && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(v)) throw invalid(key, `Invalid email address: ${v}`, 'email_invalid')
  return v ?? null
}

/** Stripe's metadata rules: at most 50 keys, keys up to 40 characters, values up to 500. */
function readMetadata(p, key, label = key) {
  const v = p[key]
  if (v === undefined || v === '') return {}
  if (!isPlainObject(v)) throw invalid(label, `Invalid object: ${label} must be a hash of strings`)
  const out = {}
  for (const [k, value] of Object.entries(v)) {
    if (typeof value !== 'string') throw invalid(`${label}[${k}]`, `Invalid string: ${label}[${k}] must be a string`, 'parameter_invalid_string')
    if (k.length > 40) throw invalid(`${label}[${k}]`, 'Metadata keys can have up to 40 characters.')
    if (value.length > 500) throw invalid(`${label}[${k}]`, 'Metadata values can have up to 500 characters.')
    if (value !== '') out[k] = value
  }
  if (Object.keys(out).length > 50) throw invalid(label, 'Metadata can have up to 50 keys.')
  return out
}

function readExpand(p) {
  const v = p.expand
  if (v === undefined || v === '') return []
  const list = Array.isArray(v) ? v : [v]
  if (!list.every(x => typeof x === 'string')) throw invalid('expand', 'Invalid array: expand must be a list of strings')
  return list
}

// Stripe's minimum charge per currency, for the currencies we expect (from memory:
// Stripe's "minimum and maximum charge amounts" table); others are not checked.
const MINIMUM_CHARGE = { gbp: 30, eur: 50, usd: 50 }
const MAXIMUM_CHARGE = 99_999_999

// Top-level parameters of the endpoints, from stripe 23.1.0's types (Stripe's OpenAPI spec).
const CUSTOMER_CREATE = {
  used: ['address', 'description', 'email', 'expand', 'metadata', 'name', 'phone', 'preferred_locales', 'tax_exempt'],
  known: ['balance', 'business_name', 'cash_balance', 'individual_name', 'invoice_prefix', 'invoice_settings',
    'next_invoice_sequence', 'payment_method', 'shipping', 'source', 'tax', 'tax_id_data', 'test_clock', 'validate'],
}
const SESSION_CREATE = {
  used: ['cancel_url', 'client_reference_id', 'customer', 'customer_email', 'expand', 'expires_at', 'line_items',
    'metadata', 'mode', 'payment_intent_data', 'success_url', 'ui_mode'],
  // these only change what Stripe's own page shows or asks for
  ignored: ['allowed_payment_method_types', 'billing_address_collection', 'branding_settings', 'custom_text',
    'excluded_payment_method_types', 'locale', 'name_collection', 'payment_method_options',
    'phone_number_collection', 'submit_type', 'wallet_options'],
  known: ['adaptive_pricing', 'after_expiration', 'allow_promotion_codes', 'automatic_tax', 'consent_collection',
    'currency', 'custom_fields', 'customer_account', 'customer_creation', 'customer_update', 'discounts', 'integration_identifier',
    'invoice_creation', 'managed_payments', 'optional_items', 'origin_context', 'payment_method_collection',
    'payment_method_configuration', 'payment_method_data', 'permissions', 'redirect_on_completion', 'return_url',
    'saved_payment_method_options', 'setup_intent_data', 'shipping_address_collection', 'shipping_options',
    'subscription_data', 'tax_id_collection'],
}
const LINE_ITEM = { used: ['price', 'price_data', 'quantity'], ignored: ['metadata'], known: ['adjustable_quantity', 'tax_rates'] }
const PRICE_DATA = {
  used: ['currency', 'product', 'product_data', 'unit_amount'],
  known: ['recurring', 'tax_behavior', 'unit_amount_decimal'],
}
const PRODUCT_DATA = { used: ['description', 'name'], ignored: ['images', 'metadata', 'unit_label'], known: ['tax_code', 'tax_details'] }
const PAYMENT_INTENT_DATA = {
  used: ['description', 'metadata', 'receipt_email'],
  ignored: ['statement_descriptor', 'statement_descriptor_suffix'],
  known: ['application_fee_amount', 'capture_method', 'on_behalf_of', 'setup_future_usage', 'shipping',
    'transfer_data', 'transfer_group'],
}
const SESSION_LIST = {
  used: ['customer', 'ending_before', 'expand', 'limit', 'payment_intent', 'starting_after', 'status'],
  known: ['created', 'customer_account', 'customer_details', 'payment_link', 'subscription'],
}
const REFUND_CREATE = {
  used: ['amount', 'charge', 'expand', 'metadata', 'payment_intent', 'reason'],
  known: ['currency', 'customer', 'instructions_email', 'origin', 'refund_application_fee', 'reverse_transfer'],
}
const EVENT_LIST = { used: ['ending_before', 'expand', 'limit', 'starting_after', 'type', 'types'], known: ['created', 'delivery_success'] }
const RETRIEVE = { used: ['expand'] }

// ---------------------------------------------------------------------------------------------
// The server

/**
 * @typedef {object} StripeFakeOptions
 * @property {number} [port] 0 (the default) picks a free port
 * @property {string} [host] a loopback address; anything else is refused
 * @property {string | null} [webhookUrl] where events are POSTed (loopback http only); none: no deliveries
 * @property {string} [webhookSecret] signs deliveries; a new `whsec_...` when not given
 * @property {string} [publicUrl] base of the hosted pay page links (default: the fake's own URL)
 * @property {string} [apiKey] accept only this secret key (default: any `sk_test_`/`rk_test_` key)
 * @property {(line: string) => void} [log] one line per delivery, for the command line
 *
 * @typedef {object} Delivery
 * @property {string} eventId
 * @property {string} type
 * @property {number} attempt 1 for the first try of a copy, 2 for its first retry...
 * @property {number} copy 1..duplicate
 * @property {string} url
 * @property {number | null} statusCode null when no HTTP answer came (see `error`)
 * @property {boolean} ok
 * @property {string | null} error e.g. ECONNREFUSED
 * @property {string} at ISO time of the answer
 *
 * @typedef {object} Switches
 * @property {number} duplicate deliver each event this many times (1-10)
 * @property {boolean} reorder deliver the events of one action last first
 * @property {number} delayMs wait this long before delivering a batch
 * @property {number} signWithTimestampOffsetSec sign as if sent this many seconds ago
 * @property {number} retries further attempts after a refused delivery
 * @property {number} retryDelayMs the first back-off, doubling on each retry
 * @property {string | null} webhookUrl where deliveries go (loopback http only); null: none
 */

/**
 * Start the fake. Resolves once it is listening.
 * @param {StripeFakeOptions} [options]
 */
export async function startStripeFake({ port = 0, host = '127.0.0.1', webhookUrl = null, webhookSecret, publicUrl, apiKey, log = () => {} } = {}) {
  if (!isLoopbackHost(host)) throw new Error(`The Stripe fake listens on loopback only (127.0.0.1 or ::1), not ${host}`)
  const listenHost = host === 'localhost' ? '127.0.0.1' : host.replace(/^\[|\]$/g, '')
  const secret = webhookSecret ?? randomId('whsec_', 32)
  const initialWebhookUrl = checkWebhookUrl(webhookUrl)

  const state = {
    customers: new Map(),
    sessions: new Map(),
    /** session id -> its line items (Stripe's `item` objects) */
    lineItems: new Map(),
    /** session id -> what payment_intent_data asked for the PaymentIntent made on payment */
    paymentIntentData: new Map(),
    paymentIntents: new Map(),
    charges: new Map(),
    refunds: new Map(),
    /** every event, oldest first */
    events: [],
    /** @type {Delivery[]} every delivery attempt, oldest first */
    deliveries: [],
    /** `<api key> <Idempotency-Key>` -> the saved request and response */
    idempotency: new Map(),
  }
  // id prefix -> the Map that holds such objects (for expand), and the name Stripe's errors use
  const byPrefix = [['cus_', 'customers', 'customer'], ['cs_', 'sessions', 'checkout.session'],
    ['pi_', 'paymentIntents', 'payment_intent'], ['ch_', 'charges', 'charge'], ['re_', 'refunds', 'refund']]
  const kindOf = id => [...byPrefix, ['evt_', null, 'event'], ['li_', null, 'line_item']].find(([prefix]) => id.startsWith(prefix))?.[2] ?? 'object'

  // ---- switches: an object whose setters check what they are given
  const current = { ...SWITCH_DEFAULTS, webhookUrl: initialWebhookUrl }
  const switches = /** @type {Switches} */ ({})
  for (const name of Object.keys(current)) {
    Object.defineProperty(switches, name, {
      enumerable: true,
      get: () => current[name],
      set: (value) => {
        current[name] = checkSwitch(name, value)
      },
    })
  }
  Object.seal(switches)
  /**
   * Set several switches at once; all are checked before any changes.
   * @param {Partial<Switches>} patch
   * @returns {Switches}
   */
  function setSwitches(patch) {
    if (!isPlainObject(patch)) throw new TypeError('switches must be an object')
    const next = {}
    for (const [name, value] of Object.entries(patch)) {
      if (!(name in current)) throw new TypeError(`Unknown switch "${name}"; the switches are ${Object.keys(current).join(', ')}`)
      next[name] = checkSwitch(name, value)
    }
    Object.assign(current, next)
    return { ...current }
  }

  // ---- timers and waiting, so close() and reset() never leave a sleeping delivery behind
  let generation = 0
  let closed = false
  const sleepers = new Set()
  function pause(ms) {
    return new Promise((resolve) => {
      if (closed) return resolve()
      const sleeper = { resolve, timer: setTimeout(() => {
        sleepers.delete(sleeper)
        resolve()
      }, ms) }
      sleepers.add(sleeper)
    })
  }
  function wakeAll() {
    for (const s of sleepers) {
      clearTimeout(s.timer)
      s.resolve()
    }
    sleepers.clear()
  }
  const watchers = new Set()
  const notify = () => watchers.forEach(w => w())

  // ---- events and webhook deliveries
  let queue = Promise.resolve()

  function emit(items, request) {
    const events = items.map(({ type, object }) => {
      const event = {
        id: randomId('evt_'),
        object: 'event',
        api_version: API_VERSION,
        created: nowSec(),
        data: { object: clone(object) },
        livemode: false,
        pending_webhooks: current.webhookUrl ? 1 : 0,
        request: request ? { id: request.id, idempotency_key: request.idempotencyKey } : { id: null, idempotency_key: null },
        type,
      }
      state.events.push(event)
      return event
    })
    notify()
    if (!current.webhookUrl) return
    const gen = generation
    queue = queue.then(() => deliverBatch(events, gen)).catch(err => log(`[stripe-fake] delivery failed: ${err.message}`))
  }

  async function deliverBatch(events, gen) {
    if (current.delayMs > 0) await pause(current.delayMs)
    const ordered = current.reorder ? [...events].reverse() : events
    for (const event of ordered) {
      for (let copy = 1; copy <= current.duplicate; copy++) await deliver(event, copy, gen)
    }
  }

  async function deliver(event, copy, gen) {
    const payload = JSON.stringify(event, null, 2)
    for (let attempt = 1; attempt <= 1 + current.retries; attempt++) {
      const url = current.webhookUrl
      if (closed || gen !== generation || !url) return
      const t = nowSec() - current.signWithTimestampOffsetSec
      const v1 = createHmac('sha256', secret).update(`${t}.${payload}`, 'utf8').digest('hex')
      const result = await postJson(url, payload, { 'Stripe-Signature': `t=${t},v1=${v1}` })
      if (gen !== generation) return
      const ok = result.statusCode !== null && result.statusCode >= 200 && result.statusCode < 300
      state.deliveries.push({ eventId: event.id, type: event.type, attempt, copy, url, statusCode: result.statusCode, ok, error: result.error, at: new Date().toISOString() })
      log(`[stripe-fake] ${event.type} ${event.id} -> ${url}: ${result.statusCode ?? result.error} (attempt ${attempt})`)
      notify()
      if (ok) {
        event.pending_webhooks = 0
        return
      }
      if (attempt <= current.retries) await pause(current.retryDelayMs * 2 ** (attempt - 1))
    }
  }

  // ---- objects

  function find(id) {
    const hit = byPrefix.find(([prefix]) => id.startsWith(prefix))
    return hit ? state[hit[1]].get(id) : undefined
  }

  function lineItemList(sessionId) {
    const data = state.lineItems.get(sessionId) ?? []
    return { object: 'list', data: clone(data), has_more: false, url: `/v1/checkout/sessions/${sessionId}/line_items` }
  }

  /** A copy of `object` with the `expand` paths filled in, as Stripe does (ids become objects). */
  function render(object, paths) {
    const out = clone(object)
    for (const path of paths) {
      let node = out
      const segs = path.split('.')
      if (segs.length > 4) throw invalid('expand', `You cannot expand more than 4 levels of a property (${path}).`)
      segs.forEach((seg, i) => {
        if (node === null || node === undefined) return
        if (seg === 'line_items' && node.object === 'checkout.session') node.line_items = lineItemList(node.id)
        else if (seg !== 'id' && typeof node[seg] === 'string' && find(node[seg])) node[seg] = clone(find(node[seg]))
        else if (!(seg in node) || (node[seg] !== null && !isPlainObject(node[seg]))) {
          throw invalid('expand', `This property cannot be expanded (${segs.slice(0, i + 1).join('.')}).`)
        }
        node = node[seg]
      })
    }
    return out
  }

  /** Stripe's list shape over `items` (newest first), with limit/starting_after/ending_before. */
  function page(items, p, url, expand) {
    const limit = readInteger(p, 'limit', { min: 1, max: 100 }) ?? 10
    const at = (key) => {
      const id = readString(p, key)
      if (id === undefined) return undefined
      const i = items.findIndex(x => x.id === id)
      if (i < 0) throw noSuch(kindOf(id), id, key)
      return i
    }
    const after = at('starting_after')
    const before = at('ending_before')
    let slice, hasMore
    if (before !== undefined) {
      slice = items.slice(Math.max(0, before - limit), before)
      hasMore = before - limit > 0
    }
    else {
      const start = after === undefined ? 0 : after + 1
      slice = items.slice(start, start + limit)
      hasMore = start + limit < items.length
    }
    const itemPaths = expand.map((path) => {
      if (!path.startsWith('data.')) throw invalid('expand', `This property cannot be expanded (${path}).`)
      return path.slice(5)
    })
    return { object: 'list', data: slice.map(x => render(x, itemPaths)), has_more: hasMore, url }
  }

  const newestFirst = map => [...map.values()].reverse()

  /** Open sessions past expires_at expire when next looked at (Stripe does it on a timer). */
  function refreshSession(session) {
    if (session.status === 'open' && nowSec() >= session.expires_at) expireSession(session, null)
    return session
  }

  function expireSession(session, request) {
    session.status = 'expired'
    session.url = null
    emit([{ type: 'checkout.session.expired', object: session }], request)
  }

  function getOr404(store, kind, id, param) {
    const found = state[store].get(id)
    if (!found) throw noSuch(kind, id, param)
    return found
  }

  // ---- API handlers: (params, context, ...path ids) -> [status, body]

  function createCustomer(p) {
    checkParams(p, CUSTOMER_CREATE)
    let address = null
    if (p.address !== undefined && p.address !== '') {
      checkParams(p.address, { used: ['city', 'country', 'line1', 'line2', 'postal_code', 'state'] }, 'address')
      address = Object.fromEntries(['city', 'country', 'line1', 'line2', 'postal_code', 'state']
        .map(k => [k, readString(p.address, k, { label: `address[${k}]`, max: 200 }) ?? null]))
    }
    const locales = p.preferred_locales === undefined || p.preferred_locales === '' ? [] : [p.preferred_locales].flat()
    if (!locales.every(l => typeof l === 'string')) throw invalid('preferred_locales', 'Invalid array: preferred_locales must be a list of strings')
    const customer = {
      id: randomId('cus_', 14),
      object: 'customer',
      address,
      balance: 0,
      created: nowSec(),
      currency: null,
      default_source: null,
      delinquent: false,
      description: readString(p, 'description') ?? null,
      discount: null,
      email: readEmail(p, 'email'),
      invoice_prefix: randomId('', 8).toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: readMetadata(p, 'metadata'),
      name: readString(p, 'name', { max: 256 }) ?? null,
      next_invoice_sequence: 1,
      phone: readString(p, 'phone', { max: 20 }) ?? null,
      preferred_locales: locales,
      shipping: null,
      tax_exempt: readEnum(p, 'tax_exempt', ['none', 'exempt', 'reverse']) ?? 'none',
      test_clock: null,
    }
    const expand = readExpand(p)
    state.customers.set(customer.id, customer)
    return render(customer, expand)
  }

  function retrieve(store, kind, param) {
    return (p, _ctx, id) => {
      checkParams(p, RETRIEVE)
      const object = getOr404(store, kind, id, param)
      return render(store === 'sessions' ? refreshSession(object) : object, readExpand(p))
    }
  }

  function createSession(p) {
    checkParams(p, SESSION_CREATE)
    const mode = readEnum(p, 'mode', ['payment', 'setup', 'subscription'], { required: true })
    if (mode !== 'payment') throw unsupported('mode', `mode=${mode} (only mode=payment)`)
    const uiMode = readEnum(p, 'ui_mode', ['hosted', 'embedded', 'custom']) ?? 'hosted'
    if (uiMode !== 'hosted') throw unsupported('ui_mode', `ui_mode=${uiMode} (only the hosted page)`)
    if (p.line_items === undefined) throw missing('line_items')
    if (!Array.isArray(p.line_items) || p.line_items.length === 0) throw invalid('line_items', 'Invalid array: line_items must be a list of line items')
    if (p.line_items.length > 100) throw invalid('line_items', 'A Checkout Session can have at most 100 line items.')

    const sessionId = randomId('cs_test_', 58)
    const items = p.line_items.map((li, i) => {
      const at = `line_items[${i}]`
      checkParams(li, LINE_ITEM, at)
      if (li.price !== undefined) throw noSuch('price', li.price, `${at}[price]`) // the fake has no Price objects
      if (li.price_data === undefined) throw missing(`${at}[price_data]`)
      const pd = li.price_data
      checkParams(pd, PRICE_DATA, `${at}[price_data]`)
      const currency = readString(pd, 'currency', { label: `${at}[price_data][currency]`, required: true }).toLowerCase()
      if (!/^[a-z]{3}$/.test(currency)) throw invalid(`${at}[price_data][currency]`, `Invalid currency: ${currency}. Stripe currently supports these currencies: gbp, eur, usd, ...`)
      const unitAmount = readInteger(pd, 'unit_amount', { label: `${at}[price_data][unit_amount]`, required: true, min: 0 })
      if (pd.product !== undefined) throw noSuch('product', pd.product, `${at}[price_data][product]`) // nor Products
      if (pd.product_data === undefined) throw missing(`${at}[price_data][product_data]`)
      checkParams(pd.product_data, PRODUCT_DATA, `${at}[price_data][product_data]`)
      const name = readString(pd.product_data, 'name', { label: `${at}[price_data][product_data][name]`, required: true })
      const quantity = readInteger(li, 'quantity', { label: `${at}[quantity]`, required: true, min: 1, max: 999_999 })
      const amount = unitAmount * quantity
      return {
        id: randomId('li_'),
        object: 'item',
        amount_discount: 0,
        amount_subtotal: amount,
        amount_tax: 0,
        amount_total: amount,
        currency,
        description: name,
        price: {
          id: randomId('price_'),
          object: 'price',
          active: false,
          billing_scheme: 'per_unit',
          created: nowSec(),
          currency,
          livemode: false,
          lookup_key: null,
          metadata: {},
          nickname: null,
          product: randomId('prod_', 14),
          recurring: null,
          tax_behavior: 'unspecified',
          tiers_mode: null,
          transform_quantity: null,
          type: 'one_time',
          unit_amount: unitAmount,
          unit_amount_decimal: String(unitAmount),
        },
        quantity,
      }
    })
    const currency = items[0].currency
    items.forEach((item, i) => {
      if (item.currency !== currency) throw invalid(`line_items[${i}][price_data][currency]`, `All line items must use the same currency (${currency}).`)
    })
    const total = items.reduce((sum, item) => sum + item.amount_total, 0)
    if (total < (MINIMUM_CHARGE[currency] ?? 1)) {
      throw invalid('line_items', `The Checkout Session's total amount due must add up to at least ${formatAmount(MINIMUM_CHARGE[currency] ?? 1, currency)}`, 'amount_too_small')
    }
    if (total > MAXIMUM_CHARGE) throw invalid('line_items', `The Checkout Session's total amount due must be no more than ${formatAmount(MAXIMUM_CHARGE, currency)}`, 'amount_too_large')

    const customerId = readString(p, 'customer')
    const customerEmail = readEmail(p, 'customer_email')
    if (customerId && customerEmail) throw invalid('customer_email', 'You may only specify one of these parameters: customer, customer_email.')
    if (customerId) getOr404('customers', 'customer', customerId, 'customer')

    const created = nowSec()
    const expiresAt = readInteger(p, 'expires_at') ?? created + 24 * 3600
    // Stripe's window: 30 minutes to 24 hours after creation (a few seconds' slack for clocks)
    if (expiresAt < created + 30 * 60 - 5) throw invalid('expires_at', 'The `expires_at` timestamp must be at least 30 minutes from Checkout Session creation.')
    if (expiresAt > created + 24 * 3600 + 5) throw invalid('expires_at', 'The `expires_at` timestamp must be less than 24 hours from Checkout Session creation.')

    let pid = {}
    if (p.payment_intent_data !== undefined) {
      checkParams(p.payment_intent_data, PAYMENT_INTENT_DATA, 'payment_intent_data')
      pid = {
        description: readString(p.payment_intent_data, 'description', { label: 'payment_intent_data[description]' }) ?? null,
        metadata: readMetadata(p.payment_intent_data, 'metadata', 'payment_intent_data[metadata]'),
        receipt_email: readEmail(p.payment_intent_data, 'receipt_email'),
      }
    }

    const session = {
      id: sessionId,
      object: 'checkout.session',
      after_expiration: null,
      allow_promotion_codes: null,
      amount_subtotal: total,
      amount_total: total,
      automatic_tax: { enabled: false, liability: null, status: null },
      billing_address_collection: null,
      cancel_url: readUrl(p, 'cancel_url'),
      client_reference_id: readString(p, 'client_reference_id', { max: 200 }) ?? null,
      client_secret: null,
      consent: null,
      consent_collection: null,
      created,
      currency,
      custom_fields: [],
      custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
      customer: customerId ?? null,
      customer_creation: customerId ? null : 'if_required',
      customer_details: null,
      customer_email: customerEmail,
      expires_at: expiresAt,
      invoice: null,
      livemode: false,
      locale: null,
      metadata: readMetadata(p, 'metadata'),
      mode,
      payment_intent: null,
      payment_link: null,
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      shipping_options: [],
      status: 'open',
      submit_type: null,
      subscription: null,
      success_url: readUrl(p, 'success_url'),
      total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
      ui_mode: 'hosted',
      url: `${baseUrl()}/pay/${sessionId}`,
    }
    const expand = readExpand(p)
    state.sessions.set(session.id, session)
    state.lineItems.set(session.id, items)
    state.paymentIntentData.set(session.id, pid)
    return render(session, expand)
  }

  function listSessions(p) {
    checkParams(p, SESSION_LIST)
    const pi = readString(p, 'payment_intent')
    const customer = readString(p, 'customer')
    const status = readEnum(p, 'status', ['open', 'complete', 'expired'])
    const items = newestFirst(state.sessions).map(refreshSession).filter(s =>
      (pi === undefined || s.payment_intent === pi)
      && (customer === undefined || s.customer === customer)
      && (status === undefined || s.status === status))
    return page(items, p, '/v1/checkout/sessions', readExpand(p))
  }

  function listLineItems(p, _ctx, id) {
    checkParams(p, { used: ['ending_before', 'expand', 'limit', 'starting_after'] })
    getOr404('sessions', 'checkout.session', id, 'session')
    return page([...state.lineItems.get(id)], p, `/v1/checkout/sessions/${id}/line_items`, readExpand(p))
  }

  function expireSessionHandler(p, ctx, id) {
    checkParams(p, RETRIEVE)
    const session = refreshSession(getOr404('sessions', 'checkout.session', id, 'session'))
    if (session.status !== 'open') {
      throw new FakeError(400, { message: `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".` })
    }
    expireSession(session, ctx.request)
    return render(session, readExpand(p))
  }

  function createRefund(p, ctx) {
    checkParams(p, REFUND_CREATE)
    const piId = readString(p, 'payment_intent')
    const chargeId = readString(p, 'charge')
    if (!piId && !chargeId) {
      throw new FakeError(400, { code: 'parameter_missing', message: 'One of the following params should be provided for this request: payment_intent or charge.' }, { replayable: false })
    }
    const amountAsked = readInteger(p, 'amount', { min: 1 })
    const reason = readEnum(p, 'reason', ['duplicate', 'fraudulent', 'requested_by_customer']) ?? null
    const metadata = readMetadata(p, 'metadata')
    const expand = readExpand(p)

    let charge
    if (piId) {
      const pi = getOr404('paymentIntents', 'payment_intent', piId, 'payment_intent')
      if (pi.status !== 'succeeded' || !pi.latest_charge) {
        throw new FakeError(400, { code: 'charge_not_refundable', message: `This PaymentIntent (${pi.id}) does not have a successful charge to refund.`, param: 'payment_intent' })
      }
      charge = state.charges.get(pi.latest_charge)
      if (chargeId && chargeId !== charge.id) throw invalid('charge', `Charge ${chargeId} does not belong to PaymentIntent ${pi.id}.`)
    }
    else {
      charge = getOr404('charges', 'charge', chargeId, 'charge')
    }
    const remaining = charge.amount - charge.amount_refunded
    if (remaining <= 0) {
      throw new FakeError(400, { code: 'charge_already_refunded', message: `Charge ${charge.id} has already been refunded.` })
    }
    const amount = amountAsked ?? remaining
    if (amount > remaining) {
      throw new FakeError(400, {
        code: 'amount_too_large',
        message: `Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
        param: 'amount',
      })
    }
    const refund = {
      id: randomId('re_'),
      object: 'refund',
      amount,
      balance_transaction: randomId('txn_'),
      charge: charge.id,
      created: nowSec(),
      currency: charge.currency,
      destination_details: { card: { reference_status: 'pending', reference_type: 'acquirer_reference_number', type: 'refund' }, type: 'card' },
      metadata,
      payment_intent: charge.payment_intent,
      reason,
      receipt_number: null,
      source_transfer_reversal: null,
      status: 'succeeded',
      transfer_reversal: null,
    }
    state.refunds.set(refund.id, refund)
    charge.amount_refunded += amount
    charge.refunded = charge.amount_refunded === charge.amount
    emit([{ type: 'charge.refunded', object: charge }], ctx.request)
    return render(refund, expand)
  }

  function listEvents(p) {
    checkParams(p, EVENT_LIST)
    const type = readString(p, 'type')
    const types = p.types === undefined ? undefined : [p.types].flat()
    const match = (pattern, t) => pattern.endsWith('*') ? t.startsWith(pattern.slice(0, -1)) : t === pattern
    const items = [...state.events].reverse().filter(e =>
      (type === undefined || match(type, e.type)) && (types === undefined || types.some(x => match(String(x), e.type))))
    return page(items, p, '/v1/events', readExpand(p))
  }

  function retrieveEvent(p, _ctx, id) {
    checkParams(p, RETRIEVE)
    const event = state.events.find(e => e.id === id)
    if (!event) throw noSuch('event', id, 'id')
    return render(event, readExpand(p))
  }

  const apiRoutes = [
    ['POST', /^\/v1\/customers$/, createCustomer],
    ['GET', /^\/v1\/customers\/([^/]+)$/, retrieve('customers', 'customer', 'id')],
    ['POST', /^\/v1\/checkout\/sessions$/, createSession],
    ['GET', /^\/v1\/checkout\/sessions$/, listSessions],
    ['GET', /^\/v1\/checkout\/sessions\/([^/]+)$/, retrieve('sessions', 'checkout.session', 'session')],
    ['GET', /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/, listLineItems],
    ['POST', /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/, expireSessionHandler],
    ['GET', /^\/v1\/payment_intents\/([^/]+)$/, retrieve('paymentIntents', 'payment_intent', 'intent')],
    ['GET', /^\/v1\/charges\/([^/]+)$/, retrieve('charges', 'charge', 'charge')],
    ['POST', /^\/v1\/refunds$/, createRefund],
    ['GET', /^\/v1\/refunds\/([^/]+)$/, retrieve('refunds', 'refund', 'refund')],
    ['GET', /^\/v1\/events$/, listEvents],
    ['GET', /^\/v1\/events\/([^/]+)$/, retrieveEvent],
  ]

  function authenticate(req) {
    const header = req.headers.authorization
    if (!header) {
      throw new FakeError(401, { message: 'You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. \'Authorization: Bearer YOUR_SECRET_KEY\'). See https://stripe.com/docs/api#authentication for details, or we can help at https://support.stripe.com/.' }, { replayable: false })
    }
    let key = ''
    const [scheme, value = ''] = header.split(' ', 2)
    if (/^bearer$/i.test(scheme)) key = value.trim()
    else if (/^basic$/i.test(scheme)) key = Buffer.from(value, 'base64').toString('utf8').split(':')[0]
    const masked = key.length > 12 ? `${key.slice(0, 8)}${'*'.repeat(Math.min(key.length - 12, 20))}${key.slice(-4)}` : key
    const valid = apiKey ? key === apiKey : /^(sk|rk)_test_\w+$/.test(key)
    if (!valid) {
      const why = /^(sk|rk)_live_/.test(key) ? ' The Stripe fake only accepts test keys (sk_test_...).' : ''
      throw new FakeError(401, { message: `Invalid API Key provided: ${masked}.${why}` }, { replayable: false })
    }
    return key
  }

  async function handleApi(req, res, url) {
    const requestId = randomId('req_', 14)
    const headers = { 'Request-Id': requestId, 'Stripe-Version': req.headers['stripe-version'] ?? API_VERSION }
    const route = apiRoutes.find(([method, re]) => method === req.method && re.test(url.pathname))
    try {
      if (!route) throw unrecognized(req)
      const key = authenticate(req)
      const body = await readBody(req)
      if (req.method === 'POST' && body && !/^application\/x-www-form-urlencoded\b/i.test(req.headers['content-type'] ?? '')) {
        throw new FakeError(400, { message: `Invalid request: unsupported Content-Type ${req.headers['content-type'] ?? '(none)'}. Stripe's v1 API takes application/x-www-form-urlencoded bodies.` }, { replayable: false })
      }
      const params = parseForm(req.method === 'GET' ? url.search.slice(1) : body)
      const ids = route[1].exec(url.pathname).slice(1).map(decodeURIComponent)
      const idempotencyKey = req.method === 'POST' ? req.headers['idempotency-key'] ?? null : null
      const context = { request: { id: requestId, idempotencyKey } }
      if (idempotencyKey === null) {
        return sendJson(res, 200, run(route[2], params, context, ids), headers)
      }
      if (idempotencyKey.length > 255) throw invalid(undefined, 'Idempotency keys can be at most 255 characters long.')
      headers['Idempotency-Key'] = idempotencyKey
      const slot = `${key} ${idempotencyKey}`
      const fingerprint = `${req.method} ${url.pathname} ${canonical(params)}`
      const saved = state.idempotency.get(slot)
      if (saved) {
        if (saved.fingerprint !== fingerprint) {
          throw new FakeError(400, { type: 'idempotency_error', message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.` }, { replayable: false })
        }
        return sendJson(res, saved.status, saved.body, { ...headers, 'Request-Id': saved.requestId, 'Idempotent-Replayed': 'true' })
      }
      let status = 200
      let result
      try {
        result = run(route[2], params, context, ids)
      }
      catch (err) {
        if (!(err instanceof FakeError) || !err.replayable) throw err
        status = err.status
        result = err.body
      }
      state.idempotency.set(slot, { fingerprint, status, body: result, requestId })
      return sendJson(res, status, result, headers)
    }
    catch (err) {
      return sendError(res, err, headers)
    }
  }

  function run(handler, params, context, ids) {
    return handler(params, context, ...ids)
  }

  // ---- the hosted pay page

  function payPage(session, { status = 200, notice } = {}) {
    const items = state.lineItems.get(session.id) ?? []
    const total = formatAmount(session.amount_total, session.currency)
    const base = `/pay/${encodeURIComponent(session.id)}`
    let body
    if (notice) {
      body = `<p class="notice" role="status">${notice}</p>`
    }
    else if (session.status === 'complete') {
      body = `<p class="notice" role="status">This payment is already complete. Nothing more will be taken.</p>${session.success_url ? `<p><a href="${escapeHtml(successUrl(session))}">Go back to the site</a></p>` : ''}`
    }
    else if (session.status === 'expired') {
      body = '<p class="notice" role="status">This payment link has expired, so it cannot be paid. Ask for a new link.</p>'
    }
    else {
      body = `<p class="total">Amount to pay: <strong>${escapeHtml(total)}</strong></p>
<div class="actions">
<form method="post" action="${base}/pay"><button type="submit" class="pay">Pay ${escapeHtml(total)}</button></form>
${session.cancel_url ? `<form method="post" action="${base}/cancel"><button type="submit" class="cancel">Cancel and go back</button></form>` : ''}
</div>`
    }
    const rows = items.map(item => `<tr><td>${escapeHtml(item.description)}</td><td class="num">${item.quantity}</td><td class="num">${escapeHtml(formatAmount(item.amount_total, item.currency))}</td></tr>`).join('\n')
    return [status, `<!doctype html>
<html lang="en-GB">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Test payment — no money moves</title>
<style>
body { font: 18px/1.5 system-ui, sans-serif; color: #1a1a1a; background: #fff; margin: 0; }
main { max-width: 34rem; margin: 0 auto; padding: 1.5rem 1rem; }
h1 { font-size: 1.6rem; margin: 0 0 .5rem; }
.fake { background: #fff4d6; border: 2px solid #7a4a00; color: #4a2d00; padding: .75rem 1rem; border-radius: .5rem; }
table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
caption { text-align: left; font-weight: 600; padding-bottom: .25rem; }
th, td { text-align: left; padding: .4rem .25rem; border-bottom: 1px solid #767676; }
.num { text-align: right; font-variant-numeric: tabular-nums; }
.total { font-size: 1.25rem; }
.notice { font-size: 1.15rem; border-left: 6px solid #1f4e79; padding: .5rem 1rem; background: #eef4fa; }
.actions { display: flex; flex-wrap: wrap; gap: .75rem; margin-top: 1rem; }
button { font: inherit; font-weight: 600; min-height: 48px; padding: .6rem 1.4rem; border-radius: .5rem; cursor: pointer; }
.pay { background: #1f4e79; color: #fff; border: 2px solid #1f4e79; }
.cancel { background: #fff; color: #1a1a1a; border: 2px solid #1a1a1a; }
button:focus-visible, a:focus-visible { outline: 3px solid #b35900; outline-offset: 3px; }
a { color: #1f4e79; }
</style>
</head>
<body>
<main>
<h1>Test payment — no money moves</h1>
<p class="fake">This is Setwell's local Stripe fake. No card is asked for and nothing is charged.</p>
<table>
<caption>What this payment is for</caption>
<thead><tr><th scope="col">Item</th><th scope="col" class="num">Quantity</th><th scope="col" class="num">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
<tfoot><tr><th scope="row" colspan="2">Total</th><td class="num">${escapeHtml(total)}</td></tr></tfoot>
</table>
${body}
</main>
</body>
</html>
`]
  }

  const successUrl = session => session.success_url.replaceAll('{CHECKOUT_SESSION_ID}', session.id)

  function pay(session) {
    const created = nowSec()
    const pid = state.paymentIntentData.get(session.id) ?? {}
    const customer = session.customer ? state.customers.get(session.customer) : undefined
    const email = session.customer_email ?? customer?.email ?? null
    const piId = randomId('pi_')
    const chargeId = randomId('ch_')
    const paymentMethod = randomId('pm_')
    const card = { brand: 'visa', country: 'GB', exp_month: 12, exp_year: new Date().getFullYear() + 3, fingerprint: randomId('', 16), funding: 'credit', last4: '4242' }
    const paymentIntent = {
      id: piId,
      object: 'payment_intent',
      amount: session.amount_total,
      amount_capturable: 0,
      amount_details: { tip: {} },
      amount_received: session.amount_total,
      application: null,
      application_fee_amount: null,
      automatic_payment_methods: null,
      canceled_at: null,
      cancellation_reason: null,
      capture_method: 'automatic_async',
      client_secret: `${piId}_secret_${randomId('', 25)}`,
      confirmation_method: 'automatic',
      created,
      currency: session.currency,
      customer: session.customer,
      description: pid.description ?? null,
      last_payment_error: null,
      latest_charge: chargeId,
      livemode: false,
      metadata: clone(pid.metadata ?? {}),
      next_action: null,
      on_behalf_of: null,
      payment_method: paymentMethod,
      payment_method_configuration_details: null,
      payment_method_options: { card: { installments: null, mandate_options: null, network: null, request_three_d_secure: 'automatic' } },
      payment_method_types: ['card'],
      processing: null,
      receipt_email: pid.receipt_email ?? null,
      review: null,
      setup_future_usage: null,
      shipping: null,
      source: null,
      statement_descriptor: null,
      statement_descriptor_suffix: null,
      status: 'succeeded',
      transfer_data: null,
      transfer_group: null,
    }
    const charge = {
      id: chargeId,
      object: 'charge',
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      application: null,
      application_fee: null,
      application_fee_amount: null,
      balance_transaction: randomId('txn_'),
      billing_details: { address: { city: null, country: null, line1: null, line2: null, postal_code: null, state: null }, email, name: null, phone: null },
      calculated_statement_descriptor: 'SETWELL TEST',
      captured: true,
      created,
      currency: session.currency,
      customer: session.customer,
      description: pid.description ?? null,
      disputed: false,
      failure_balance_transaction: null,
      failure_code: null,
      failure_message: null,
      fraud_details: {},
      livemode: false,
      metadata: clone(pid.metadata ?? {}),
      on_behalf_of: null,
      outcome: { network_status: 'approved_by_network', reason: null, risk_level: 'normal', risk_score: 20, seller_message: 'Payment complete.', type: 'authorized' },
      paid: true,
      payment_intent: piId,
      payment_method: paymentMethod,
      payment_method_details: { card, type: 'card' },
      receipt_email: pid.receipt_email ?? null,
      receipt_number: null,
      receipt_url: null,
      refunded: false,
      review: null,
      shipping: null,
      source: null,
      source_transfer: null,
      statement_descriptor: null,
      statement_descriptor_suffix: null,
      status: 'succeeded',
      transfer_data: null,
      transfer_group: null,
    }
    state.paymentIntents.set(piId, paymentIntent)
    state.charges.set(chargeId, charge)
    Object.assign(session, {
      status: 'complete',
      payment_status: 'paid',
      payment_intent: piId,
      url: null,
      customer_details: { address: null, email, name: null, phone: null, tax_exempt: 'none', tax_ids: [] },
    })
    emit([
      { type: 'checkout.session.completed', object: session },
      { type: 'payment_intent.succeeded', object: paymentIntent },
    ], null)
  }

  async function handlePay(req, res, url) {
    const m = /^\/pay\/([^/]+)(?:\/(pay|cancel))?$/.exec(url.pathname)
    const action = m?.[2]
    if (!m || (action ? req.method !== 'POST' : req.method !== 'GET')) return sendError(res, unrecognized(req))
    await readBody(req) // the form sends nothing we need
    const session = state.sessions.get(decodeURIComponent(m[1]))
    if (!session) {
      return sendHtml(res, 404, '<!doctype html><html lang="en-GB"><head><meta charset="utf-8"><title>Payment not found</title></head><body><main><h1>Payment not found</h1><p>There is no payment at this link. Check the link, or ask for a new one.</p></main></body></html>')
    }
    refreshSession(session)
    if (!action) return sendHtml(res, ...payPage(session, { status: session.status === 'expired' ? 410 : 200 }))
    if (session.status === 'complete') {
      return sendHtml(res, ...payPage(session, { status: 409 }))
    }
    if (session.status === 'expired') return sendHtml(res, ...payPage(session, { status: 410 }))
    if (action === 'cancel') {
      if (session.cancel_url) return redirect(res, session.cancel_url)
      return sendHtml(res, ...payPage(session, { notice: 'Payment cancelled. Nothing was taken.' }))
    }
    pay(session)
    if (session.success_url) return redirect(res, successUrl(session))
    return sendHtml(res, ...payPage(session, { notice: 'Payment complete (a test: no money moved). You can close this page.' }))
  }

  // ---- test controls

  async function handleControl(req, res, url) {
    const route = `${req.method} ${url.pathname}`
    if (route === 'GET /_fake/deliveries') return sendJson(res, 200, { data: clone(state.deliveries) })
    if (route === 'GET /_fake/events') return sendJson(res, 200, { data: clone(state.events) })
    if (route === 'GET /_fake/switches') return sendJson(res, 200, { ...current })
    if (route === 'POST /_fake/reset') {
      await readBody(req)
      reset()
      return sendJson(res, 200, { ok: true })
    }
    if (route === 'POST /_fake/switches') {
      // JSON only: a web page cannot send that cross-site without a preflight we never answer
      if (!/^application\/json\b/i.test(req.headers['content-type'] ?? '')) {
        return sendError(res, new FakeError(415, { message: 'Send the switches as JSON (Content-Type: application/json).' }))
      }
      let patch
      try {
        patch = JSON.parse(await readBody(req) || '{}')
      }
      catch {
        return sendError(res, new FakeError(400, { message: 'The body is not valid JSON.' }))
      }
      try {
        return sendJson(res, 200, setSwitches(patch))
      }
      catch (err) {
        return sendError(res, new FakeError(400, { message: err.message }))
      }
    }
    return sendError(res, unrecognized(req))
  }

  function reset() {
    generation++
    wakeAll()
    for (const value of Object.values(state)) {
      if (value instanceof Map) value.clear()
      else value.length = 0
    }
    Object.assign(current, SWITCH_DEFAULTS, { webhookUrl: initialWebhookUrl })
    notify()
  }

  // ---- plumbing

  const server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://stripe-fake.invalid')
    const handler = url.pathname.startsWith('/v1/')
      ? handleApi
      : url.pathname.startsWith('/pay/') ? handlePay : url.pathname.startsWith('/_fake/') ? handleControl : null
    const done = handler ? handler(req, res, url) : sendError(res, unrecognized(req))
    Promise.resolve(done).catch(err => sendError(res, err))
  })
  await new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, listenHost, () => {
      server.off('error', reject)
      resolve()
    })
  })
  const address = server.address()
  const actualPort = typeof address === 'object' && address ? address.port : port
  const ownUrl = `http://${isIP(listenHost) === 6 ? `[${listenHost}]` : listenHost}:${actualPort}`
  const baseUrl = () => (publicUrl ?? ownUrl).replace(/\/+$/, '')

  return {
    url: ownUrl,
    host: listenHost,
    port: actualPort,
    webhookSecret: secret,
    /** The live in-memory objects (Maps by id), for tests that need to look or nudge. */
    state,
    /** Settable switches: `fake.switches.duplicate = 2`; a bad value throws. */
    switches,
    setSwitches,
    /** Forget every object, event, delivery and idempotency key; switches back to their defaults. */
    reset,
    /** Resolves once `predicate(deliveries)` is true (or a count of deliveries is reached). */
    waitForDeliveries(predicate, { timeoutMs = 5000 } = {}) {
      const test = typeof predicate === 'number' ? d => d.length >= predicate : predicate
      return new Promise((resolve, reject) => {
        const check = () => {
          if (!test(state.deliveries)) return
          cleanup()
          resolve(state.deliveries)
        }
        const timer = setTimeout(() => {
          cleanup()
          reject(new Error(`Timed out after ${timeoutMs} ms waiting for webhook deliveries; so far: ${JSON.stringify(state.deliveries.map(d => [d.type, d.attempt, d.statusCode ?? d.error]))}`))
        }, timeoutMs)
        const cleanup = () => {
          clearTimeout(timer)
          watchers.delete(check)
        }
        watchers.add(check)
        check()
      })
    },
    /** Resolves when no delivery is queued or in flight. */
    async idle() {
      let seen
      do {
        seen = queue
        await seen
      } while (seen !== queue)
    },
    /** Stop listening, drop queued deliveries, close open connections. */
    async close() {
      if (closed) return
      closed = true
      wakeAll()
      await new Promise((resolve) => {
        server.close(() => resolve())
        server.closeAllConnections()
      })
      await queue
    },
  }
}

// ---------------------------------------------------------------------------------------------
// Functions that need no state

function checkWebhookUrl(value) {
  if (value === null || value === undefined || value === '') return null
  let url
  try {
    url = new URL(value)
  }
  catch {
    throw new TypeError(`webhookUrl is not a URL: ${value}`)
  }
  if (url.protocol !== 'http:') throw new TypeError(`webhookUrl must be http:// (got ${url.protocol})`)
  if (!isLoopbackHost(url.hostname)) throw new TypeError(`webhookUrl must be on loopback (127.0.0.1, ::1 or localhost), not ${url.hostname}: the fake sends nothing off this machine`)
  return url.href
}

function checkSwitch(name, value) {
  const int = (min, max) => {
    if (!Number.isInteger(value) || value < min || value > max) throw new TypeError(`${name} must be a whole number from ${min} to ${max}`)
    return value
  }
  switch (name) {
    case 'duplicate': return int(1, 10)
    case 'reorder':
      if (typeof value !== 'boolean') throw new TypeError('reorder must be true or false')
      return value
    case 'delayMs': return int(0, 600_000)
    case 'signWithTimestampOffsetSec': return int(-86_400, 86_400)
    case 'retries': return int(0, 10)
    case 'retryDelayMs': return int(0, 60_000)
    case 'webhookUrl': return checkWebhookUrl(value)
    default: throw new TypeError(`Unknown switch "${name}"`)
  }
}

function unrecognized(req) {
  return new FakeError(404, { message: `Unrecognized request URL (${req.method}: ${(req.url ?? '/').split('?')[0]}). Please see https://stripe.com/docs or we can help at https://support.stripe.com/.` }, { replayable: false })
}

/** Sorted-key JSON, so the same parameters in another order are the same request. */
function canonical(value) {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`
  if (isPlainObject(value)) return `{${Object.keys(value).sort().map(k => `${JSON.stringify(k)}:${canonical(value[k])}`).join(',')}}`
  return JSON.stringify(value)
}

function readBody(req) {
  return new Promise((resolve, reject) => {
    const chunks = []
    let size = 0
    req.on('data', (chunk) => {
      size += chunk.length
      if (size > MAX_BODY_BYTES) {
        reject(new FakeError(413, { message: `Request bodies are limited to ${MAX_BODY_BYTES} bytes.` }, { replayable: false }))
        req.destroy()
        return
      }
      chunks.push(chunk)
    })
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')))
    req.on('error', reject)
  })
}

function sendJson(res, status, body, headers = {}) {
  if (res.headersSent) return
  const text = JSON.stringify(body, null, 2)
  res.writeHead(status, { 'Content-Type': 'application/json', 'Cache-Control': 'no-cache, no-store', 'Content-Length': Buffer.byteLength(text), ...headers })
  res.end(text)
}

function sendError(res, err, headers = {}) {
  if (err instanceof FakeError) return sendJson(res, err.status, err.body, headers)
  return sendJson(res, 500, { error: { message: `The Stripe fake failed: ${err?.message ?? err}`, type: 'api_error' } }, headers)
}

function sendHtml(res, status, html) {
  if (res.headersSent) return
  res.writeHead(status, {
    'Content-Type': 'text/html; charset=utf-8',
    'Cache-Control': 'no-store',
    // no scripts, no outside assets; form-action is left open so the 303 to success_url works
    'Content-Security-Policy': 'default-src \'none\'; style-src \'unsafe-inline\'; base-uri \'none\'; frame-ancestors \'none\'',
    'X-Content-Type-Options': 'nosniff',
    'Content-Length': Buffer.byteLength(html),
  })
  res.end(html)
}

function redirect(res, location) {
  res.writeHead(303, { 'Location': location, 'Cache-Control': 'no-store', 'Content-Length': 0 })
  res.end()
}

/** POST a webhook; resolves with the HTTP status, or null and the error code when none came. */
function postJson(url, payload, headers) {
  return new Promise((resolve) => {
    let settled = false
    const finish = (statusCode, error = null) => {
      if (settled) return
      settled = true
      resolve({ statusCode, error })
    }
    const req = httpRequest(url, {
      method: 'POST',
      agent: false,
      headers: {
        'Content-Type': 'application/json; charset=utf-8',
        'Content-Length': Buffer.byteLength(payload),
        'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
        'Cache-Control': 'no-cache',
        'Accept': '*/*; q=0.5, application/xml',
        ...headers,
      },
      timeout: DELIVERY_TIMEOUT_MS,
    }, (res) => {
      res.resume()
      res.on('end', () => finish(res.statusCode ?? null))
      res.on('close', () => finish(res.statusCode ?? null))
      res.on('error', () => finish(res.statusCode ?? null))
    })
    req.on('timeout', () => req.destroy(Object.assign(new Error('timed out'), { code: 'ETIMEDOUT' })))
    req.on('error', err => finish(null, err.code ?? err.message))
    req.end(payload)
  })
}

// ---------------------------------------------------------------------------------------------
// As a script: node scripts/lib/stripe-fake.mjs --port 12111 --webhook-url ... --webhook-secret ...

function isMain() {
  if (!process.argv[1]) return false
  try {
    return import.meta.url === pathToFileURL(realpathSync(process.argv[1])).href
  }
  catch {
    return false
  }
}

if (isMain()) {
  const { values } = parseArgs({
    options: {
      'port': { type: 'string', default: '12111' },
      'host': { type: 'string', default: '127.0.0.1' },
      'webhook-url': { type: 'string' },
      'webhook-secret': { type: 'string' },
      'public-url': { type: 'string' },
      'api-key': { type: 'string' },
      'verbose': { type: 'boolean', default: false },
    },
  })
  const port = Number(values.port)
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`--port must be a port number, not ${values.port}`)
  const fake = await startStripeFake({
    port,
    host: values.host,
    webhookUrl: values['webhook-url'] ?? null,
    webhookSecret: values['webhook-secret'],
    publicUrl: values['public-url'],
    apiKey: values['api-key'],
    log: values.verbose ? line => console.error(line) : undefined,
  })
  const to = fake.switches.webhookUrl ? `webhooks to ${fake.switches.webhookUrl}` : 'no webhook URL'
  const signed = values['webhook-secret'] ? '' : `, signed with ${fake.webhookSecret}`
  console.log(`[stripe-fake] listening on ${fake.url} (${to}${signed})`)
  const stop = async () => {
    await fake.close()
    process.exit(0)
  }
  process.once('SIGINT', stop)
  process.once('SIGTERM', stop)
}

// Importing customers from a CSV file: which column holds which field, turning one row of the
// file into a customer, and the key that makes a second run of the same file write nothing new.
// Pure: the page parses the file (papaparse) and checks every row with these before anything is
// sent; the route (server/api/customers/import.post.ts) checks each row again with the same schema.
import { z } from 'zod'
import { fieldErrors } from '../schemas/common'
import { customerSchema, type Customer } from '../schemas/customer'
import { CUSTOMER_KIND_LABELS, CUSTOMER_KINDS, type CustomerKind } from './ledger'

/** The customer fields a file can fill, in the order the mapping form shows them. */
export const CUSTOMER_IMPORT_FIELDS = [
  'name', 'kind', 'contactName', 'email', 'phone',
  'billingLine1', 'billingLine2', 'billingTown', 'billingPostcode',
  'vatRegistered', 'vatNumber', 'paysUnderCis', 'cisRatePercent', 'endUserNotified', 'notes',
] as const
export type CustomerImportField = (typeof CUSTOMER_IMPORT_FIELDS)[number]

/** What each field is called on the page, in the rejected-rows file and in the blank template. */
export const CUSTOMER_IMPORT_FIELD_LABELS: Record<CustomerImportField, string> = {
  name: 'Name',
  kind: 'Kind',
  contactName: 'Contact name',
  email: 'E-mail',
  phone: 'Phone',
  billingLine1: 'Address line 1',
  billingLine2: 'Address line 2',
  billingTown: 'Town',
  billingPostcode: 'Postcode',
  vatRegistered: 'VAT registered',
  vatNumber: 'VAT number',
  paysUnderCis: 'Pays under CIS',
  cisRatePercent: 'CIS rate',
  endUserNotified: 'End user notified',
  notes: 'Notes',
}

/** A line under a field in the mapping form: what the column should hold. */
export const CUSTOMER_IMPORT_FIELD_HINTS: Partial<Record<CustomerImportField, string>> = {
  name: 'Needed for every row: the person or the firm.',
  kind: 'Homeowner, landlord, letting agent, builder, contractor or business. Blank means homeowner.',
  vatRegistered: 'Yes or no. Blank means yes when there is a VAT number.',
  paysUnderCis: 'Yes or no. Blank means yes when there is a CIS rate.',
  cisRatePercent: '0, 20 or 30 (a % sign is fine).',
  endUserNotified: 'Yes or no: they told you in writing they are an end user or intermediary.',
}

/** Which column of the file (by its heading) fills each field; '' when none does. */
export type CustomerImportMapping = Record<CustomerImportField, string>

/** The most rows one request may carry, and how many the page sends at a time (well under the 256 KiB body limit). */
export const CUSTOMER_IMPORT_MAX_ROWS = 500
export const CUSTOMER_IMPORT_BATCH_ROWS = 200
/** The page also keeps each request's JSON under this many bytes, so long notes cannot push a batch over the limit. */
export const CUSTOMER_IMPORT_BATCH_BYTES = 200 * 1024

/** The body of POST /api/customers/import. Each row is checked on its own (customerSchema), so one bad row never blocks the rest. */
export const customerImportBatchSchema = z.object({
  rows: z.array(z.unknown(), { error: 'Send the rows as a list.' })
    .min(1, { error: 'Send at least one row.' })
    .max(CUSTOMER_IMPORT_MAX_ROWS, { error: `Send at most ${CUSTOMER_IMPORT_MAX_ROWS} rows at a time.` }),
})

/** What the route answers for one batch. `index` is the row's place in the batch sent, from 0. */
export interface CustomerImportResult {
  created: number
  skipped: number
  rejected: { index: number, errors: Record<string, string> }[]
}

// --- Guessing the mapping from the headings -------------------------------------------------

/** A heading as we compare it: lower case, letters and digits only ("E-mail " -> "email"). */
function squash(s: string): string {
  return s.normalize('NFKD').toLowerCase().replace(/[^a-z0-9]/g, '')
}

/** Headings people use for each field, squashed. Earlier words win when a file has two candidates. */
const HEADING_WORDS: Record<CustomerImportField, string[]> = {
  name: ['name', 'customername', 'customer', 'clientname', 'client', 'fullname', 'companyname', 'company', 'businessname'],
  kind: ['kind', 'type', 'typekind', 'kindtype', 'customertype', 'customerkind', 'category'],
  contactName: ['contactname', 'contact', 'contactperson', 'maincontact', 'attention'],
  email: ['email', 'emailaddress', 'mail'],
  phone: ['phone', 'phonenumber', 'telephone', 'tel', 'mobile', 'mobilenumber', 'mobilephone', 'mob', 'landline'],
  billingLine1: ['addressline1', 'address1', 'line1', 'address', 'street', 'streetaddress', 'billingaddress', 'houseandstreet'],
  billingLine2: ['addressline2', 'address2', 'line2', 'locality', 'area', 'district'],
  billingTown: ['town', 'city', 'towncity', 'cityortown', 'townorcity', 'posttown'],
  billingPostcode: ['postcode', 'postalcode', 'postcodezip', 'zip', 'zipcode', 'pcode'],
  vatRegistered: ['vatregistered', 'registeredforvat', 'vatreg', 'vatregistration'],
  vatNumber: ['vatnumber', 'vatno', 'vatregnumber', 'vatregno', 'vatregistrationnumber', 'vatid'],
  paysUnderCis: ['paysundercis', 'undercis', 'cis', 'ciscontractor', 'cisdeducts', 'cisdeduction'],
  cisRatePercent: ['cisrate', 'cisratepercent', 'cispercent', 'cisdeductionrate'],
  endUserNotified: ['endusernotified', 'enduser', 'endusernotice', 'enduserorintermediary', 'intermediary'],
  notes: ['notes', 'note', 'comments', 'comment', 'remarks'],
}
// our own labels (the blank template's headings) always match
for (const field of CUSTOMER_IMPORT_FIELDS) {
  const own = squash(CUSTOMER_IMPORT_FIELD_LABELS[field])
  if (!HEADING_WORDS[field].includes(own)) HEADING_WORDS[field].unshift(own)
}

/** Words a heading may start with that say nothing about the field ("Customer e-mail", "Billing postcode"). */
const HEADING_PREFIXES = ['customer', 'client', 'billing', 'invoice', 'main', 'primary']

export function emptyImportMapping(): CustomerImportMapping {
  return Object.fromEntries(CUSTOMER_IMPORT_FIELDS.map(f => [f, ''])) as CustomerImportMapping
}

/**
 * A first guess at which heading fills which field, ignoring case, spaces and punctuation. Each
 * heading fills one field at most; a field with no likely heading is left ''.
 */
export function guessMapping(headers: readonly string[]): CustomerImportMapping {
  const mapping = emptyImportMapping()
  const used = new Set<string>()
  const candidates = headers.map((h) => {
    const s = squash(h)
    const forms = [s]
    for (const p of HEADING_PREFIXES) if (s.startsWith(p) && s.length > p.length) forms.push(s.slice(p.length))
    return { header: h, forms }
  })
  // strongest first: the exact heading, then the heading without a prefix; within each, the earlier word
  for (const round of [0, 1] as const) {
    for (const field of CUSTOMER_IMPORT_FIELDS) {
      if (mapping[field]) continue
      for (const word of HEADING_WORDS[field]) {
        const hit = candidates.find(c => !used.has(c.header) && (round === 0 ? c.forms[0] === word : c.forms.slice(1).includes(word)))
        if (hit) {
          mapping[field] = hit.header
          used.add(hit.header)
          break
        }
      }
    }
  }
  return mapping
}

// --- One row of the file -> the input of customerSchema -------------------------------------

/**
 * The input for customerSchema from one row. A cell we cannot read (a kind we do not know, "maybe"
 * for a yes/no, "25%" as a CIS rate) is passed on as written, so the schema refuses that row
 * rather than our guessing.
 */
export interface ImportedCustomer {
  kind: string
  name: string
  contactName: string
  email: string
  phone: string
  billingLine1: string
  billingLine2: string
  billingTown: string
  billingPostcode: string
  notes: string
  vatRegistered: boolean | string
  vatNumber: string
  paysUnderCis: boolean | string
  cisRatePercent: number | string | null
  endUserNotified: boolean | string
}

const KIND_WORDS: Record<string, CustomerKind> = {
  'homeowner': 'homeowner',
  'home owner': 'homeowner',
  'householder': 'homeowner',
  'owner occupier': 'homeowner',
  'private': 'homeowner',
  'private client': 'homeowner',
  'domestic': 'homeowner',
  'individual': 'homeowner',
  'landlord': 'landlord',
  'letting agent': 'landlord',
  'letting agents': 'landlord',
  'lettings': 'landlord',
  'lettings agent': 'landlord',
  'estate agent': 'landlord',
  'agent': 'landlord',
  'property manager': 'landlord',
  'managing agent': 'landlord',
  'builder': 'builder',
  'builders': 'builder',
  'contractor': 'builder',
  'main contractor': 'builder',
  'building contractor': 'builder',
  'developer': 'builder',
  'business': 'business',
  'company': 'business',
  'commercial': 'business',
  'trade': 'business',
  'shop': 'business',
  'other': 'business',
}
for (const kind of CUSTOMER_KINDS) {
  KIND_WORDS[kind] = kind
  KIND_WORDS[CUSTOMER_KIND_LABELS[kind].toLowerCase()] = kind
}

/** "Letting agent", " LANDLORD ", "builder/contractor" -> our kind; '' -> homeowner; anything else as written. */
export function parseImportKind(cell: string): CustomerKind | string {
  const words = cell.normalize('NFKD').toLowerCase().replace(/[^a-z]+/g, ' ').trim()
  if (!words) return 'homeowner'
  if (KIND_WORDS[words]) return KIND_WORDS[words]
  // "builder / contractor", "landlord or letting agent": every word points at one kind
  const kinds = new Set<CustomerKind | undefined>(words.split(' ').filter(w => w !== 'or' && w !== 'and').map(w => KIND_WORDS[w]))
  if (kinds.size === 1 && !kinds.has(undefined)) return [...kinds][0]!
  return cell.trim()
}

const YES = new Set(['yes', 'y', 'true', 't', '1', 'x', '✓', '✔'])
const NO = new Set(['no', 'n', 'false', 'f', '0', '-'])

/** yes/no/true/false/1/0 (any case) -> a boolean; '' -> null (not said); anything else as written. */
export function parseImportFlag(cell: string): boolean | null | string {
  const v = cell.trim().toLowerCase()
  if (v === '') return null
  if (YES.has(v)) return true
  if (NO.has(v)) return false
  return cell.trim()
}

/** "20%", " 20 ", "20.0" -> 20; '' -> null; anything else as written (the schema takes only 0, 20 or 30). */
export function parseImportRate(cell: string): number | null | string {
  const v = cell.trim().replace(/\s*(%|per ?cent)$/i, '')
  if (v === '') return null
  if (/^\d{1,3}(\.0+)?$/.test(v)) return Number(v)
  return cell.trim()
}

/**
 * The cell of `field` in `row`, trimmed; '' when no column fills it. The apostrophe our
 * rejected-rows file puts before a cell starting with = + - or @ (so a spreadsheet does not run it
 * as a formula) is taken off again, so a fixed file imports as typed.
 */
function cellOf(row: Record<string, string | undefined>, mapping: CustomerImportMapping, field: CustomerImportField): string {
  const header = mapping[field]
  if (!header) return ''
  const v = row[header]
  if (typeof v !== 'string') return ''
  const t = v.trim()
  return /^'[=+\-@]/.test(t) ? t.slice(1) : t
}

/**
 * One row of the file as the input for customerSchema. Blank kind is a homeowner; a blank VAT or
 * CIS flag follows the VAT number or CIS rate (present means yes); other blank flags are no.
 */
export function rowToCustomer(row: Record<string, string | undefined>, mapping: CustomerImportMapping): ImportedCustomer {
  const get = (field: CustomerImportField) => cellOf(row, mapping, field)
  const vatNumber = get('vatNumber')
  const cisRate = parseImportRate(get('cisRatePercent'))
  const vatRegistered = parseImportFlag(get('vatRegistered'))
  const paysUnderCis = parseImportFlag(get('paysUnderCis'))
  const endUserNotified = parseImportFlag(get('endUserNotified'))
  return {
    kind: parseImportKind(get('kind')),
    name: get('name'),
    contactName: get('contactName'),
    email: get('email'),
    phone: get('phone'),
    billingLine1: get('billingLine1'),
    billingLine2: get('billingLine2'),
    billingTown: get('billingTown'),
    billingPostcode: get('billingPostcode'),
    notes: get('notes'),
    vatRegistered: vatRegistered ?? vatNumber !== '',
    vatNumber,
    paysUnderCis: paysUnderCis ?? cisRate !== null,
    cisRatePercent: cisRate,
    endUserNotified: endUserNotified ?? false,
  }
}

/**
 * The key that finds a row imported before: the e-mail (trimmed, lower case) when there is one,
 * else the name (lower case, single spaces) and the postcode without spaces. Computed from the
 * customer as customerSchema outputs it.
 */
export function importKey(customer: Pick<Customer, 'email' | 'name' | 'billingPostcode'>): string {
  const email = customer.email.trim().toLowerCase()
  if (email) return email
  const name = customer.name.normalize('NFKC').trim().toLowerCase().replace(/\s+/g, ' ')
  const postcode = customer.billingPostcode.toLowerCase().replace(/\s+/g, '')
  return `${name}|${postcode}`
}

// --- Checking rows --------------------------------------------------------------------------

const FLAG_FIELDS = ['vatRegistered', 'paysUnderCis', 'endUserNotified'] as const

/** What the file said that we could not read, in words that say how to fix it. */
function unreadable(input: ImportedCustomer): Record<string, string> {
  const out: Record<string, string> = {}
  if (!(CUSTOMER_KINDS as readonly string[]).includes(input.kind)) {
    out.kind = `"${input.kind}" is not a kind we know: write homeowner, landlord, builder or business.`
  }
  for (const f of FLAG_FIELDS) {
    if (typeof input[f] === 'string') out[f] = `"${input[f]}" is not yes or no.`
  }
  if (typeof input.cisRatePercent === 'string') out.cisRatePercent = `"${input.cisRatePercent}" is not a CIS rate: write 0, 20 or 30.`
  return out
}

export type CustomerRowCheck
  = | { ok: true, input: ImportedCustomer, customer: Customer, key: string }
    | { ok: false, input: ImportedCustomer, errors: Record<string, string> }

/** One row through rowToCustomer and customerSchema: the customer and its key, or a message per field. */
export function checkImportRow(row: Record<string, string | undefined>, mapping: CustomerImportMapping): CustomerRowCheck {
  const input = rowToCustomer(row, mapping)
  const parsed = customerSchema.safeParse(input)
  if (parsed.success) return { ok: true, input, customer: parsed.data, key: importKey(parsed.data) }
  return { ok: false, input, errors: { ...fieldErrors(parsed.error.issues), ...unreadable(input) } }
}

/** A batch as the route receives it: each row through customerSchema on its own. */
export function checkImportBatch(rows: readonly unknown[]): {
  valid: { index: number, customer: Customer, key: string }[]
  rejected: CustomerImportResult['rejected']
} {
  const valid: { index: number, customer: Customer, key: string }[] = []
  const rejected: CustomerImportResult['rejected'] = []
  rows.forEach((row, index) => {
    if (typeof row !== 'object' || row === null || Array.isArray(row)) {
      rejected.push({ index, errors: { _: 'Each row is an object of fields, like {"name": "…"}.' } })
      return
    }
    const parsed = customerSchema.safeParse(row)
    if (parsed.success) valid.push({ index, customer: parsed.data, key: importKey(parsed.data) })
    else rejected.push({ index, errors: fieldErrors(parsed.error.issues) })
  })
  return { valid, rejected }
}

/** "E-mail: Enter an e-mail address…; Phone: …", for the problem list and the rejected-rows file. */
export function describeImportProblems(errors: Record<string, string>): string {
  return Object.entries(errors)
    .map(([field, message]) => {
      const label = (CUSTOMER_IMPORT_FIELD_LABELS as Record<string, string>)[field]
      return label ? `${label}: ${message}` : message
    })
    .join('; ')
}

/**
 * Split rows into the batches the page sends: at most `maxRows` each, and each request's JSON
 * (`{"rows":[...]}`) at most `maxBytes` long in UTF-8. A single row over `maxBytes` goes alone.
 */
export function batchForImport<T>(rows: readonly T[], maxRows = CUSTOMER_IMPORT_BATCH_ROWS, maxBytes = CUSTOMER_IMPORT_BATCH_BYTES): T[][] {
  const encoder = new TextEncoder()
  const envelope = encoder.encode('{"rows":[]}').length
  const batches: T[][] = []
  let current: T[] = []
  let bytes = envelope
  for (const row of rows) {
    const size = encoder.encode(JSON.stringify(row)).length + 1 // and its comma
    if (current.length && (current.length >= maxRows || bytes + size > maxBytes)) {
      batches.push(current)
      current = []
      bytes = envelope
    }
    current.push(row)
    bytes += size
  }
  if (current.length) batches.push(current)
  return batches
}

/** A row the page will not send, for the problem list: its place in the file (from 0), its spreadsheet row, its name, and why. */
export interface CustomerImportProblem { index: number, row: number, name: string, text: string }
/** One of the first rows, as the preview table shows it. */
export interface CustomerImportPreviewRow { row: number, ok: boolean, input: ImportedCustomer }

/** Spreadsheet row of a record: the heading is row 1, so the first customer is row 2. */
export function importSheetRow(recordIndex: number): number {
  return recordIndex + 2
}

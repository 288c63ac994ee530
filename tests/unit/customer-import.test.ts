import { describe, expect, it } from 'vitest'
import {
  CUSTOMER_IMPORT_FIELD_LABELS, CUSTOMER_IMPORT_FIELDS, batchForImport, checkImportBatch, checkImportRow,
  customerImportBatchSchema, describeImportProblems, emptyImportMapping, guessMapping, importKey,
  parseImportFlag, parseImportKind, parseImportRate, rowToCustomer, type CustomerImportMapping,
} from '../../shared/utils/customer-import'

// Source: Setwell's own import rules (issue 3, "Importing customers") and customerSchema; the
// headings are words people commonly put at the top of a customer spreadsheet (common practice),
// not any product's format. CIS rates 0/20/30% are HMRC's published CIS deduction rates.

const mapping = (m: Partial<CustomerImportMapping>): CustomerImportMapping => ({ ...emptyImportMapping(), ...m })

describe('guessMapping', () => {
  it.each<[string, string[], Partial<CustomerImportMapping>]>([
    ['plain words', ['Name', 'E-mail', 'Phone', 'Postcode'], { name: 'Name', email: 'E-mail', phone: 'Phone', billingPostcode: 'Postcode' }],
    ['case, spaces and punctuation', [' customer NAME ', 'EMAIL', 'Mobile', 'Post code'], { name: ' customer NAME ', email: 'EMAIL', phone: 'Mobile', billingPostcode: 'Post code' }],
    ['address lines and town', ['Address 1', 'Address 2', 'Town'], { billingLine1: 'Address 1', billingLine2: 'Address 2', billingTown: 'Town' }],
    ['Address alone is the first line', ['Address', 'City'], { billingLine1: 'Address', billingTown: 'City' }],
    ['kind by Type/Kind', ['Type/Kind'], { kind: 'Type/Kind' }],
    ['kind by Type', ['Type'], { kind: 'Type' }],
    ['tax columns', ['VAT number', 'VAT registered', 'CIS rate (%)', 'CIS', 'End user'], { vatNumber: 'VAT number', vatRegistered: 'VAT registered', cisRatePercent: 'CIS rate (%)', paysUnderCis: 'CIS', endUserNotified: 'End user' }],
    ['a prefix that says nothing', ['Customer e-mail', 'Billing postcode', 'Client phone'], { email: 'Customer e-mail', billingPostcode: 'Billing postcode', phone: 'Client phone' }],
    ['Phone beats Mobile when both are there', ['Mobile', 'Phone'], { phone: 'Phone' }],
    ['contact name is not the name', ['Contact name', 'Company'], { contactName: 'Contact name', name: 'Company' }],
    ['our own template headings', CUSTOMER_IMPORT_FIELDS.map(f => CUSTOMER_IMPORT_FIELD_LABELS[f]), Object.fromEntries(CUSTOMER_IMPORT_FIELDS.map(f => [f, CUSTOMER_IMPORT_FIELD_LABELS[f]]))],
    ['nothing we know', ['Colour', 'Shoe size'], {}],
    ['no headings', [], {}],
  ])('%s', (_what, headers, expected) => {
    expect(guessMapping(headers)).toEqual(mapping(expected))
  })

  it('uses each heading for one field only', () => {
    const m = guessMapping(['Name', 'Name_1', 'Customer'])
    expect(m.name).toBe('Name')
    expect(m.contactName).toBe('')
    expect(Object.values(m).filter(Boolean)).toEqual(['Name'])
  })
})

describe('parseImportKind', () => {
  it.each([
    ['', 'homeowner'],
    ['  ', 'homeowner'],
    ['homeowner', 'homeowner'],
    ['Home owner', 'homeowner'],
    ['PRIVATE', 'homeowner'],
    ['landlord', 'landlord'],
    ['Letting agent', 'landlord'],
    ['Landlord or letting agent', 'landlord'],
    ['builder', 'builder'],
    ['Contractor', 'builder'],
    ['builder / contractor', 'builder'],
    ['Main contractor', 'builder'],
    ['business', 'business'],
    ['Other business', 'business'],
    ['Company', 'business'],
    ['wizard', 'wizard'],
    ['landlord/builder', 'landlord/builder'],
  ])('%j -> %s', (cell, kind) => {
    expect(parseImportKind(cell)).toBe(kind)
  })
})

describe('parseImportFlag', () => {
  it.each<[string, boolean | null | string]>([
    ['yes', true], ['Yes', true], ['Y', true], ['true', true], ['TRUE', true], ['1', true], ['x', true],
    ['no', false], ['No', false], ['n', false], ['false', false], ['0', false],
    ['', null], [' ', null],
    ['maybe', 'maybe'], ['2', '2'],
  ])('%j -> %j', (cell, value) => {
    expect(parseImportFlag(cell)).toBe(value)
  })
})

describe('parseImportRate', () => {
  it.each<[string, number | null | string]>([
    ['20%', 20], ['20', 20], [' 30 % ', 30], ['0', 0], ['0%', 0], ['20.0', 20], ['20 per cent', 20],
    ['', null],
    ['25%', 25], // a number, refused later by customerSchema
    ['twenty', 'twenty'], ['-20', '-20'], ['20.5', '20.5'],
  ])('%j -> %j', (cell, value) => {
    expect(parseImportRate(cell)).toBe(value)
  })
})

describe('rowToCustomer', () => {
  const m = mapping({
    name: 'Name', kind: 'Type', email: 'Email', phone: 'Phone', billingPostcode: 'Postcode',
    vatRegistered: 'VAT reg', vatNumber: 'VAT number', paysUnderCis: 'CIS', cisRatePercent: 'CIS rate', endUserNotified: 'End user',
  })
  it.each<[string, Record<string, string>, Record<string, unknown>]>([
    ['a homeowner with blanks', { 'Name': ' Jo Bramley ', 'Type': '', 'Email': '', 'Postcode': 'kb4 7qz', 'VAT reg': '', 'CIS': '' }, { name: 'Jo Bramley', kind: 'homeowner', billingPostcode: 'kb4 7qz', vatRegistered: false, paysUnderCis: false, cisRatePercent: null, endUserNotified: false }],
    ['a builder deducting 20%', { 'Name': 'Harrowgate Build Ltd', 'Type': 'contractor', 'CIS': 'yes', 'CIS rate': '20%', 'VAT reg': 'Y', 'VAT number': 'GB 123 4567 89', 'End user': 'no' }, { kind: 'builder', paysUnderCis: true, cisRatePercent: 20, vatRegistered: true, vatNumber: 'GB 123 4567 89', endUserNotified: false }],
    ['a blank CIS flag follows the rate', { 'Name': 'Fenwick Homes', 'Type': 'builder', 'CIS rate': '30' }, { paysUnderCis: true, cisRatePercent: 30 }],
    ['a blank VAT flag follows the number', { 'Name': 'Quarry Lettings', 'Type': 'letting agent', 'VAT number': 'GB999999973' }, { kind: 'landlord', vatRegistered: true }],
    ['an explicit no is kept even with a number', { 'Name': 'Quarry Lettings', 'VAT reg': 'no', 'VAT number': 'GB999999973' }, { vatRegistered: false }],
    ['words we cannot read pass through', { 'Name': 'Odd Row', 'Type': 'wizard', 'CIS': 'maybe', 'CIS rate': 'lots' }, { kind: 'wizard', paysUnderCis: 'maybe', cisRatePercent: 'lots' }],
    ['a column missing from the row', { Name: 'Short Row' }, { name: 'Short Row', email: '', phone: '' }],
    ['the apostrophe our rejected-rows file adds before + is taken off', { Name: 'Plus Row', Phone: '\'+44 7700 900123' }, { phone: '+44 7700 900123' }],
    ['an apostrophe before anything else stays', { Name: '\'Tis Ours' }, { name: '\'Tis Ours' }],
  ])('%s', (_what, row, expected) => {
    expect(rowToCustomer(row, m)).toMatchObject(expected)
  })

  it('leaves unmapped fields empty', () => {
    expect(rowToCustomer({ Name: 'Jo', Notes: 'gate code 1942' }, mapping({ name: 'Name' })).notes).toBe('')
  })
})

describe('importKey', () => {
  const c = (name: string, email: string, billingPostcode: string) => ({ name, email, billingPostcode })
  it.each([
    [c('Jo Bramley', 'Jo.Bramley@Mail.example ', 'KB4 7QZ'), 'jo.bramley@mail.example'],
    [c('Jo Bramley', '', 'KB4 7QZ'), 'jo bramley|kb47qz'],
    [c('  JO   Bramley ', '', 'kb47qz'), 'jo bramley|kb47qz'],
    [c('Jo Bramley', '', ''), 'jo bramley|'],
  ])('%j -> %s', (customer, key) => {
    expect(importKey(customer)).toBe(key)
  })

  it('matches the same row of the same file on a second run, whatever the spacing and case', () => {
    const m = mapping({ name: 'Name', email: 'Email', billingPostcode: 'Postcode' })
    const first = checkImportRow({ Name: 'Ada Thorne', Email: '', Postcode: 'KB2 9XD' }, m)
    const again = checkImportRow({ Name: 'ada  thorne', Email: '', Postcode: 'kb29xd' }, m)
    expect(first.ok && again.ok && first.key === again.key).toBe(true)
  })
})

describe('checkImportRow', () => {
  const m = mapping({ name: 'Name', kind: 'Kind', email: 'Email', phone: 'Phone', vatNumber: 'VAT', paysUnderCis: 'CIS', cisRatePercent: 'Rate' })
  it.each<[string, Record<string, string>, string[]]>([
    ['no name', { Name: '', Email: 'a@b.example' }, ['name']],
    ['a bad e-mail', { Name: 'Jo', Email: 'jo.at.example' }, ['email']],
    ['a bad phone', { Name: 'Jo', Phone: '12' }, ['phone']],
    ['a homeowner under CIS', { Name: 'Jo', Kind: 'homeowner', CIS: 'yes', Rate: '20' }, ['paysUnderCis']],
    ['a CIS rate that does not exist', { Name: 'Build Co', Kind: 'builder', Rate: '25%' }, ['cisRatePercent']],
    ['CIS without a rate', { Name: 'Build Co', Kind: 'builder', CIS: 'yes' }, ['cisRatePercent']],
    ['a bad VAT number', { Name: 'Build Co', Kind: 'builder', VAT: 'GB12' }, ['vatNumber']],
    ['a kind we do not know', { Name: 'Jo', Kind: 'wizard' }, ['kind']],
    ['a yes/no we cannot read', { Name: 'Build Co', Kind: 'builder', CIS: 'perhaps', Rate: '20' }, ['paysUnderCis']],
  ])('%s is refused naming %j', (_what, row, fields) => {
    const r = checkImportRow(row, m)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(Object.keys(r.errors).sort()).toEqual(fields)
  })

  it('says what the cell held when it is a word we cannot read', () => {
    const r = checkImportRow({ Name: 'Jo', Kind: 'wizard' }, m)
    expect(r.ok ? '' : r.errors.kind).toBe('"wizard" is not a kind we know: write homeowner, landlord, builder or business.')
  })

  it('accepts a good row and gives the customer as the schema outputs it', () => {
    const r = checkImportRow({ Name: 'Harrowgate Build Ltd', Kind: 'Contractor', Email: 'Office@Harrowgate.example', VAT: 'gb 123456789', CIS: 'yes', Rate: '20%' }, m)
    expect(r.ok).toBe(true)
    if (r.ok) {
      expect(r.customer).toMatchObject({ kind: 'builder', email: 'office@harrowgate.example', vatRegistered: true, vatNumber: 'GB123456789', paysUnderCis: true, cisRatePercent: 20 })
      expect(r.key).toBe('office@harrowgate.example')
    }
  })
})

describe('checkImportBatch (the route\'s check)', () => {
  it('keeps the good rows and names the index and fields of the bad ones', () => {
    const { valid, rejected } = checkImportBatch([
      { kind: 'homeowner', name: 'Ada Thorne', billingPostcode: 'kb2 9xd' },
      { kind: 'homeowner', name: '', email: 'bad' },
      'not a row',
      [],
      { kind: 'builder', name: 'Fenwick Homes', paysUnderCis: true, cisRatePercent: 30 },
    ])
    expect(valid.map(v => [v.index, v.key])).toEqual([[0, 'ada thorne|kb29xd'], [4, 'fenwick homes|']])
    expect(rejected.map(r => [r.index, Object.keys(r.errors).sort()])).toEqual([[1, ['email', 'name']], [2, ['_']], [3, ['_']]])
  })
})

describe('customerImportBatchSchema', () => {
  it.each<[string, boolean, unknown]>([
    ['one row', true, { rows: [{}] }],
    ['500 rows', true, { rows: Array.from({ length: 500 }, () => ({})) }],
    ['501 rows', false, { rows: Array.from({ length: 501 }, () => ({})) }],
    ['no rows', false, { rows: [] }],
    ['not a list', false, { rows: 'Name,Email' }],
    ['nothing', false, {}],
  ])('%s -> accepted %s', (_what, ok, body) => {
    expect(customerImportBatchSchema.safeParse(body).success).toBe(ok)
  })
})

describe('batchForImport', () => {
  it.each<[string, number, number, number, number[]]>([
    ['500 rows in 200s', 500, 200, 1_000_000, [200, 200, 100]],
    ['exactly 200', 200, 200, 1_000_000, [200]],
    ['one row', 1, 200, 1_000_000, [1]],
    ['none', 0, 200, 1_000_000, []],
    // each row below is {"n":"xxxxxxxxxx"}, 18 bytes, plus a comma; the envelope {"rows":[]} is 11
    ['bytes cut first', 10, 200, 11 + 19 * 3, [3, 3, 3, 1]],
  ])('%s', (_what, count, maxRows, maxBytes, sizes) => {
    const rows = Array.from({ length: count }, () => ({ n: 'x'.repeat(10) }))
    expect(batchForImport(rows, maxRows, maxBytes).map(b => b.length)).toEqual(sizes)
  })

  it('keeps 200 rows with the longest fields customerSchema allows under the 256 KiB body limit', () => {
    const big = { kind: 'business', name: 'n'.repeat(160), contactName: 'c'.repeat(120), email: `${'e'.repeat(60)}@mail.example`, phone: '07700 900123', billingLine1: 'a'.repeat(200), billingLine2: 'b'.repeat(200), billingTown: 't'.repeat(100), billingPostcode: 'KB4 7QZ', notes: 'é'.repeat(4000), vatRegistered: true, vatNumber: 'GB123456789', paysUnderCis: true, cisRatePercent: 20, endUserNotified: true }
    const batches = batchForImport(Array.from({ length: 200 }, () => big))
    expect(batches.length).toBeGreaterThan(1)
    for (const b of batches) expect(new TextEncoder().encode(JSON.stringify({ rows: b })).length).toBeLessThanOrEqual(256 * 1024)
  })
})

describe('describeImportProblems', () => {
  it('names each field by its label', () => {
    expect(describeImportProblems({ email: 'Enter an e-mail address.', billingPostcode: 'Too long.', _: 'Not a row.' }))
      .toBe('E-mail: Enter an e-mail address.; Postcode: Too long.; Not a row.')
  })
})

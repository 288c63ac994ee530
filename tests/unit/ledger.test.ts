import { describe, expect, it } from 'vitest'
import { canMoveEnquiry, ENQUIRY_STATUSES, holdingWorkInWords, type EnquiryStatus, type HoldingWork } from '../../shared/utils/ledger'

// Setwell's enquiry flow (issue 3): new -> visit booked -> quoted -> won or lost (with a reason);
// a lost enquiry can be reopened. Our own rules, not trade figures.
describe('canMoveEnquiry', () => {
  it.each([
    ['new', 'visit-booked', true], ['new', 'quoted', true], ['new', 'lost', true], ['new', 'won', false],
    ['visit-booked', 'quoted', true], ['visit-booked', 'won', false], ['visit-booked', 'lost', true],
    ['quoted', 'won', true], ['quoted', 'lost', true],
    ['won', 'lost', false], ['won', 'new', false],
    ['lost', 'new', true], ['lost', 'won', false],
  ] as [EnquiryStatus, EnquiryStatus, boolean][])('%s -> %s: %s', (from, to, ok) => expect(canMoveEnquiry(from, to)).toBe(ok))

  it('never moves a status to itself', () => {
    expect(ENQUIRY_STATUSES.filter(s => canMoveEnquiry(s, s))).toEqual([])
  })
})

// Our own words for a removal that is refused (issue 13, item 9): each kind counted, "and" before the last.
describe('holdingWorkInWords', () => {
  it.each<[Partial<Record<HoldingWork, number>>, string]>([
    [{}, ''],
    [{ invoices: 0 }, ''],
    [{ invoices: 1 }, '1 invoice'],
    [{ invoices: 2, jobs: 1 }, '2 invoices and 1 job'],
    [{ enquiries: 3, quotes: 1, creditNotes: 1 }, '1 credit note, 1 quote and 3 enquiries'],
    [{ cisStatements: 2, visits: 1 }, '1 visit and 2 CIS statements'],
  ])('%j -> "%s"', (counts, words) => expect(holdingWorkInWords(counts)).toBe(words))
})

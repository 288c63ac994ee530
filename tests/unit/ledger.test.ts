import { describe, expect, it } from 'vitest'
import { canMoveEnquiry, ENQUIRY_STATUSES, type EnquiryStatus } from '../../shared/utils/ledger'

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

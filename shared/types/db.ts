// Row types, derived from the Drizzle schema (never written by hand). Type-only: shared/ stays free of server code at run time.
import type { auditLog, firms, invitations, memberships, sessions, users } from '../../server/db/schema'

export type Firm = typeof firms.$inferSelect
export type User = Omit<typeof users.$inferSelect, 'passwordHash'>
export type Membership = typeof memberships.$inferSelect
export type Invitation = Omit<typeof invitations.$inferSelect, 'tokenHash'>
export type Session = typeof sessions.$inferSelect
export type AuditEntry = typeof auditLog.$inferSelect

/** What an invitation link shows before it is accepted (GET /api/invitations/:token). */
export interface InvitationPreview {
  firmName: string
  email: string
  role: Membership['role']
  expiresAt: string
  hasAccount: boolean
}

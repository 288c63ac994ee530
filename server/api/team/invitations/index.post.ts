import { eq, isNull, sql } from 'drizzle-orm'
import { firms, invitations, memberships, users } from '../../../db/schema'
import { inviteSchema } from '#shared/schemas/auth'
import { ROLE_LABELS, ROLE_SUMMARIES } from '#shared/utils/roles'
import { fullDateAtTime } from '#shared/utils/dates'

export const INVITATION_DAYS = 7

/** Invite someone by e-mail with a role. Owner only. The link is single-use and lasts 7 days. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'team:manage')
  const input = await readBodyWith(event, inviteSchema)
  const { token, hash } = newLinkToken(auth.firmId)
  const { invitation, firmName } = await withFirm(auth, async (f) => {
    const [member] = await f.tx.select({ id: memberships.id }).from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(f.where(memberships, eq(sql`lower(${users.email})`, input.email)))
    if (member) throw fieldError({ email: 'This person is already in the firm.' }, 409, 'Already a member')
    // one live invitation per address: a new one replaces the old link
    await f.tx.update(invitations).set({ revokedAt: sql`now()` })
      .where(f.where(invitations, eq(invitations.email, input.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    const [row] = await f.tx.insert(invitations).values(f.values({
      email: input.email,
      role: input.role,
      tokenHash: hash,
      invitedBy: auth.userId,
      expiresAt: new Date(Date.now() + INVITATION_DAYS * 24 * 3600_000),
    })).returning()
    const [firm] = await f.tx.select({ tradingName: firms.tradingName }).from(firms).where(eq(firms.id, f.firmId))
    await f.audit('invitation.sent', 'invitation', row!.id, { email: input.email, role: input.role })
    return { invitation: row!, firmName: firm!.tradingName }
  })

  const link = `${useRuntimeConfig().appUrl.replace(/\/$/, '')}/invite/${token}`
  await sendMail({
    to: input.email,
    // a question about the invitation goes to the person who sent it
    replyTo: auth.email,
    subject: `${auth.name} invited you to ${firmName} on Setwell`,
    text: [
      `Hello,`,
      ``,
      `${auth.name} has invited you to join ${firmName} on Setwell as ${ROLE_LABELS[input.role].toLowerCase()}.`,
      `${ROLE_LABELS[input.role]}: ${ROLE_SUMMARIES[input.role]}`,
      ``,
      `Open this link to join (it works once, until ${fullDateAtTime(invitation.expiresAt)}):`,
      link,
      ``,
      `If you were not expecting this, ignore this e-mail.`,
    ].join('\n'),
  })
  setResponseStatus(event, 201)
  return { id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt }
})

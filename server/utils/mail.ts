// Outgoing e-mail through nodemailer over SMTP. `npm start` runs a local catcher on loopback;
// a real provider is only a change of NUXT_SMTP_* settings.
import { eq, inArray } from 'drizzle-orm'
import nodemailer, { type Transporter } from 'nodemailer'
import { firms, memberships, users } from '../db/schema'
import type { Role } from '#shared/utils/roles'

let transport: Transporter | undefined

function useTransport(): Transporter {
  if (!transport) {
    const c = useRuntimeConfig()
    transport = nodemailer.createTransport({
      host: c.smtpHost,
      port: Number(c.smtpPort),
      secure: c.smtpSecure === true, // NUXT_SMTP_SECURE=true arrives parsed as a boolean
      auth: c.smtpUser ? { user: c.smtpUser, pass: c.smtpPass } : undefined,
      // the local catcher has no certificate; a provider on 587 upgrades with STARTTLS
      ignoreTLS: c.smtpHost === '127.0.0.1' || c.smtpHost === 'localhost',
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 20_000,
    })
  }
  return transport
}

export interface OutgoingMail { to: string, subject: string, text: string, html?: string, replyTo?: string }

export async function sendMail(mail: OutgoingMail) {
  const c = useRuntimeConfig()
  return useTransport().sendMail({ from: c.mailFrom, ...mail })
}

/** Who at the firm hears of something: the firm's own address and its people with these roles, once each. */
export async function firmRecipients(f: FirmScope, roles: Role[]): Promise<string[]> {
  const [firm] = await f.tx.select({ email: firms.email }).from(firms).where(eq(firms.id, f.firmId))
  const people = await f.tx.select({ email: users.email }).from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(f.where(memberships, inArray(memberships.role, roles)))
  return [...new Set([firm?.email, ...people.map(p => p.email)].filter(Boolean))] as string[]
}

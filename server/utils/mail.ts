// Outgoing e-mail through nodemailer over SMTP. `npm start` runs a local catcher on loopback;
// a real provider is only a change of NUXT_SMTP_* settings.
import { asc, eq, inArray } from 'drizzle-orm'
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

export interface OutgoingMail { to: string, subject: string, text: string, html?: string, replyTo?: string, from?: { name: string, address: string } }

export async function sendMail(mail: OutgoingMail) {
  const c = useRuntimeConfig()
  return useTransport().sendMail({ from: c.mailFrom, ...mail })
}

/** The address part of the app's sending address (runtime config mailFrom, "Setwell <no-reply@…>" or a bare address). */
export function sendingAddress(): string {
  const from = String(useRuntimeConfig().mailFrom)
  return /<([^>]+)>/.exec(from)?.[1]?.trim() ?? from.trim()
}

/** How a customer reaches the firm, for the e-mails sent in its name. */
export interface FirmContact { tradingName: string, email: string, phone: string }

/**
 * The firm's name, phone and the address a customer's reply should reach: the firm's own e-mail
 * (Settings, Firm), or when the firm has none, its owner's sign-in address (the first owner, by
 * when they joined), so a reply always reaches a person at the firm.
 */
export async function firmContact(f: FirmScope): Promise<FirmContact> {
  const [firm] = await f.tx.select({ tradingName: firms.tradingName, email: firms.email, phone: firms.phone }).from(firms).where(eq(firms.id, f.firmId))
  let email = firm?.email.trim() ?? ''
  if (!email) {
    const [owner] = await f.tx.select({ email: users.email }).from(memberships).innerJoin(users, eq(users.id, memberships.userId))
      .where(f.where(memberships, eq(memberships.role, 'owner'))).orderBy(asc(memberships.createdAt)).limit(1)
    email = owner?.email ?? ''
  }
  return { tradingName: firm?.tradingName ?? '', email, phone: firm?.phone.trim() ?? '' }
}

/** The firm's sign-off under every e-mail to a customer: thanks, its name, phone and e-mail. */
export function firmSignOff(firm: FirmContact): string {
  return ['Thank you,', firm.tradingName, firm.phone && `Phone: ${firm.phone}`, firm.email && `E-mail: ${firm.email}`].filter(Boolean).join('\n')
}

/** A link a customer needs, with the words before it ("View and pay the invoice"). */
export interface MailLink { label: string, url: string }

/**
 * An e-mail from the firm to its customer: from the firm's trading name at the app's sending
 * address (the app sends, the firm's name is what the customer sees), Reply-To the firm's own
 * address, the words, each link the customer needs on its own line, then the firm's sign-off with
 * its phone. Every e-mail to a customer is made here (tests/api/mail-customer.test.ts checks them).
 */
export function firmMail(firm: FirmContact, mail: { to: string, subject: string, text: string, links?: MailLink[], after?: string }): OutgoingMail {
  const links = (mail.links ?? []).map(l => `${l.label}:\n${l.url}`)
  const text = [mail.text.trimEnd(), ...links, mail.after?.trim(), firmSignOff(firm)].filter(Boolean).join('\n\n')
  return {
    to: mail.to,
    subject: mail.subject,
    text: `${text}\n`,
    from: { name: firm.tradingName || 'Setwell', address: sendingAddress() },
    ...(firm.email ? { replyTo: firm.email } : {}),
  }
}

/** Send an e-mail from the firm to its customer (firmMail). */
export async function sendFirmMail(firm: FirmContact, mail: Parameters<typeof firmMail>[1]) {
  return sendMail(firmMail(firm, mail))
}

/** Base of the links in e-mails (runtime config appUrl, without a trailing slash). */
export const appLink = (path: string) => `${String(useRuntimeConfig().appUrl).replace(/\/$/, '')}${path}`

/** Who at the firm hears of something: the firm's own address and its people with these roles, once each. */
export async function firmRecipients(f: FirmScope, roles: Role[]): Promise<string[]> {
  const [firm] = await f.tx.select({ email: firms.email }).from(firms).where(eq(firms.id, f.firmId))
  const people = await f.tx.select({ email: users.email }).from(memberships).innerJoin(users, eq(users.id, memberships.userId))
    .where(f.where(memberships, inArray(memberships.role, roles)))
  return [...new Set([firm?.email, ...people.map(p => p.email)].filter(Boolean))] as string[]
}

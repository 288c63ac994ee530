// Outgoing e-mail through nodemailer over SMTP. `npm start` runs a local catcher on loopback;
// a real provider is only a change of NUXT_SMTP_* settings.
import nodemailer, { type Transporter } from 'nodemailer'

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

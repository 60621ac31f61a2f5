// Outgoing e-mail through nodemailer: the project's SMTP fake on loopback in development and
// tests, a real SMTP server by configuration (runtimeConfig.smtp). Every message has a plain-text
// and an HTML body; `composeMail` builds both from the same paragraphs so they never disagree.
import type { H3Event } from 'h3'
import type { Transporter } from 'nodemailer'
import nodemailer from 'nodemailer'

let transport: Transporter | undefined

function useTransport(): Transporter {
  if (transport) return transport
  const { smtp } = useRuntimeConfig()
  transport = nodemailer.createTransport({
    host: smtp.host,
    port: Number(smtp.port),
    secure: Boolean(smtp.secure) && String(smtp.secure) !== 'false',
    auth: smtp.user ? { user: smtp.user, pass: smtp.pass } : undefined,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
    // The fake offers no TLS; a real server is reached over STARTTLS when it offers it.
    ignoreTLS: smtp.host === '127.0.0.1' && !smtp.user,
  })
  return transport
}

export interface MailMessage {
  to: string
  subject: string
  text: string
  html: string
  /** An unsubscribe address (digests): sent as List-Unsubscribe and shown in the body. */
  unsubscribe?: string
}

/** A paragraph of a message: plain text, or a link with its label. */
export type MailPart = string | { link: string, label: string }

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)

/** Both bodies of a message from one list of paragraphs. */
export function composeMail(to: string, subject: string, parts: MailPart[], unsubscribe?: string): MailMessage {
  const all: MailPart[] = unsubscribe ? [...parts, { link: unsubscribe, label: 'Stop these digests' }] : parts
  const text = `${all.map(p => typeof p === 'string' ? p : `${p.label}: ${p.link}`).join('\n\n')}\n\n-- \nQuillfield\n`
  const html = [
    '<!doctype html><html><body style="font-family: Georgia, serif; color: #1f1b16; max-width: 36rem; line-height: 1.5">',
    ...all.map(p => typeof p === 'string'
      ? `<p>${escapeHtml(p).replace(/\n/g, '<br>')}</p>`
      : `<p><a href="${escapeHtml(p.link)}" style="color: #6b1f24">${escapeHtml(p.label)}</a></p>`),
    '<p style="color: #6b655c; font-size: 0.85em">Quillfield</p></body></html>',
  ].join('\n')
  return { to, subject, text, html, unsubscribe }
}

/** Sends one message; throws a 503-style error when the mail server cannot be reached. */
export async function sendMail(message: MailMessage): Promise<void> {
  const { smtp } = useRuntimeConfig()
  try {
    await useTransport().sendMail({
      from: smtp.from,
      to: message.to,
      subject: message.subject,
      text: message.text,
      html: message.html,
      headers: {
        // Which deployment sent it, so one SMTP fake can serve the demo and the tests apart.
        'X-Quillfield-Deployment': String(useRuntimeConfig().deployment),
        ...(message.unsubscribe ? { 'List-Unsubscribe': `<${message.unsubscribe}>` } : {}),
      },
    })
  }
  catch (error) {
    throw createError({ statusCode: 503, statusMessage: `The mail server did not take the message: ${(error as Error).message}` })
  }
}

/**
 * Sends a message and reports instead of throwing: the change that caused the message is already
 * stored, so a mail outage must not undo it. The caller shows `{ mailed, mailError }`.
 */
export async function trySendMail(message: MailMessage): Promise<{ mailed: boolean, mailError?: string }> {
  try {
    await sendMail(message)
    return { mailed: true }
  }
  catch (error) {
    console.error(`mail to ${message.to} failed:`, (error as Error).message)
    return { mailed: false, mailError: (error as { statusMessage?: string }).statusMessage ?? (error as Error).message }
  }
}

/** The site address links in e-mail point at: NUXT_SITE_URL, else the address of this request. */
export function siteUrl(event: H3Event): string {
  const configured = String(useRuntimeConfig(event).siteUrl ?? '').replace(/\/+$/, '')
  return configured || getRequestURL(event).origin
}

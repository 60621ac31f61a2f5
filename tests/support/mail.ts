// Reads what the application sent to the project's SMTP fake (scripts/smtp-fake.mjs).
export const inboxUrl = process.env.NUXT_MAIL_INBOX_URL ?? 'http://127.0.0.1:3312'

export interface SentMail {
  id: number
  to: string[]
  from: string
  subject: string
  text: string
  html: string
  headers: Record<string, string>
  date: string
}

export async function mailTo(address: string): Promise<SentMail[]> {
  const response = await fetch(`${inboxUrl}/messages?to=${encodeURIComponent(address)}`)
  if (!response.ok) throw new Error(`the SMTP fake answered ${response.status}`)
  return ((await response.json()) as { messages: SentMail[] }).messages
}

/** Waits (up to `ms`) for a message to `address` whose subject matches; newest first. */
export async function waitForMail(address: string, subject: RegExp = /./, ms = 15_000): Promise<SentMail> {
  const until = Date.now() + ms
  for (;;) {
    const found = (await mailTo(address)).find(m => subject.test(m.subject))
    if (found) return found
    if (Date.now() > until) throw new Error(`no message to ${address} with a subject like ${subject} arrived in ${ms} ms`)
    await new Promise(resolve => setTimeout(resolve, 200))
  }
}

/** The first link in a message's plain-text body that contains `part`. */
export function linkIn(mail: SentMail, part: string): string {
  const link = mail.text.match(/https?:\/\/\S+/g)?.find(l => l.includes(part))
  if (!link) throw new Error(`the message "${mail.subject}" has no link containing ${part}:\n${mail.text}`)
  return link
}

/** The token of the invitation link in a message. */
export function invitationToken(mail: SentMail): string {
  const token = /\/invitations\/([\w-]{43})/.exec(mail.text)?.[1]
  if (!token) throw new Error(`the message "${mail.subject}" has no invitation link:\n${mail.text}`)
  return token
}

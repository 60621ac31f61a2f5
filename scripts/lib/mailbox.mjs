// The SMTP fake run by the project on 127.0.0.1 (scripts/smtp-fake.mjs), messages under .data/mail.
import { join } from 'node:path'
import { dataDir, mail, root } from './config.mjs'
import { answersAt, detachedService } from './detached.mjs'

const base = join(dataDir, 'mail')

export const mailbox = detachedService({
  name: 'mail',
  label: 'SMTP fake',
  pidFile: join(base, 'mailbox.pid'),
  logFile: join(base, 'mailbox.log'),
  local: () => mail.local,
  command: () => [join(root, 'scripts', 'smtp-fake.mjs'), String(mail.port), String(mail.inboxPort), base],
  answers: () => answersAt(`http://127.0.0.1:${mail.inboxPort}/`, 300),
  detail: () => `SMTP 127.0.0.1:${mail.port}, inbox http://127.0.0.1:${mail.inboxPort}`,
})

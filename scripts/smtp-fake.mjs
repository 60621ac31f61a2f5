// The SMTP fake: accepts every message on 127.0.0.1:<smtp port> (no authentication, no relay) and
// keeps it, parsed, for the development inbox and the tests. A small HTTP side on <http port>:
//   GET    /messages[?to=address][&deployment=name]   newest first: { messages: [{ id, to, from, subject, text, html, headers, date }] }
//          (deployment: the X-Quillfield-Deployment header the application sets, e.g. demo or test)
//   GET    /messages/<id>           one message
//   DELETE /messages                forget everything
// Messages are also appended to <dir>/messages.jsonl and read back on start.
import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { createServer } from 'node:http'
import { join } from 'node:path'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

const [smtpPort, httpPort, dir] = [Number(process.argv[2]), Number(process.argv[3]), process.argv[4]]
if (!smtpPort || !httpPort || !dir) {
  console.error('usage: smtp-fake.mjs <smtp port> <http port> <data directory>')
  process.exit(2)
}
mkdirSync(dir, { recursive: true })
const store = join(dir, 'messages.jsonl')
const LIMIT = 5000
let messages = []
if (existsSync(store)) {
  for (const line of readFileSync(store, 'utf8').split('\n')) {
    if (!line.trim()) continue
    try {
      messages.push(JSON.parse(line))
    }
    catch { /* a torn last line after a crash */ }
  }
  messages = messages.slice(-LIMIT)
}
let next = messages.reduce((max, m) => Math.max(max, m.id), 0) + 1

function addresses(field) {
  if (!field) return []
  const list = Array.isArray(field) ? field : [field]
  return list.flatMap(a => a.value.map(v => v.address.toLowerCase()))
}

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  banner: 'Quillfield SMTP fake',
  size: 10 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream).then((mail) => {
      const envelopeTo = session.envelope.rcptTo.map(r => r.address.toLowerCase())
      const message = {
        id: next++,
        to: [...new Set([...envelopeTo, ...addresses(mail.to)])],
        from: addresses(mail.from)[0] ?? session.envelope.mailFrom?.address ?? '',
        subject: mail.subject ?? '',
        text: mail.text ?? '',
        html: typeof mail.html === 'string' ? mail.html : '',
        // Raw header values (mailparser turns List-* headers into objects).
        headers: Object.fromEntries((mail.headerLines ?? []).filter(h => ['list-unsubscribe', 'message-id', 'x-quillfield-deployment'].includes(h.key)).map(h => [h.key, h.line.slice(h.line.indexOf(':') + 1).trim()])),
        date: new Date().toISOString(),
      }
      messages.push(message)
      if (messages.length > LIMIT) messages = messages.slice(-LIMIT)
      appendFileSync(store, `${JSON.stringify(message)}\n`)
      callback()
    }, error => callback(error))
  },
})
smtp.on('error', error => console.error('smtp:', error.message))

const http = createServer((request, response) => {
  const url = new URL(request.url ?? '/', 'http://127.0.0.1')
  const send = (status, body) => {
    response.writeHead(status, { 'content-type': 'application/json' })
    response.end(JSON.stringify(body))
  }
  if (url.pathname === '/messages' && request.method === 'GET') {
    const to = url.searchParams.get('to')?.toLowerCase()
    const deployment = url.searchParams.get('deployment')
    const list = messages.filter(m => (!to || m.to.includes(to)) && (!deployment || m.headers?.['x-quillfield-deployment'] === deployment))
    return send(200, { messages: [...list].reverse().slice(0, 500) })
  }
  if (url.pathname === '/messages' && request.method === 'DELETE') {
    messages = []
    writeFileSync(store, '')
    return send(200, { ok: true })
  }
  const one = /^\/messages\/(\d+)$/.exec(url.pathname)
  if (one && request.method === 'GET') {
    const message = messages.find(m => m.id === Number(one[1]))
    return message ? send(200, { message }) : send(404, { message: 'No message with that number.' })
  }
  if (url.pathname === '/' && request.method === 'GET') return send(200, { ok: true, count: messages.length })
  send(404, { message: 'Not found.' })
})

smtp.listen(smtpPort, '127.0.0.1', () => {
  http.listen(httpPort, '127.0.0.1', () => console.log(`smtp fake: SMTP 127.0.0.1:${smtpPort}, inbox http://127.0.0.1:${httpPort}`))
})
function stop() {
  http.close()
  smtp.close(() => process.exit(0))
  setTimeout(() => process.exit(0), 2000).unref()
}
process.on('SIGTERM', stop)
process.on('SIGINT', stop)

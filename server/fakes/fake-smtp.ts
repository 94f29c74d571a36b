import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs'
import path from 'node:path'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

export interface StoredMail {
  id: string
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
  messageId: string | null
  attachments: { filename: string | null; contentType: string; size: number }[]
}

export interface FakeSmtp {
  url: string
  port: number
  close(): Promise<void>
}

/**
 * A local SMTP server that accepts every message and keeps it as JSON in `directory`, where the
 * development mailbox page and the tests read it. Never used in production.
 */
export async function startFakeSmtp(directory: string, port = 0): Promise<FakeSmtp> {
  mkdirSync(directory, { recursive: true })
  let counter = 0
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const id = `${Date.now()}-${process.pid}-${counter++}`
          const mail: StoredMail = {
            id,
            receivedAt: new Date().toISOString(),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            messageId: parsed.messageId ?? null,
            attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? null, contentType: a.contentType, size: a.size })),
          }
          writeFileSync(path.join(directory, `${id}.json`), JSON.stringify(mail, null, 2))
          callback()
        })
        .catch((error: Error) => callback(error))
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve())
  })
  const actualPort = (server.server.address() as { port: number }).port
  return {
    url: `smtp://127.0.0.1:${actualPort}?ignoreTLS=true`,
    port: actualPort,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}

/** Every message the fake server kept, newest first. */
export function readMailbox(directory: string): StoredMail[] {
  let files: string[]
  try {
    files = readdirSync(directory).filter((f) => f.endsWith('.json'))
  } catch {
    return []
  }
  return files
    .map((f) => JSON.parse(readFileSync(path.join(directory, f), 'utf8')) as StoredMail)
    .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id))
}

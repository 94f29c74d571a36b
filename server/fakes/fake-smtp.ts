import { mkdirSync } from 'node:fs'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'
import { writeMail, type StoredMail } from './mailbox-store.js'

export { readMailbox, type StoredMail } from './mailbox-store.js'

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
          writeMail(directory, mail)
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

import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs'
import path from 'node:path'

/** One message as the local fake SMTP server keeps it (a JSON file per message). */
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

export function writeMail(directory: string, mail: StoredMail): void {
  mkdirSync(directory, { recursive: true })
  writeFileSync(path.join(directory, `${mail.id}.json`), JSON.stringify(mail, null, 2))
}

/** Every message the fake server kept, newest first. Needs no mail packages (safe in production builds). */
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

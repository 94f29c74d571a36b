import { inject } from 'vitest'
import { readMailbox, type StoredMail } from '../../server/fakes/mailbox-store.js'

/**
 * Waits until the fake SMTP server has received a message for `to` (optionally matching the subject,
 * and holding `containing` in its text). The mailbox is shared by every test file of a run, and demo
 * accounts have the same address in every file's database, so pass `containing` (e.g. this study's id)
 * when another file may have mailed the same person.
 */
export async function waitForMail(to: string, subject?: RegExp, timeoutMs = 15_000, containing?: string): Promise<StoredMail> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    const found = mailsTo(to).find((m) => (!subject || subject.test(m.subject)) && (!containing || m.text.includes(containing)))
    if (found) return found
    await new Promise((resolve) => setTimeout(resolve, 200))
  }
  throw new Error(`no e-mail to ${to}${subject ? ` matching ${subject}` : ''} within ${timeoutMs} ms`)
}

export function mailsTo(to: string): StoredMail[] {
  return readMailbox(inject('mailboxDir')).filter((m) => m.to.includes(to))
}

export function linkIn(mail: StoredMail, path: string): string {
  const match = mail.text.match(new RegExp(`https?://[^\\s]+${path}/([A-Za-z0-9_-]+)`))
  if (!match) throw new Error(`no ${path} link in: ${mail.text}`)
  return match[1]!
}

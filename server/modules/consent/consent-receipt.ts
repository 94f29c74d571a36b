import { PDFDocument, StandardFonts, rgb } from 'pdf-lib'

export interface ReceiptContent {
  studyTitle: string
  formLabel: string
  signerName: string
  signedAt: Date
  meaning: string
  clauses: { wording: string; answer: boolean }[]
  documentSha256: string
  withdrawalLink: string
}

/** Latin-1 only for the standard PDF font; other characters are shown as "?" (the e-mail has the exact text). */
function latin1(text: string): string {
  return text.normalize('NFC').replace(/[^\x20-\x7e\xa0-\xff]/g, '?')
}

function wrap(text: string, width: number, size: number, measure: (t: string, s: number) => number): string[] {
  const lines: string[] = []
  let line = ''
  for (const word of text.split(/\s+/)) {
    const next = line ? `${line} ${word}` : word
    if (measure(next, size) > width && line) {
      lines.push(line)
      line = word
    } else line = next
  }
  if (line) lines.push(line)
  return lines
}

/** The participant's copy of an electronic consent: name, time and meaning together (21 CFR 11.50). */
export async function buildConsentReceipt(content: ReceiptContent): Promise<Buffer> {
  const pdf = await PDFDocument.create()
  pdf.setTitle(latin1(`Consent receipt: ${content.studyTitle}`))
  pdf.setCreator('Heardwell')
  const font = await pdf.embedFont(StandardFonts.Helvetica)
  const bold = await pdf.embedFont(StandardFonts.HelveticaBold)
  let page = pdf.addPage([595, 842])
  let y = 790
  const write = (text: string, size = 11, f = font, colour = rgb(0.1, 0.15, 0.15)) => {
    for (const line of wrap(latin1(text), 495, size, (t, s) => f.widthOfTextAtSize(t, s))) {
      if (y < 60) {
        page = pdf.addPage([595, 842])
        y = 790
      }
      page.drawText(line, { x: 50, y, size, font: f, color: colour })
      y -= size * 1.5
    }
  }
  write('Your consent to take part in a research study', 18, bold)
  y -= 6
  write(content.studyTitle, 13, bold)
  write(`Consent form version: ${content.formLabel}`)
  y -= 8
  write('Signature', 12, bold)
  write(`Signed by: ${content.signerName}`)
  write(`Signed on: ${content.signedAt.toISOString().replace('T', ' ').slice(0, 19)} UTC`)
  write(`Meaning: ${content.meaning}`)
  y -= 8
  if (content.clauses.length) {
    write('Your answers', 12, bold)
    for (const clause of content.clauses) write(`${clause.answer ? 'Yes' : 'No'} - ${clause.wording}`)
    y -= 8
  }
  write('Changing your mind', 12, bold)
  write('Taking part is your choice. You can stop at any time. To stop, or to ask for your data to be removed, use this link:')
  write(content.withdrawalLink, 9)
  y -= 8
  write(`Form fingerprint (SHA-256): ${content.documentSha256}`, 8, font, rgb(0.35, 0.4, 0.4))
  write('This is a research study. It does not give medical advice or care.', 9, font, rgb(0.35, 0.4, 0.4))
  return Buffer.from(await pdf.save())
}

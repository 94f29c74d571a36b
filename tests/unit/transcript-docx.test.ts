import { describe, expect, it } from 'vitest'
import { parseTranscript, TranscriptParseError } from '../../server/modules/transcripts/parsing/index.js'
import { guardDocx } from '../../server/modules/transcripts/parsing/docx.js'
import { buildDocx, setDeclaredSize } from '../fixtures/transcripts/docx.js'
import { failure, turnTexts } from '../fixtures/transcripts/expect.js'

async function guardFailure(buffer: Buffer, limits?: { entries: number; bytes: number }): Promise<TranscriptParseError> {
  const error = await guardDocx(buffer, limits).then(() => null, (e: unknown) => e)
  expect(error).toBeInstanceOf(TranscriptParseError)
  return error as TranscriptParseError
}

describe('Word (.docx) transcripts: paragraphs read with the plain-text rules', () => {
  it('reads speakers, times, line breaks (as spaces) and new paragraphs (as "\\n")', async () => {
    const parsed = await parseTranscript(await buildDocx(['[0:00:03] Interviewer: Hello there.', 'P03: First line\nsecond line', 'A new paragraph.', '', 'Interviewer: Bye.']))
    expect(parsed.format).toBe('docx')
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Interviewer', 3000], ['P03', null], ['Interviewer', null]])
    expect(turnTexts(parsed)).toEqual(['Hello there.', 'First line second line\nA new paragraph.', 'Bye.'])
    expect(parsed.wordCount).toBe(10)
  })

  it('keeps "&" and "<" as text (XML escapes undone by the Word reader)', async () => {
    const parsed = await parseTranscript(await buildDocx(['Ana: Salt & pepper <maybe>.']))
    expect(turnTexts(parsed)).toEqual(['Salt & pepper <maybe>.'])
  })

  it('names the paragraph of a speaker label with no text (empty paragraphs not counted)', async () => {
    const error = await failure(await buildDocx(['Interviewer: Hi.', '', 'P03:', 'Well, it was fine.']))
    expect([error.reason, error.line]).toEqual(['speaker-without-text', 2])
    expect(error.message).toMatch(/^Paragraph 2: a speaker label with no text after it\./)
  })

  it('refuses a Word file with no speaker paragraphs', async () => {
    expect((await failure(await buildDocx(['Notes from the visit.', 'Nothing else.']))).reason).toBe('no-speakers')
  })
})

describe('damaged and unsafe Word files', () => {
  const damaged = 'The Word file could not be read; it may be damaged. Save it again and retry.'

  it('refuses a docx whose document part is not well-formed XML', async () => {
    const error = await failure(await buildDocx([], { 'word/document.xml': '<w:document><w:body><w:p>' }))
    expect([error.reason, error.message]).toEqual(['docx-damaged', damaged])
  })

  it('refuses a truncated docx', async () => {
    const whole = await buildDocx(['Ana: Hello.'])
    const error = await failure(whole.subarray(0, Math.floor(whole.length / 2)))
    expect([error.reason, error.message]).toEqual(['docx-damaged', damaged])
  })

  it('refuses more than 1,000 entries before extracting anything (zip bomb; OWASP ASVS 5.0 5.2.3)', async () => {
    const padding = Object.fromEntries(Array.from({ length: 1_000 }, (_, i) => [`customXml/item${i}.xml`, '<x/>']))
    const error = await failure(await buildDocx(['Ana: Hello.'], padding))
    expect(error.reason).toBe('docx-too-many-entries')
    expect((await guardFailure(await buildDocx(['Ana: Hi.'], { 'a.xml': '<a/>' }), { entries: 3, bytes: 1e6 })).reason).toBe('docx-too-many-entries')
  })

  it('refuses a declared uncompressed total over 200 MB (ASVS 5.0 5.2.3)', async () => {
    const zip = setDeclaredSize(await buildDocx(['Ana: Hello.'], { 'word/big.xml': '<x/>' }), 'word/big.xml', 201 * 1024 * 1024)
    expect((await failure(zip)).reason).toBe('docx-too-large')
  })

  it('refuses an entry that inflates past the limit while declaring a small size', async () => {
    const lying = setDeclaredSize(await buildDocx(['Ana: Hello.'], { 'word/big.xml': '<x>' + ' '.repeat(2_000_000) + '</x>' }), 'word/big.xml', 10)
    expect((await guardFailure(lying, { entries: 1_000, bytes: 1_000_000 })).reason).toBe('docx-too-large')
    await expect(guardDocx(await buildDocx(['Ana: Hello.']), { entries: 1_000, bytes: 1_000_000 })).resolves.toBeUndefined()
  })

  it('refuses entry names that climb out of the archive (zip slip)', async () => {
    expect((await failure(await buildDocx(['Ana: Hello.'], { '../outside.xml': '<x/>' }))).reason).toBe('docx-unsafe-path')
  })
})

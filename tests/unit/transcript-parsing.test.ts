import { describe, expect, it } from 'vitest'
import { detectFormat, parseTranscript, TranscriptParseError } from '../../server/modules/transcripts/parsing/index.js'
import { failure, turnTexts } from '../fixtures/transcripts/expect.js'
import { buildDocx, buildZip } from '../fixtures/transcripts/docx.js'
import { longTranscript, PDF_BYTES, PLAIN, PNG_BYTES, SRT, VTT } from '../fixtures/transcripts/samples.js'

describe('plain-text transcripts ("Speaker: text" lines; common practice)', () => {
  it('reads speakers, [h:mm:ss] times, continuation lines and paragraph breaks', async () => {
    const parsed = await parseTranscript(Buffer.from(PLAIN))
    expect(parsed.format).toBe('text')
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Interviewer', 5000], ['P03', 12000], ['Interviewer', null]])
    expect(turnTexts(parsed)).toEqual([
      'Thanks for joining. Could you tell me about your first visit to the clinic?',
      'It was a Tuesday, I think. I waited a long time.\nThen a nurse called my name.',
      'And how did that feel?',
    ])
    expect(parsed.wordCount).toBe(36) // 14 + 11 + 6 + 5, counted by hand
  })

  it('reads [mm:ss], a time alone on the line before a speaker, and colons that are not labels', async () => {
    const parsed = await parseTranscript(Buffer.from('[01:30] Ana: We met at 10:30 in the morning.\n[2:05]\nBo: See https://example.org then.'))
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Ana', 90_000], ['Bo', 125_000]])
    expect(turnTexts(parsed)).toEqual(['We met at 10:30 in the morning.', 'See https://example.org then.'])
  })

  it('gives the same result for CRLF line endings and a UTF-8 BOM', async () => {
    const crlf = await parseTranscript(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(PLAIN.replace(/\n/g, '\r\n'))]))
    expect(crlf).toEqual(await parseTranscript(Buffer.from(PLAIN)))
  })

  it('refuses a speaker line with no text, naming its line', async () => {
    const error = await failure('Interviewer: Hello.\nP03: Hi.\n\nInterviewer:\nSo, about the clinic.')
    expect(error.reason).toBe('speaker-without-text')
    expect(error.line).toBe(4)
    expect(error.message).toMatch(/^Line 4: a speaker label with no text after it\./)
  })

  it('refuses a file with no speaker lines, saying the format needs them', async () => {
    const error = await failure('We talked about the clinic.\nIt was a long day.')
    expect(error.reason).toBe('no-speakers')
    expect(error.message).toContain('"Interviewer: So tell me…"')
  })

  it('refuses text before the first speaker, and a malformed time, naming the line', async () => {
    expect((await failure('Interview notes\nAna: Hello.')).line).toBe(1)
    const error = await failure('Ana: Hello.\n[0:75] Bo: Hi.')
    expect([error.reason, error.line]).toEqual(['bad-time', 2])
  })
})

describe('format detection by content, never by file name', () => {
  it('recognises each format from its bytes', async () => {
    expect(detectFormat(Buffer.from(PLAIN))).toBe('text')
    expect(detectFormat(Buffer.from(VTT))).toBe('vtt') // W3C WebVTT §4.1: file starts with "WEBVTT"
    expect(detectFormat(Buffer.from(SRT))).toBe('srt') // SRT convention: index line, then "start --> end"
    expect(detectFormat(Buffer.from('WEBVTTX\nAna: hi'))).toBe('text') // WebVTT: "WEBVTT" then space, tab or line end
    expect(detectFormat(await buildDocx(['Ana: hi']))).toBe('docx')
  })

  it.each([
    ['an empty file', Buffer.alloc(0), 'empty', /^The file is empty\.$/],
    ['a file of blank lines', Buffer.from('\n \n'), 'empty', /^The file is empty\.$/],
    ['PDF bytes', PDF_BYTES, 'pdf', /^This looks like a PDF; export the transcript as \.docx, \.txt, \.vtt or \.srt\.$/],
    ['PNG bytes', PNG_BYTES, 'image', /image/],
    ['invalid UTF-8', Buffer.from([0x41, 0x6e, 0x61, 0x3a, 0x20, 0xff, 0xfe, 0x41]), 'not-utf8', /not UTF-8/],
    ['a NUL byte', Buffer.from('Ana: hi\0there'), 'binary', /NUL/],
    ['UTF-16 text', Buffer.from('\ufeffAna: hi', 'utf16le'), 'not-utf8', /UTF-16/],
  ])('refuses %s with a reason', (_name, bytes, reason, message) => {
    const error = (() => { try { detectFormat(bytes) } catch (e) { return e } })() as TranscriptParseError
    expect(error).toBeInstanceOf(TranscriptParseError)
    expect(error.reason).toBe(reason)
    expect(error.message).toMatch(message)
  })

  it('refuses a zip that is not a Word document', async () => {
    const error = await failure(await buildZip({ 'notes.txt': 'Ana: hi', 'word/other.xml': '<x/>' }))
    expect(error.reason).toBe('not-docx')
    expect(error.message).toMatch(/^This is not a transcript format we read: /)
  })
})

describe('offsets and Unicode NFC (UAX #15) in every format', () => {
  const decomposed = 'Jose\u0301' // "José" with a combining acute accent (NFD)
  const words = `I felt 😊 then Cafe\u0301 time` // emoji is two UTF-16 units; é arrives decomposed
  const expected = ['Hello 👋🏽 there.', 'I felt 😊 then Café time']

  it.each([
    ['text', () => Buffer.from(`Ana: Hello 👋🏽 there.\n${decomposed}: ${words}`)],
    ['vtt', () => Buffer.from(`WEBVTT\n\n00:01.000 --> 00:02.000\n<v Ana>Hello 👋🏽 there.</v>\n\n00:02.000 --> 00:03.000\n<v ${decomposed}>${words}`)],
    ['srt', () => Buffer.from(`1\n00:00:01,000 --> 00:00:02,000\nAna: Hello 👋🏽 there.\n\n2\n00:00:02,000 --> 00:00:03,000\n${decomposed}: ${words}\n`)],
    ['docx', () => buildDocx(['Ana: Hello 👋🏽 there.', `${decomposed}: ${words}`])],
  ])('%s: NFD in, NFC out, and text.slice(start, end) is each turn', async (format, build) => {
    const parsed = await parseTranscript(await build())
    expect(parsed.format).toBe(format)
    expect(turnTexts(parsed)).toEqual(expected)
    expect(parsed.turns.map((t) => t.speaker)).toEqual(['Ana', 'José'])
    expect(parsed.turns[1].start).toBe(19) // "Hello 👋🏽 there." is 17 UTF-16 units (👋🏽 is 4), then "\n\n"
    expect(parsed.wordCount).toBe(7) // 2 + 5: an emoji alone is not a word (common practice)
  })
})

describe('performance (logged, not asserted)', () => {
  it('parses a 30,000-word plain-text transcript', async () => {
    const input = Buffer.from(longTranscript(30_000))
    const began = performance.now()
    const parsed = await parseTranscript(input)
    console.log(`30,000-word transcript (${(input.length / 1024).toFixed(0)} KiB, ${parsed.turns.length} turns) parsed in ${(performance.now() - began).toFixed(1)} ms`)
    expect(parsed.wordCount).toBe(30_000)
    expect(parsed.turns).toHaveLength(750)
  })
})

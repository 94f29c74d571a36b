import { describe, expect, it } from 'vitest'
import { parseTranscript } from '../../server/modules/transcripts/parsing/index.js'
import { failure, turnTexts } from '../fixtures/transcripts/expect.js'
import { SRT, VTT } from '../fixtures/transcripts/samples.js'

const vtt = (...blocks: string[]) => ['WEBVTT', ...blocks].join('\n\n')

describe('WebVTT captions (W3C WebVTT, https://www.w3.org/TR/webvtt1/)', () => {
  it('reads voice tags, merges one speaker\'s cues, and skips NOTE blocks and cue identifiers', async () => {
    const parsed = await parseTranscript(Buffer.from(VTT))
    expect(parsed.format).toBe('vtt')
    // §4.2.2 voice span <v Annotation>; §3 cue identifier "intro"; §4.1 NOTE comment block
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Interviewer', 1000], ['Ana', 7000]])
    // A cue line that merely starts with "NOTE" is cue text, not a comment (§4.1: comments are blocks).
    expect(turnTexts(parsed)).toEqual(['Welcome, and thank you for coming. Shall we begin?', 'Yes & I am ready. NOTE the words continue here'])
  })

  it('splits a cue holding two voices, strips other markup and inner timestamps, and skips STYLE/REGION blocks', async () => {
    const parsed = await parseTranscript(Buffer.from(vtt('STYLE\n::cue { color: yellow }', 'REGION\nid:left', '00:01.000 --> 00:02.000\n<v Ana>Hi.</v> <v Bo>Hello <c.loud>there</c> <00:00:01.500><b>you</b>.</v>')))
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Ana', 1000], ['Bo', 1000]])
    expect(turnTexts(parsed)).toEqual(['Hi.', 'Hello there you.'])
  })

  it('lets a cue without a speaker continue the speaker before it, and a "Name:" prefix name one', async () => {
    const parsed = await parseTranscript(Buffer.from(vtt('00:01.000 --> 00:02.000\nInterviewer: Ready?', '00:02.000 --> 00:03.000\nGo on.', '00:04.000 --> 00:05.000\nP03: Yes.')))
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Interviewer', 1000], ['P03', 4000]])
    expect(turnTexts(parsed)).toEqual(['Ready? Go on.', 'Yes.'])
  })

  it('refuses a cue that ends before it starts, naming its line (§4.2: end after start)', async () => {
    const error = await failure(vtt('00:00:05.000 --> 00:00:02.000\n<v Ana>Hello.'))
    expect([error.reason, error.line]).toEqual(['cue-timing', 3])
    expect(error.message).toBe('Line 3: cue 1 ends (00:00:02.000) before it starts (00:00:05.000).')
  })

  it('refuses cues going backwards in time (§4.2: start not before any earlier cue\'s start)', async () => {
    const error = await failure(vtt('00:00:05.000 --> 00:00:06.000\n<v Ana>Hello.', '00:00:01.000 --> 00:00:02.000\n<v Bo>Hi.'))
    expect([error.reason, error.line]).toEqual(['cue-order', 6])
    expect(error.message).toMatch(/^Line 6: cue 2 starts at 00:00:01\.000, earlier than the cue before it \(00:00:05\.000\)/)
  })

  it.each([
    ['a letter in the time', '00:00:01.000 --> 00:00:0x.000'],
    ['75 seconds (§4.2: seconds 00–59)', '00:00:75.000 --> 00:01:20.000'],
    ['a missing arrow space', '00:00:01.000 -->00:00:02.000'],
  ])('refuses an unparseable cue timing: %s', async (_name, timing) => {
    const error = await failure(vtt(`${timing}\n<v Ana>Hello.`))
    expect([error.reason, error.line]).toEqual(['bad-cue-timing', 3])
    expect(error.message).toMatch(/^Line 3: the cue timing ".*" is not valid/)
  })

  it('refuses a numbered cue with no timing line after its number, naming the line (§4.1 cue block)', async () => {
    const error = await failure(vtt('1\n<v Ana>Hello.'))
    expect([error.reason, error.line]).toEqual(['bad-cue', 4])
    expect(error.message).toMatch(/^Line 4: expected a cue timing like "00:00:01\.000 --> 00:00:04\.000" here/)
  })

  it('refuses captions that name no speaker, and a first cue with none when later cues do', async () => {
    expect((await failure(vtt('00:01.000 --> 00:02.000\nHello.'))).reason).toBe('no-speakers')
    const error = await failure(vtt('00:01.000 --> 00:02.000\nHello.', '00:02.000 --> 00:03.000\n<v Ana>Hi.'))
    expect([error.reason, error.line]).toEqual(['cue-without-speaker', 4])
  })
})

describe('SRT captions (SRT convention: index, "HH:MM:SS,mmm --> HH:MM:SS,mmm", text, blank line; common practice)', () => {
  it('reads "Name:" prefixes, CRLF line endings, <i> markup and merges one speaker\'s cues', async () => {
    const parsed = await parseTranscript(Buffer.from(SRT))
    expect(parsed.format).toBe('srt')
    expect(parsed.turns.map((t) => [t.speaker, t.startMs])).toEqual([['Interviewer', 2000], ['P03', 5500]])
    expect(turnTexts(parsed)).toEqual(['How long have you lived here?', 'Ten years. Maybe eleven.'])
    expect(parsed.wordCount).toBe(10)
  })

  it('refuses text after a blank line with no cue timing, naming the line', async () => {
    const error = await failure('1\n00:00:01,000 --> 00:00:02,000\nAna: Hello.\n\n2\nBo: No timing here.\n')
    expect([error.reason, error.line]).toEqual(['bad-cue', 5])
  })

  it('refuses a cue identifier that is not followed by a timing, naming the line', async () => {
    const error = await failure('\n1\n00:00:01,000 --> 00:00:02,000\nAna: Hello.\n\nsecond\n00:00:03,000 --> 00:00:04,000\nBo: Hi.\n')
    expect([error.reason, error.line]).toEqual(['bad-cue', 6])
  })

  it('refuses a cue speaker label with no text', async () => {
    const error = await failure('1\n00:00:01,000 --> 00:00:02,000\nAna:\nHello.\n')
    expect([error.reason, error.line, error.message]).toEqual(['speaker-without-text', 3, 'Line 3: a speaker label with no text after it.'])
  })
})

import subtitle from 'subtitle'
import { tidySpaces } from './canonical.js'
import { matchLabel } from './text.js'
import { TranscriptParseError, type Segment } from './types.js'

/**
 * WebVTT (W3C WebVTT, https://www.w3.org/TR/webvtt1/) and SRT (common practice) captions, read with `subtitle`.
 * A voice tag `<v Ana>` or a leading "Ana: " names the speaker; a cue without either continues the speaker
 * before it; consecutive cues of one speaker merge into a turn that starts at its first cue.
 */
const { parseSync, RE_TIMESTAMP } = subtitle

const VOICE = /<v(?:\.[^\s>]*)?[ \t]+([^>]*)>/g
const VOICE_START = /<v[ .\t]/
const TAG = /<[^>\n]*>/g
/** mm:ss 2 digits each (00–59) and a 3-digit fraction (WebVTT §4.2 timestamps; SRT uses "," instead of "."). */
const TIME = /^(?:\d+:)?[0-5]\d:[0-5]\d[.,]\d{3}$/
const ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'", nbsp: '\u00a0', lrm: '\u200e', rlm: '\u200f' }
/** Marks cue lines starting with "NOTE", which `subtitle` would otherwise take for a comment; removed after. */
const NOTE_GUARD = '\ue000'

function clock(ms: number): string {
  const pad = (n: number, w = 2) => String(Math.floor(n)).padStart(w, '0')
  return `${pad(ms / 3_600_000)}:${pad((ms / 60_000) % 60)}:${pad((ms / 1000) % 60)}.${pad(ms % 1000, 3)}`
}

function decode(value: string): string {
  return value.replace(/&(#x[\da-f]+|#\d+|[a-z]+);/gi, (whole, name: string) => {
    if (name[0] !== '#') return ENTITIES[name.toLowerCase()] ?? whole
    const code = name[1].toLowerCase() === 'x' ? parseInt(name.slice(2), 16) : parseInt(name.slice(1), 10)
    return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : whole
  })
}

/**
 * Readies the lines for `subtitle` without changing their count (so line numbers stay true): cue identifiers
 * that are not numbers become "0", STYLE/REGION blocks become NOTE blocks (VTT), and every "-->" line is
 * checked and its line number kept, one per cue in order.
 */
function prepare(text: string, isVtt: boolean): { lines: string[]; timings: number[] } {
  const lines = text.split('\n').map((line) => line.trimEnd())
  const timings: number[] = []
  let blockStart = true
  let skipping = isVtt
  lines.forEach((line, i) => {
    if (!line) {
      blockStart = true
      skipping = false
      return
    }
    if (isVtt && blockStart && /^(?:STYLE|REGION)(?:[ \t]|$)/.test(line)) [lines[i], skipping] = ['NOTE', true]
    else if (isVtt && blockStart && /^NOTE(?:[ \t]|$)/.test(line)) skipping = true
    else if (skipping) return
    else if (line.includes('-->')) {
      const match = RE_TIMESTAMP.exec(line)
      if (!match || !TIME.test(match[1]) || !TIME.test(match[2])) {
        throw new TranscriptParseError('bad-cue-timing', `Line ${i + 1}: the cue timing "${line}" is not valid; write it like "00:00:01.000 --> 00:00:04.000".`, i + 1)
      }
      timings.push(i + 1)
    } else if (isVtt && blockStart && lines[i + 1]?.includes('-->') && !/^\d+$/.test(line)) lines[i] = '0'
    else if (line.startsWith('NOTE')) lines[i] = NOTE_GUARD + line
    blockStart = false
  })
  return { lines, timings }
}

function readCues(text: string, isVtt: boolean) {
  const { lines, timings } = prepare(text, isVtt)
  try {
    const cues = parseSync(lines.join('\n')).flatMap((node) => (node.type === 'cue' ? [node.data] : []))
    return cues.map((cue, i) => ({ ...cue, text: cue.text.split(NOTE_GUARD).join(''), line: timings[i] ?? null }))
  } catch (error) {
    const row = /at row (\d+)/.exec(String((error as Error).message))
    const line = row ? lines.findIndex((l) => l.trim()) + Number(row[1]) : null
    throw new TranscriptParseError('bad-cue', `${line ? `Line ${line}: ` : ''}expected a cue timing like "00:00:01.000 --> 00:00:04.000" here. Check the blank line between cues.`, line)
  }
}

export function parseCues(text: string, format: 'vtt' | 'srt'): Segment[] {
  const cues = readCues(text, format === 'vtt')
  if (!cues.length) throw new TranscriptParseError('no-cues', 'This caption file has no cues (no timed text) in it.')
  const segments: Segment[] = []
  let speaker: string | null = null
  let previousStart = 0
  cues.forEach((cue, i) => {
    const at = cue.line ? `Line ${cue.line}: ` : ''
    if (cue.end < cue.start) {
      throw new TranscriptParseError('cue-timing', `${at}cue ${i + 1} ends (${clock(cue.end)}) before it starts (${clock(cue.start)}).`, cue.line)
    }
    if (cue.start < previousStart) {
      throw new TranscriptParseError('cue-order', `${at}cue ${i + 1} starts at ${clock(cue.start)}, earlier than the cue before it (${clock(previousStart)}); cues must be in time order.`, cue.line)
    }
    previousStart = cue.start
    const voiced = VOICE_START.test(cue.text)
    cue.text.split('\n').forEach((raw, k) => {
      const line = cue.line ? cue.line + 1 + k : null
      const where = line ? `Line ${line}: ` : ''
      if (!raw.trim()) throw new TranscriptParseError('bad-cue', `${line ? `Line ${line + 1}: ` : ''}this text follows a blank line but has no cue timing; each cue needs a timing line like "00:00:01.000 --> 00:00:04.000".`, line && line + 1)
      const pieces: { voice?: string; text: string }[] = []
      let last = 0
      for (const match of raw.matchAll(VOICE)) {
        pieces.push({ text: raw.slice(last, match.index) }, { voice: tidySpaces(decode(match[1])), text: '' })
        last = match.index + match[0].length
      }
      pieces.push({ text: raw.slice(last) })
      for (const piece of pieces) {
        if (piece.voice) speaker = piece.voice
        let body = tidySpaces(decode(piece.text.replace(TAG, '')))
        if (!body) continue
        const label = voiced ? null : matchLabel(body.replace(/^[-–—] +/, ''))
        if (label && !label.text) throw new TranscriptParseError('speaker-without-text', `${where}a speaker label with no text after it.`, line)
        if (label) [speaker, body] = [label.speaker, label.text]
        if (!speaker) throw noSpeaker(cues, where, line)
        const previous = segments.at(-1)
        if (previous?.speaker === speaker) previous.text += ' ' + body
        else segments.push({ speaker, startMs: cue.start, text: body })
      }
    })
  })
  return segments
}

function noSpeaker(cues: { text: string }[], where: string, line: number | null): TranscriptParseError {
  const named = cues.some((cue) => VOICE_START.test(cue.text) || cue.text.split('\n').some((l) => matchLabel(tidySpaces(l.replace(TAG, '')))))
  const how = 'Mark who speaks with a voice tag like <v Interviewer> (WebVTT) or start the cue text with "Interviewer: ".'
  if (!named) return new TranscriptParseError('no-speakers', `No speakers are named in these captions. ${how}`)
  return new TranscriptParseError('cue-without-speaker', `${where}this cue does not say who is speaking, and no cue before it does. ${how}`, line)
}

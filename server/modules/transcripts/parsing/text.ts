import { tidySpaces } from './canonical.js'
import { TranscriptParseError, type Segment } from './types.js'

/** One line of source text; `where` is what error messages cite; `newParagraph` marks a break before it. */
export interface SourceLine {
  text: string
  where: number
  newParagraph: boolean
}
export type Place = 'Line' | 'Paragraph'

/**
 * "Speaker: text" (common practice): a label of 1–40 letters, digits, spaces and . ' ’ ( ) # _ -, at most
 * four words, starting with a letter or digit, then a colon followed by a space or the end of the line.
 * "10:30" and "https://…" are not labels because no space follows their colon.
 */
const LABEL = /^([\p{L}\p{N}][\p{L}\p{M}\p{N} .'’()#_-]{0,39}?)\s*:(?:\s+(.*))?$/u
const MAX_LABEL_WORDS = 4
/** A leading "[…]" holding only digits, colons and dots is meant as a time (common practice). */
const STAMP = /^\[([\d.]*:[\d:.]*)\]\s*(.*)$/
const HOURS_MINUTES_SECONDS = /^(\d{1,2}):([0-5]\d):([0-5]\d)$/
const MINUTES_SECONDS = /^(\d{1,3}):([0-5]\d)$/

const EXAMPLE = '"Interviewer: So tell me…"'

export function matchLabel(body: string): { speaker: string; text: string } | null {
  const match = LABEL.exec(body)
  if (!match) return null
  const speaker = tidySpaces(match[1])
  if (speaker.split(' ').length > MAX_LABEL_WORDS) return null
  return { speaker, text: tidySpaces(match[2] ?? '') }
}

/** Reads a leading [h:mm:ss] or [mm:ss]; returns null when the line has none, throws when it is malformed. */
function readStamp(body: string, line: SourceLine, place: Place): { ms: number; rest: string } | null {
  const match = STAMP.exec(body)
  if (!match) return null
  const hms = HOURS_MINUTES_SECONDS.exec(match[1])
  const ms = MINUTES_SECONDS.exec(match[1])
  if (!hms && !ms) {
    throw new TranscriptParseError('bad-time', `${place} ${line.where}: "[${match[1]}]" is not a time we read; write times as [h:mm:ss] or [mm:ss].`, line.where)
  }
  const [h, m, s] = hms ? [hms[1], hms[2], hms[3]] : ['0', ms![1], ms![2]]
  return { ms: ((Number(h) * 60 + Number(m)) * 60 + Number(s)) * 1000, rest: match[2] }
}

function stripStamp(body: string): string {
  return STAMP.exec(body)?.[2] ?? body
}

/**
 * The shared turn rules for plain text and Word files: a "Speaker: text" line starts a turn (with the time of
 * a leading [h:mm:ss], or of a time alone on the line just before); a line without a label continues the turn,
 * joined by a space, or by "\n" when a paragraph break comes before it. Messages never quote transcript words.
 */
export function parseSpeakerLines(lines: SourceLine[], place: Place): Segment[] {
  const segments: Segment[] = []
  let current: Segment | null = null
  let pendingMs: number | null = null
  for (const line of lines) {
    let body = tidySpaces(line.text)
    if (!body) continue
    const stamp = readStamp(body, line, place)
    if (stamp) {
      body = stamp.rest
      if (!body) {
        pendingMs = stamp.ms
        continue
      }
    }
    const label = matchLabel(body)
    if (label) {
      if (!label.text) {
        throw new TranscriptParseError('speaker-without-text', `${place} ${line.where}: a speaker label with no text after it. Put the words on the same ${place.toLowerCase()} as the label, like ${EXAMPLE}`, line.where)
      }
      current = { speaker: label.speaker, startMs: stamp?.ms ?? pendingMs, text: label.text }
      segments.push(current)
    } else if (current) {
      current.text += (line.newParagraph ? '\n' : ' ') + body
    } else if (lines.some((l) => matchLabel(stripStamp(tidySpaces(l.text))))) {
      throw new TranscriptParseError('text-before-speaker', `${place} ${line.where}: this text comes before the first speaker label. Start each turn with the speaker's name and a colon, like ${EXAMPLE}, or remove the heading.`, line.where)
    } else {
      break
    }
    pendingMs = null
  }
  if (!segments.length) {
    throw new TranscriptParseError('no-speakers', `No speaker labels were found. This format needs each turn to start on its own ${place.toLowerCase()} with the speaker's name and a colon, like ${EXAMPLE} or "P03: Well…".`)
  }
  return segments
}

/** Plain text: lines separated by \n (already normalised); blank lines mark paragraph breaks within a turn. */
export function parsePlainText(text: string): Segment[] {
  const lines: SourceLine[] = []
  let blankBefore = false
  text.split('\n').forEach((raw, i) => {
    if (!raw.trim()) {
      blankBefore = true
      return
    }
    lines.push({ text: raw, where: i + 1, newParagraph: blankBefore })
    blankBefore = false
  })
  return parseSpeakerLines(lines, 'Line')
}

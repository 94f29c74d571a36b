// Picks the stretches of a transcript worth handing to compromise, whose tagger costs about
// 1 s per 30,000 words here. A sentence is worth tagging only if it holds a capital letter that
// could start a name: any capitalised word after the first (other than "I", "I'm", "OK"…), or a
// first word that is not a common sentence opener. Lower-case names are missed either way.

const OPENERS = new Set(('a about after again all also an and anyway as at because before but by did do does ' +
  'even every for from had has have he her here his how i i\'d i\'ll i\'m i\'ve if in is it it\'s just last like ' +
  'maybe me mm my no not now of oh ok okay on once one our really right she so some sometimes still that that\'s ' +
  'the then there there\'s these they they\'re this those to uh um very was we we\'d we\'re well what when where ' +
  'which while who why with yeah yes you you\'re actually basically honestly obviously apparently luckily sadly ' +
  'hopefully unfortunately thankfully can could would will should shall may might must are were').split(' '))
// Speaker labels that are roles or codes ("Interviewer:", "P07:", "INT:"), not names.
const SPEAKER_LABEL = /^\s*([\p{L}\d][\p{L}\d .'-]{0,30}):\s+/u
const ROLE_LABEL = /^(?:interviewer|participant|respondent|facilitator|moderator|carer|caregiver|int|resp|[a-z]{1,3}\d*)$/i
const PRONOUN_I = /^(?:I|I['’](?:m|ve|ll|d)|OK)$/
// Ends a sentence: ., ! or ? then space — except after a short title or abbreviation ("Mrs. Lind").
const SENTENCE_END = /(?<=[.!?]["'’”)]?)(?<!\b(?:Mr|Mrs|Ms|Mx|Dr|Prof|Rev|St|Mt|No|Nos|Sept?|Jan|Feb|Mar|Apr|Jun|Jul|Aug|Oct|Nov|Dec|approx|etc|vs|e\.g|i\.e)\.)\s+|\n+/g

function worthTagging(turn: string): boolean {
  const label = SPEAKER_LABEL.exec(turn)
  if (label && !ROLE_LABEL.test(label[1].trim())) return true // a speaker named in the label
  const sentence = label ? turn.slice(label[0].length) : turn
  const [opener, ...rest] = sentence.match(/[\p{L}'’&-]+/gu) ?? []
  if (opener === undefined) return false
  if (/^\p{Lu}/u.test(opener) && !OPENERS.has(opener.replace(/’/g, "'").toLowerCase()) && !PRONOUN_I.test(opener)) return true
  return rest.some((w) => /^\p{Lu}/u.test(w) && !PRONOUN_I.test(w))
}

/** Runs of adjacent sentences worth tagging, as [start, end) spans of `text`. */
export function taggableSpans(text: string): [number, number][] {
  const spans: [number, number][] = []
  let start = 0
  const consider = (from: number, to: number) => {
    if (!worthTagging(text.slice(from, to))) return
    const last = spans[spans.length - 1]
    if (last && /^\s*$/.test(text.slice(last[1], from)) && !text.slice(last[1], from).includes('\n')) last[1] = to
    else spans.push([from, to])
  }
  for (const m of text.matchAll(SENTENCE_END)) {
    consider(start, m.index)
    start = m.index + m[0].length
  }
  consider(start, text.length)
  return spans
}

import type { MethodsSummary } from '../schemas/reports.js'

export type MethodsFacts = MethodsSummary['facts']

const MODE_WORDS: Record<string, string> = { in_person: 'in person', video: 'by video call', phone: 'by telephone' }

const NUMBER_WORDS = ['no', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine']

/** Numbers below ten as words, as many style guides ask (common practice). */
function count(n: number, singular: string, plural = `${singular}s`): string {
  const amount = Number.isInteger(n) && n >= 0 && n < NUMBER_WORDS.length ? NUMBER_WORDS[n]! : String(n)
  return `${amount} ${n === 1 ? singular : plural}`
}

function capitalise(sentence: string): string {
  return sentence.charAt(0).toUpperCase() + sentence.slice(1)
}

function listWords(parts: readonly string[]): string {
  if (parts.length <= 1) return parts.join('')
  return `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`
}

function minutes(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toFixed(1)
}

function interviewsParagraph(f: MethodsFacts): string {
  if (f.interviews <= 0) return 'No interviews have been completed yet.'
  const modes = f.modes.filter((m) => m.count > 0).map((m) => `${m.count} ${MODE_WORDS[m.mode] ?? m.mode.replace(/_/g, ' ')}`)
  let text = `We completed ${count(f.interviews, 'interview')}`
  text += modes.length > 0 ? ` (${listWords(modes)}).` : '.'
  const d = f.duration
  if (d && d.n > 0) {
    text +=
      d.n === 1
        ? ` The one interview with a recorded length lasted ${minutes(d.mean)} minutes.`
        : ` Interviews lasted a mean of ${d.mean.toFixed(1)} minutes (median ${minutes(d.median)}, range ${minutes(d.min)}–${minutes(d.max)} minutes${d.n < f.interviews ? `; ${d.n} interviews with a recorded length` : ''}).`
  }
  return text
}

function agreementSentence(a: NonNullable<MethodsFacts['agreement']>): string {
  const parts: string[] = []
  if (a.alpha !== null && Number.isFinite(a.alpha)) parts.push(`Krippendorff's alpha ${a.alpha.toFixed(2)}`)
  if (a.kappa !== null && Number.isFinite(a.kappa)) parts.push(`Cohen's kappa ${a.kappa.toFixed(2)}`)
  if (a.percentAgreement !== null && Number.isFinite(a.percentAgreement)) parts.push(`percent agreement ${(a.percentAgreement * 100).toFixed(1)}%`)
  const unit = a.unit.trim() || 'unit'
  if (parts.length === 0) return `Inter-coder agreement on ${unit}s could not be computed yet.`
  return `Inter-coder agreement on ${unit}s: ${parts.join(', ')} (Krippendorff 2004; Landis & Koch 1977).`
}

function codingParagraph(f: MethodsFacts): string {
  if (f.coders <= 0) return 'No transcripts have been coded yet.'
  let text = f.coders === 1 ? 'One researcher coded the transcripts.' : `${capitalise(count(f.coders, 'researcher'))} coded the transcripts.`
  if (f.agreement) text += ` ${agreementSentence(f.agreement)}`
  return text
}

function partnersParagraph(f: MethodsFacts): string {
  if (f.reviewRounds <= 0) return 'Patient partners have not yet been asked to review the emerging findings.'
  return `Patient partners reviewed the emerging findings in ${count(f.reviewRounds, 'review round')} and gave ${count(f.partnerAnswers, 'answer')}.`
}

/**
 * Plain paragraphs for a methods section that a team can adapt: interviews, coding and agreement,
 * saturation, and patient partner involvement. `agreement.percentAgreement` is a share from 0 to 1,
 * as the agreement computations return it.
 */
export function methodsParagraphs(facts: MethodsFacts): string[] {
  const paragraphs = [interviewsParagraph(facts), codingParagraph(facts)]
  const saturation = facts.saturation?.trim()
  if (saturation) paragraphs.push(saturation)
  paragraphs.push(partnersParagraph(facts))
  return paragraphs
}

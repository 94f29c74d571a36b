/**
 * Parsing and scanning a 30,000-word transcript (about three hours of talk): the time, the words per
 * second, and the ratio to a plain regular-expression pass over the same text in the same run (the
 * baseline: what a bare e-mail/phone/date regex sweep costs). Target from the issue: under one second.
 */
import { performance } from 'node:perf_hooks'
import { scanForIdentifiers } from '../../shared/deidentify/index.js'
import { parseTranscript } from '../../server/modules/transcripts/parsing/index.js'

const SENTENCES = [
  'When Mum came home from the stroke unit nobody really explained the tablets to us.',
  'I rang the ward on (604) 555-0142 twice and nobody called back until the Friday.',
  'My brother Tobias drove up from Marlow Creek on 14 March 2024 to help with the stairs.',
  'The occupational therapist was kind, but the leaflet was far too long to read that week.',
  'She is 74 now and still gets tired in the afternoons, so we keep the visits short.',
  'I wrote to the clinic at help@example.org and got a reply the next morning.',
  'Looking back, I wish someone had sat with us for ten minutes and just listened.',
]

function makeTranscript(words: number): string {
  const lines: string[] = []
  let count = 0
  let turn = 0
  while (count < words) {
    const speaker = turn % 2 === 0 ? 'Interviewer' : 'Participant'
    const seconds = turn * 14
    const stamp = `[${Math.floor(seconds / 3600)}:${String(Math.floor((seconds % 3600) / 60)).padStart(2, '0')}:${String(seconds % 60).padStart(2, '0')}]`
    const text = turn % 2 === 0 ? 'Could you tell me a little more about that?' : [0, 1, 2].map((i) => SENTENCES[(turn + i) % SENTENCES.length]).join(' ')
    lines.push(`${stamp} ${speaker}: ${text}`)
    count += text.split(/\s+/).length
    turn++
  }
  return lines.join('\n')
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

export async function runTranscriptScan(): Promise<void> {
  const source = Buffer.from(makeTranscript(30_000), 'utf8')
  const baselineRegex = [/[\w.+-]+@[\w-]+\.[\w.]+/g, /\(?\d{3}\)?[ -]?\d{3}-\d{4}/g, /\b\d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4}\b/g]
  const runs = 5
  const full: number[] = []
  const base: number[] = []
  let flags = 0
  let words = 0
  let baselineHits = 0
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now()
    const parsed = await parseTranscript(source)
    flags = scanForIdentifiers(parsed.text).length
    full.push(performance.now() - t0)
    words = parsed.wordCount
    const text = source.toString('utf8')
    const t1 = performance.now()
    baselineHits = 0
    for (const re of baselineRegex) baselineHits += [...text.matchAll(re)].length
    base.push(performance.now() - t1)
  }
  const fullMs = median(full)
  const baseMs = median(base)
  console.log(`\ntranscript parse + scan, ${words.toLocaleString('en')} words, median of ${runs} runs`)
  console.log(`${'pass'.padEnd(44)} ${'ms'.padStart(8)} ${'words/s'.padStart(10)}`)
  console.log(`${'parse + assisted scan (all detectors)'.padEnd(44)} ${fullMs.toFixed(0).padStart(8)} ${Math.round(words / (fullMs / 1000)).toLocaleString('en').padStart(10)}`)
  console.log(`${'baseline: three plain regular expressions'.padEnd(44)} ${baseMs.toFixed(1).padStart(8)} ${Math.round(words / (baseMs / 1000)).toLocaleString('en').padStart(10)}`)
  console.log(`ratio (scan time / baseline time): ${(fullMs / baseMs).toFixed(1)} · flags found: ${flags} (baseline matches: ${baselineHits}) · target under 1,000 ms: ${fullMs < 1000 ? 'met' : 'NOT met'}`)
}

/**
 * Agreement for a study at scale: 2 coders × N transcripts × 300 units × 60 codes, for N and 2N in the
 * same run (target: under one second for N = 100, and 2N/N near 2 — the work grows with the units,
 * not faster). Synthetic, seeded data; the excerpts are built before the clock starts.
 */
import { studyAgreement, type CodedExcerpt, type Span } from '../../shared/analysis/study-agreement.js'

const UNITS = 300
const CODES = 60
const N = Number(process.env.BENCH_TRANSCRIPTS ?? 100)

function seeded(seed: number): () => number {
  let state = seed
  return () => (state = (state * 1103515245 + 12345) % 2 ** 31) / 2 ** 31
}

function build(transcripts: number) {
  const random = seeded(transcripts)
  const codeIds = Array.from({ length: CODES }, (_, i) => `code-${i}`)
  const units = new Map<string, Span[]>()
  const excerpts: CodedExcerpt[] = []
  for (let t = 0; t < transcripts; t++) {
    const id = `t-${t}`
    const spans = Array.from({ length: UNITS }, (_, u) => ({ start: u * 100, end: u * 100 + 90 }))
    units.set(id, spans)
    for (let u = 0; u < UNITS; u++) {
      if (random() > 0.3) continue // most units carry no code
      const codes = [codeIds[Math.floor(random() * CODES)]!]
      if (random() < 0.3) codes.push(codeIds[Math.floor(random() * CODES)]!)
      excerpts.push({ transcriptId: id, coderId: 'A', start: spans[u]!.start + 5, end: spans[u]!.end - 5, codeIds: codes })
      // the second coder mostly agrees, sometimes with another code, sometimes not at all
      const roll = random()
      if (roll < 0.75) excerpts.push({ transcriptId: id, coderId: 'B', start: spans[u]!.start, end: spans[u]!.end, codeIds: codes })
      else if (roll < 0.9) excerpts.push({ transcriptId: id, coderId: 'B', start: spans[u]!.start, end: spans[u]!.end, codeIds: [codeIds[Math.floor(random() * CODES)]!] })
    }
  }
  return { units, excerpts, coderIds: ['A', 'B'], codeIds }
}

function time(transcripts: number): { ms: number; units: number; disagreements: number } {
  const input = build(transcripts)
  studyAgreement(input) // warm-up
  const runs: number[] = []
  let result = studyAgreement(input)
  for (let i = 0; i < 3; i++) {
    const started = performance.now()
    result = studyAgreement(input)
    runs.push(performance.now() - started)
  }
  return { ms: runs.sort((a, b) => a - b)[1]!, units: result.units, disagreements: result.disagreementCount }
}

export async function runAgreement(): Promise<void> {
  const single = time(N)
  const double = time(2 * N)
  console.log(`\nAgreement for a study: 2 coders × ${UNITS} units per transcript × ${CODES} codes (median of 3); target under 1 s for N = ${N}, 2N/N near 2\n`)
  console.log(`${'transcripts'.padEnd(14)} ${'units'.padStart(8)} ${'ms'.padStart(8)}  disagreements`)
  for (const [n, r] of [[N, single], [2 * N, double]] as const) console.log(`${String(n).padEnd(14)} ${String(r.units).padStart(8)} ${r.ms.toFixed(0).padStart(8)}  ${r.disagreements}`)
  console.log(`ratio 2N / N: ${(double.ms / single.ms).toFixed(2)}`)
}

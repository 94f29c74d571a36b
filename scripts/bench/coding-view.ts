/// <reference lib="dom" />
/**
 * The coding view of a long transcript in headless Chromium (Debian's, through playwright-core): a
 * 30,000-word transcript carrying 2,000 excerpts, built client, real API. Reports the Performance API
 * marks the view sets ('coding:first-text', 'coding:interactive') and, as the baseline in the same
 * run, the first contentful paint of the same text as a static page. Target: first text under 500 ms.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { chromium } from 'playwright-core'
import { ANSWERS, QUESTIONS } from '../../server/seed/demo-transcripts.js'
import { startBenchEnvironment } from './bench-environment.js'

const WORDS = 30_000
const EXCERPTS = 2_000
const RUNS = 3

/** A long invented interview from the demo answers, with its turns. */
function longTranscript(): { text: string; turns: { speaker: string; start: number; end: number; startMs: number }[] } {
  const parts: string[] = []
  const turns: { speaker: string; start: number; end: number; startMs: number }[] = []
  let offset = 0
  let words = 0
  for (let i = 0; words < WORDS; i++) {
    const question = QUESTIONS[i % QUESTIONS.length]!
    const answer = [0, 1, 2].map((k) => ANSWERS[i % ANSWERS.length]![(i + k) % 3]!).join(' ')
    for (const [speaker, said] of [['Interviewer', question], ['P02', answer]] as const) {
      if (parts.length) offset += 2
      turns.push({ speaker, start: offset, end: offset + said.length, startMs: turns.length * 20_000 })
      parts.push(said)
      offset += said.length
      words += said.split(/\s+/).length
    }
  }
  return { text: parts.join('\n\n'), turns }
}

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!

export async function runCodingView(): Promise<void> {
  const clientDir = mkdtempSync(path.join(tmpdir(), 'heardwell-bench-client-'))
  console.log('\nBuilding the client for the coding-view benchmark …')
  execFileSync('node_modules/.bin/vite', ['build', '--outDir', clientDir, '--emptyOutDir', '--logLevel', 'error'], { stdio: 'inherit' })
  const env = await startBenchEnvironment({ clientDist: clientDir })
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'] })
  try {
    const { dataSource, studyId, storage } = env
    const [source]: { interview_id: string; participant_id: string }[] = await dataSource.query(
      `SELECT t.interview_id, t.participant_id FROM transcripts t JOIN participants p ON p.id = t.participant_id WHERE t.study_id = $1 AND p.pseudonym = 'P02'`,
      [studyId],
    )
    const { text, turns } = longTranscript()
    const key = `studies/${studyId}/transcripts/bench/long.txt`
    const stored = await storage.put(key, Buffer.from(text, 'utf8'), 'text/plain; charset=utf-8')
    const [transcript]: { id: string }[] = await dataSource.query(
      `INSERT INTO transcripts (study_id, interview_id, participant_id, version, status, format, word_count, object_key, sha256, approved_at)
       VALUES ($1, $2, $3, 2, 'approved', 'text', $4, $5, $6, now()) RETURNING id`,
      [studyId, source!.interview_id, source!.participant_id, text.split(/\s+/).length, key, stored.sha256],
    )
    const id = transcript!.id
    await dataSource.query(
      `INSERT INTO transcript_turns (transcript_id, position, speaker, start_ms, start_offset, end_offset, text)
       SELECT $1, t.pos, t.speaker, t.start_ms, t.s, t.e, t.body FROM jsonb_to_recordset($2::jsonb) AS t(pos int, speaker text, start_ms int, s int, e int, body text)`,
      [id, JSON.stringify(turns.map((t, pos) => ({ pos, speaker: t.speaker, start_ms: t.startMs, s: t.start, e: t.end, body: text.slice(t.start, t.end) })))],
    )
    const [coder]: { id: string }[] = await dataSource.query(`SELECT id FROM users WHERE email = 'coder1@heardwell.test'`)
    const codes: { id: string }[] = await dataSource.query(`SELECT id FROM codes WHERE study_id = $1 AND parent_id IS NOT NULL`, [studyId])
    const answers = turns.filter((t) => t.speaker !== 'Interviewer')
    const excerpts = Array.from({ length: EXCERPTS }, (_, i) => {
      const turn = answers[i % answers.length]!
      const length = turn.end - turn.start
      const start = turn.start + ((i * 37) % Math.max(1, length - 40))
      const end = Math.min(turn.end, start + 30 + ((i * 53) % 200))
      return { s: start, e: end, t: text.slice(start, end), c: [codes[i % codes.length]!.id, ...(i % 3 ? [] : [codes[(i * 7) % codes.length]!.id])] }
    })
    await dataSource.query(
      `WITH rows AS (SELECT * FROM jsonb_to_recordset($4::jsonb) AS r(s int, e int, t text, c uuid[])),
            ins AS (INSERT INTO excerpts (study_id, transcript_id, participant_id, coder_id, start_offset, end_offset, text)
                    SELECT $1, $2, $3, $5, s, e, t FROM rows RETURNING id, start_offset, end_offset)
       INSERT INTO excerpt_codes (excerpt_id, code_id)
       SELECT DISTINCT ins.id, unnest(rows.c) FROM ins JOIN rows ON rows.s = ins.start_offset AND rows.e = ins.end_offset`,
      [studyId, id, source!.participant_id, JSON.stringify(excerpts), coder!.id],
    )
    const { cookie } = await env.signIn('coder1@heardwell.test')
    // the three requests the view makes before it can show coded text, timed from Node (second call: warm cache)
    const api: [string, number][] = []
    for (const [label, path] of [
      ['reading (text and turns)', `/api/studies/${studyId}/transcripts/${id}`],
      ['your excerpts', `/api/studies/${studyId}/transcripts/${id}/excerpts`],
      ['codebook', `/api/studies/${studyId}/codes`],
    ] as const) {
      for (let i = 0; i < 2; i++) {
        const started = performance.now()
        const res = await fetch(`http://127.0.0.1:${env.appPort}${path}`, { headers: { cookie } })
        await res.arrayBuffer()
        if (i === 1) api.push([`API ${label}`, performance.now() - started])
      }
    }
    const [name, value] = cookie.split('=') as [string, string]
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } })
    await context.addCookies([{ name, value, domain: '127.0.0.1', path: '/' }])
    const url = `http://127.0.0.1:${env.appPort}/studies/${studyId}/transcripts/${id}/coding`
    const firstText: number[] = []
    const interactive: number[] = []
    const baseline: number[] = []
    const html = `<!doctype html><meta charset="utf-8"><body style="font-family:serif;max-width:70ch">${turns.map((t) => `<p><b>${t.speaker}</b> ${text.slice(t.start, t.end)}</p>`).join('')}`
    for (let run = 0; run < RUNS; run++) {
      const page = await context.newPage()
      const cdp = process.env.BENCH_DEBUG && run === RUNS - 1 ? await context.newCDPSession(page) : null
      if (cdp) {
        await cdp.send('Profiler.enable')
        await cdp.send('Profiler.setSamplingInterval', { interval: 200 })
        await cdp.send('Profiler.start')
      }
      await page.goto(url)
      await page.waitForFunction(() => performance.getEntriesByName('coding:interactive').length > 0, undefined, { timeout: 60_000 })
      const marks = await page.evaluate(() => ({
        first: performance.getEntriesByName('coding:first-text')[0]?.startTime ?? NaN,
        ready: performance.getEntriesByName('coding:interactive')[0]?.startTime ?? NaN,
        marks: document.querySelectorAll('[data-testid="coding-turn"]').length,
      }))
      if (cdp) {
        const { profile } = await cdp.send('Profiler.stop')
        const { writeFileSync } = await import('node:fs')
        writeFileSync('/tmp/coding-view.cpuprofile', JSON.stringify(profile))
      }
      if (process.env.BENCH_DEBUG && run === RUNS - 1) {
        const entries = await page.evaluate(() => performance.getEntriesByType('resource').map((e) => `${e.name.replace(/^https?:\/\/[^/]+/, '').slice(0, 70)} ${e.startTime.toFixed(0)}→${(e as PerformanceResourceTiming).responseEnd.toFixed(0)}`))
        console.log(entries.join('\n'))
      }
      if (marks.marks < turns.length) throw new Error(`only ${marks.marks} of ${turns.length} turns rendered`)
      firstText.push(marks.first)
      interactive.push(marks.ready)
      await page.close()
      const plain = await context.newPage()
      await plain.goto(`http://127.0.0.1:${env.basePort}/plain`)
      await plain.setContent(html, { waitUntil: 'load' })
      const started = Date.now()
      await plain.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))))
      const paint = await plain.evaluate(() => performance.getEntriesByType('paint').find((e) => e.name === 'first-contentful-paint')?.startTime)
      baseline.push(paint ?? Date.now() - started)
      await plain.close()
    }
    const base = median(baseline)
    console.log(`\nCoding view: ${WORDS.toLocaleString()} words in ${turns.length} turns, ${EXCERPTS.toLocaleString()} excerpts; median of ${RUNS} loads (ms since navigation); target first text under 500 ms\n`)
    console.log(`${'measure'.padEnd(48)} ${'ms'.padStart(7)}  ${'baseline ms'.padStart(11)}  ratio`)
    console.log(`${'first text (coding:first-text)'.padEnd(48)} ${median(firstText).toFixed(0).padStart(7)}  ${base.toFixed(0).padStart(11)}  ${(median(firstText) / base).toFixed(2)}`)
    console.log(`${'interactive (coding:interactive)'.padEnd(48)} ${median(interactive).toFixed(0).padStart(7)}  ${base.toFixed(0).padStart(11)}  ${(median(interactive) / base).toFixed(2)}`)
    for (const [label, ms] of api) console.log(`${label.padEnd(48)} ${ms.toFixed(0).padStart(7)}`)
    console.log('baseline: first contentful paint of the same text as one static page')
  } finally {
    await browser.close()
    await env.close()
    rmSync(clientDir, { recursive: true, force: true })
  }
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import Papa from 'papaparse'
import { addMember, makeTeam, makeUser, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { approvedTranscript } from '../support/interviews.js'
import { openRecruitment } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * Coding through the API: codebook, excerpts with UTF-16 offsets, each coder's own coding, optimistic
 * locking (reference/security.md test 94), merge and split, CSV import, memos, search and matrices.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let coder: Client
let coder2: Client
let transcriptId: string
let participantId: string
let text: string

// emoji (surrogate pairs, a ZWJ family, a flag), a combining mark with no precomposed form (n + U+0308), CJK
const SPOKEN = [
  'Interviewer: How was the first week at home?',
  'P: Honestly 😀 it was a relief, but the stairs were hard. Mum said the n\u0308 sign on the tin was the only thing she could read.',
  'Interviewer: And the family?',
  'P: The whole family 👩‍👩‍👧 came, even from 🇨🇦. 東京で暮らしている兄も電話をくれました。 Fatigue was the worst of it.',
].join('\n')

beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  coordinator = new Client(ctx.app)
  coder = new Client(ctx.app)
  coder2 = new Client(ctx.app)
  const second = await makeUser(ctx.dataSource, { email: uniqueEmail('coder2'), name: 'Second Coder' })
  await addMember(ctx.dataSource, team.study, second, 'coder')
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  await coordinator.signIn(team.users.coordinator.email, TEST_PASSWORD)
  await coder.signIn(team.users.coder.email, TEST_PASSWORD)
  await coder2.signIn(second.email, TEST_PASSWORD)
  await openRecruitment(lead, team.study.id)
  ;({ transcriptId, participantId } = await approvedTranscript(coordinator, lead, team.study.id, 'Una Coded', uniqueEmail('una'), SPOKEN))
  text = (await coder.get(`${base()}/transcripts/${transcriptId}`)).body.text
})
afterAll(() => ctx?.close())

const base = () => `/api/studies/${team.study.id}`
const excerpts = () => `${base()}/transcripts/${transcriptId}/excerpts`
const rangeOf = (needle: string) => {
  const start = text.indexOf(needle)
  if (start < 0) throw new Error(`not in the transcript: ${needle}`)
  return { start, end: start + needle.length, text: needle }
}
async function code(label: string, extra: Record<string, unknown> = {}) {
  const res = await coder.post(`${base()}/codes`, { label, ...extra })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body as { id: string; version: number; label: string; position: number; parentId: string | null }
}

describe('codebook', () => {
  it('adds nested codes with default colours; refuses bad labels and duplicates', async () => {
    const parent = await code('Living at home')
    const child = await code('Stairs', { parentId: parent.id, definition: 'Getting up and down stairs', colour: '#0072B2' })
    expect(child).toMatchObject({ parentId: parent.id, colour: '#0072B2', status: 'active', version: 1 })
    expect((await coder.post(`${base()}/codes`, { label: 'x'.repeat(10_000) })).status).toBe(400)
    expect((await coder.post(`${base()}/codes`, { label: '<script>alert(1)</script>' })).status).toBe(400)
    expect((await coder.post(`${base()}/codes`, { label: 'Pink', colour: '#FF00FF' })).status).toBe(400) // not an Okabe–Ito colour
    const duplicate = await coder.post(`${base()}/codes`, { label: 'stairs' })
    expect(duplicate.status).toBe(409)
    expect(duplicate.body.detail).toMatch(/already has a code called/)
    const other = await lead.post(`/api/studies/${team.other.id}/codes`, { label: 'Elsewhere' })
    expect(other.status).toBe(403)
  })

  it('nests and reorders with the version; refuses a cycle; a stale version gets 409', async () => {
    const a = await code('Order A')
    const b = await code('Order B')
    const moved = await coder.put(`${base()}/codes/${b.id}/position`, { version: b.version, parentId: null, position: 0 })
    expect(moved.status, JSON.stringify(moved.body)).toBe(200)
    const top = moved.body.codes.filter((c: { parentId: string | null }) => c.parentId === null).map((c: { label: string }) => c.label)
    expect(top[0]).toBe('Order B')
    expect(top.indexOf('Order A')).toBeGreaterThan(0)
    const stale = await coder.put(`${base()}/codes/${b.id}/position`, { version: b.version, parentId: a.id, position: 0 })
    expect(stale.status).toBe(409)
    const nested = await coder.put(`${base()}/codes/${b.id}/position`, { version: b.version + 1, parentId: a.id, position: 0 })
    expect(nested.status).toBe(200)
    const aNow = nested.body.codes.find((c: { id: string }) => c.id === a.id)
    const cycle = await coder.put(`${base()}/codes/${a.id}/position`, { version: aNow.version, parentId: b.id, position: 0 })
    expect(cycle.status).toBe(422)
    expect(cycle.body.detail).toMatch(/inside itself/)
  })

  it('lost update: two editors save the same version, one gets 409 and the first change stays (security.md test 94)', async () => {
    const c = await code('Contested')
    const [first, second] = await Promise.all([
      coder.patch(`${base()}/codes/${c.id}`, { version: c.version, definition: 'first' }),
      lead.patch(`${base()}/codes/${c.id}`, { version: c.version, definition: 'second' }),
    ])
    expect([first.status, second.status].sort()).toEqual([200, 409])
    const loser = first.status === 409 ? first : second
    expect(loser.headers['content-type']).toMatch(/application\/problem\+json/)
    expect(loser.body.detail).toMatch(/Someone else changed this code/)
    const [row] = await ctx.dataSource.query('SELECT definition, version FROM codes WHERE id = $1', [c.id])
    expect(row).toEqual({ definition: first.status === 200 ? 'first' : 'second', version: 2 })
  })
})

describe('excerpts', () => {
  it('round-trips UTF-16 offsets over emoji, a combining mark and CJK text', async () => {
    const c = await code('Emotions')
    for (const needle of ['😀 it was a relief', 'n\u0308 sign', 'family 👩‍👩‍👧 came, even from 🇨🇦', '東京で暮らしている兄も電話をくれました。']) {
      const r = rangeOf(needle)
      const res = await coder.post(excerpts(), { ...r, codeIds: [c.id] })
      expect(res.status, `${needle}: ${JSON.stringify(res.body)}`).toBe(201)
      expect(res.body).toMatchObject({ start: r.start, end: r.end, text: needle, codeIds: [c.id] })
    }
    const listed = (await coder.get(excerpts())).body.excerpts as { start: number; end: number; text: string }[]
    for (const e of listed) expect(text.slice(e.start, e.end)).toBe(e.text)
  })

  it('refuses ranges outside the text, reversed, inside a character, or not matching the text', async () => {
    const c = await code('Range checks')
    const emoji = text.indexOf('😀')
    const mark = text.indexOf('n\u0308')
    const cases: [Record<string, unknown>, string][] = [
      [{ start: text.length - 2, end: text.length + 5, text: 'xx' }, 'end'],
      [{ start: 20, end: 10, text: 'x' }, 'end'],
      [{ start: emoji + 1, end: emoji + 6, text: text.slice(emoji + 1, emoji + 6) }, 'start'],
      [{ start: mark, end: mark + 1, text: 'n' }, 'end'],
      [{ start: 0, end: 5, text: 'Other' }, 'text'],
    ]
    for (const [body, field] of cases) {
      const res = await coder.post(excerpts(), { ...body, codeIds: [c.id] })
      expect(res.status, JSON.stringify(body)).toBe(422)
      expect(res.body.errors[0].path).toBe(field)
    }
    expect((await coder.post(excerpts(), { start: -1, end: 3, text: 'Int', codeIds: [c.id] })).status).toBe(400)
  })

  it('keeps overlapping excerpts apart, in reading order, each with its own codes', async () => {
    const stairs = await code('Stairs at home')
    const relief = await code('Relief')
    const a = (await coder.post(excerpts(), { ...rangeOf('it was a relief, but the stairs were hard'), codeIds: [relief.id] })).body
    const b = (await coder.post(excerpts(), { ...rangeOf('the stairs were hard'), codeIds: [stairs.id, relief.id] })).body
    const list = (await coder.get(excerpts())).body.excerpts as { id: string; start: number; codeIds: string[] }[]
    const ids = list.map((e) => e.id)
    expect(ids.indexOf(a.id)).toBeLessThan(ids.indexOf(b.id))
    expect(list.find((e) => e.id === b.id)!.codeIds.sort()).toEqual([stairs.id, relief.id].sort())
  })

  it('refuses retired codes and codes of another study', async () => {
    const c = await code('Soon retired')
    expect((await coder.patch(`${base()}/codes/${c.id}`, { version: c.version, status: 'retired' })).status).toBe(200)
    const retired = await coder.post(excerpts(), { ...rangeOf('Fatigue'), codeIds: [c.id] })
    expect(retired.status).toBe(422)
    expect(retired.body.detail).toMatch(/retired/)
    const [foreign] = await ctx.dataSource.query(`INSERT INTO codes (study_id, label, colour) VALUES ($1, 'Foreign', '#000000') RETURNING id`, [team.other.id])
    const res = await coder.post(excerpts(), { ...rangeOf('Fatigue'), codeIds: [foreign.id] })
    expect(res.status).toBe(422)
    expect(res.body.detail).toMatch(/not in this study/)
  })

  it('keeps each coder’s coding their own until the lead switches comparison on', async () => {
    const c = await code('Mine only')
    const mine = (await coder.post(excerpts(), { ...rangeOf('Fatigue was the worst of it'), codeIds: [c.id] })).body
    const theirs = await coder2.get(excerpts())
    expect(theirs.body.excerpts).toEqual([])
    expect(theirs.body.comparisonAllowed).toBe(false)
    expect(theirs.body.coders.map((x: { id: string }) => x.id)).not.toContain(team.users.coder.id)
    expect((await coder2.get(`${excerpts()}?coderId=${team.users.coder.id}`)).status).toBe(403)
    expect((await coder2.patch(`${base()}/excerpts/${mine.id}`, { version: mine.version, codeIds: [c.id] })).status).toBe(403)
    expect((await coder.put(`${base()}/coding-settings`, { coderComparison: true })).status).toBe(403)
    expect((await lead.put(`${base()}/coding-settings`, { coderComparison: true })).body).toEqual({ coderComparison: true })
    const compared = await coder2.get(`${excerpts()}?coderId=${team.users.coder.id}`)
    expect(compared.status).toBe(200)
    expect(compared.body.excerpts.map((e: { id: string }) => e.id)).toContain(mine.id)
    expect(compared.body.coders.map((x: { id: string }) => x.id)).toContain(team.users.coder.id)
    await lead.put(`${base()}/coding-settings`, { coderComparison: false })
  })

  it('lost update on an excerpt: the stale edit gets 409 with a readable message; resize, recode and remove work', async () => {
    const c1 = await code('Resize one')
    const c2 = await code('Resize two')
    const e = (await coder.post(excerpts(), { ...rangeOf('the only thing she could read'), codeIds: [c1.id] })).body
    const wider = rangeOf('was the only thing she could read')
    const ok = await coder.patch(`${base()}/excerpts/${e.id}`, { version: e.version, start: wider.start, end: wider.end, text: wider.text, codeIds: [c2.id] })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body).toMatchObject({ start: wider.start, text: wider.text, codeIds: [c2.id], version: 2 })
    const stale = await coder.patch(`${base()}/excerpts/${e.id}`, { version: e.version, codeIds: [c1.id] })
    expect(stale.status).toBe(409)
    expect(stale.body.detail).toMatch(/Someone else changed this excerpt/)
    expect((await coder.delete(`${base()}/excerpts/${e.id}?version=1`)).status).toBe(409)
    expect((await coder.delete(`${base()}/excerpts/${e.id}?version=2`)).status).toBe(204)
    expect((await ctx.dataSource.query('SELECT count(*)::int AS n FROM excerpt_codes WHERE excerpt_id = $1', [e.id]))[0].n).toBe(0)
  })

  it('stores 20 parallel excerpts on one transcript without loss (security.md test 95)', async () => {
    const c = await code('Parallel')
    const r = rangeOf('Fatigue')
    const results = await Promise.all(Array.from({ length: 20 }, (_, i) => (i % 2 ? coder : coder2).post(excerpts(), { ...r, codeIds: [c.id] })))
    expect(results.map((x) => x.status)).toEqual(Array(20).fill(201))
    expect(new Set(results.map((x) => x.body.id)).size).toBe(20)
  })
})

describe('merge and split', () => {
  it('merge moves the excerpts (one link where both were), keeps the code as merged, and is audited', async () => {
    const from = await code('Tiredness')
    const into = await code('Fatigue')
    const both = (await coder.post(excerpts(), { ...rangeOf('Fatigue was the worst'), codeIds: [from.id, into.id] })).body
    const only = (await coder.post(excerpts(), { ...rangeOf('worst of it'), codeIds: [from.id] })).body
    const merged = await coder.post(`${base()}/codes/${from.id}/merge`, { version: from.version, intoId: into.id })
    expect(merged.status, JSON.stringify(merged.body)).toBe(200)
    const after = merged.body.codes as { id: string; status: string; mergedIntoId: string | null; excerptCount: number }[]
    expect(after.find((c) => c.id === from.id)).toMatchObject({ status: 'merged', mergedIntoId: into.id, excerptCount: 0 })
    expect(after.find((c) => c.id === into.id)!.excerptCount).toBe(2)
    const list = (await coder.get(excerpts())).body.excerpts as { id: string; codeIds: string[] }[]
    expect(list.find((e) => e.id === both.id)!.codeIds).toEqual([into.id])
    expect(list.find((e) => e.id === only.id)!.codeIds).toEqual([into.id])
    const trail = (await lead.get(`${base()}/audit?action=code.merged`)).body
    expect(JSON.stringify(trail)).toMatch(/Tiredness/)
    expect((await coder.post(excerpts(), { ...rangeOf('worst'), codeIds: [from.id] })).status).toBe(422)
  })

  it('split moves the chosen excerpts to a new code beside the old one', async () => {
    const c = await code('Family')
    const keep = (await coder.post(excerpts(), { ...rangeOf('The whole family'), codeIds: [c.id] })).body
    const move = (await coder.post(excerpts(), { ...rangeOf('東京で暮らしている兄'), codeIds: [c.id] })).body
    const split = await coder.post(`${base()}/codes/${c.id}/split`, { version: c.version, newCode: { label: 'Family far away' }, excerptIds: [move.id] })
    expect(split.status, JSON.stringify(split.body)).toBe(200)
    const created = split.body.codes.find((x: { label: string }) => x.label === 'Family far away')
    expect(created).toMatchObject({ parentId: c.parentId, position: c.position + 1, excerptCount: 1 })
    const list = (await coder.get(excerpts())).body.excerpts as { id: string; codeIds: string[] }[]
    expect(list.find((e) => e.id === keep.id)!.codeIds).toEqual([c.id])
    expect(list.find((e) => e.id === move.id)!.codeIds).toEqual([created.id])
    const wrong = await coder.post(`${base()}/codes/${c.id}/split`, { version: c.version + 1, newCode: { label: 'Nope' }, excerptIds: [move.id] })
    expect(wrong.status).toBe(422)
  })
})

describe('CSV import and export', () => {
  it('refuses a file with mistakes row by row and imports nothing', async () => {
    const before = (await coder.get(`${base()}/codes`)).body.codes.length
    const csv = 'label,parent,definition,colour\nGood one,,fine,\n,,no label,\nBad colour,,x,#123456\nOrphan,Nowhere,,\n'
    const res = await coder.post(`${base()}/codebook/import`, { csv })
    expect(res.status).toBe(422)
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(['2.label', '3.colour', '4.parent']))
    for (const e of res.body.errors) expect(e.message).toMatch(/Row \d/)
    expect((await coder.get(`${base()}/codes`)).body.codes.length).toBe(before)
  })

  it('previews, imports, and round-trips the export unchanged (commas, quotes, new lines, non-Latin text)', async () => {
    const csv = Papa.unparse([
      ['label', 'parent', 'definition', 'when_to_use', 'when_not_to_use', 'colour', 'status'],
      ['Care at home', '', 'Help "at home", after discharge', 'Any mention of\nhelp', '', 'Sky blue', 'active'],
      ['Σπίτι', 'Care at home', '家に帰る', '', '', '#009E73', ''],
    ])
    const preview = await coder.post(`${base()}/codebook/import`, { csv, dryRun: true })
    expect(preview.body).toMatchObject({ created: 2, updated: 0, dryRun: true })
    const done = await coder.post(`${base()}/codebook/import`, { csv })
    expect(done.body).toMatchObject({ created: 2, dryRun: false })
    const codes = (await coder.get(`${base()}/codes`)).body.codes as { label: string; parentId: string | null; id: string; definition: string; whenToUse: string; colour: string }[]
    const parent = codes.find((c) => c.label === 'Care at home')!
    expect(parent).toMatchObject({ definition: 'Help "at home", after discharge', whenToUse: 'Any mention of\nhelp', colour: '#56B4E9' })
    expect(codes.find((c) => c.label === 'Σπίτι')).toMatchObject({ parentId: parent.id, definition: '家に帰る' })
    const exported = await coder.get(`${base()}/codebook.csv?bom=1`)
    expect(exported.headers['content-type']).toMatch(/text\/csv/)
    expect(exported.text.startsWith('\uFEFF')).toBe(true)
    const again = await coder.post(`${base()}/codebook/import`, { csv: exported.text, dryRun: true })
    expect(again.body).toMatchObject({ created: 0, updated: 0 })
  })

  it('saves snapshots to compare later', async () => {
    const saved = await coder.post(`${base()}/codebook/snapshots`, { name: 'After first three interviews' })
    expect(saved.status).toBe(201)
    expect(saved.body.codes.length).toBeGreaterThan(3)
    const list = (await lead.get(`${base()}/codebook/snapshots`)).body.snapshots
    expect(list[0]).toMatchObject({ id: saved.body.id, name: 'After first three interviews' })
    expect((await lead.get(`${base()}/codebook/snapshots/${saved.body.id}`)).body.codes).toHaveLength(saved.body.codes.length)
  })
})

describe('memos, search and matrices', () => {
  it('keeps memos with author and time, searchable, changed only by their author; script stays text', async () => {
    const body = 'Stairs keep coming up <script>alert(1)</script> — ask about handrails'
    const memo = await coder.post(`${base()}/memos`, { targetType: 'transcript', targetId: transcriptId, body })
    expect(memo.status, JSON.stringify(memo.body)).toBe(201)
    expect(memo.body).toMatchObject({ body, authorName: expect.any(String), transcriptId, targetLabel: expect.stringMatching(/^Transcript of P\d+/) })
    expect((await coder.post(`${base()}/memos`, { targetType: 'study', body: 'Whole study note' })).status).toBe(201)
    expect((await coder.post(`${base()}/memos`, { targetType: 'code', targetId: transcriptId, body: 'wrong target' })).status).toBe(422)
    const found = (await lead.get(`${base()}/memos?q=handrail`)).body.memos
    expect(found.map((m: { id: string }) => m.id)).toEqual([memo.body.id])
    expect((await lead.patch(`${base()}/memos/${memo.body.id}`, { version: 1, body: 'not mine' })).status).toBe(403)
    expect((await coder.patch(`${base()}/memos/${memo.body.id}`, { version: 1, body: 'edited' })).status).toBe(200)
    expect((await coder.patch(`${base()}/memos/${memo.body.id}`, { version: 1, body: 'stale' })).status).toBe(409)
    expect((await coordinator.get(`${base()}/memos`)).status).toBe(403)
  })

  it('still finds an older memo to edit when the study has more than the newest 500', async () => {
    const old = (await coder.post(`${base()}/memos`, { targetType: 'study', body: 'An early thought' })).body
    await ctx.dataSource.query(
      `INSERT INTO memos (study_id, target_type, body, author_id, created_at) SELECT $1, 'study', 'later ' || g, $2, now() + g * interval '1 second' FROM generate_series(1, 520) g`,
      [team.study.id, team.users.coder.id],
    )
    const edited = await coder.patch(`${base()}/memos/${old.id}`, { version: old.version, body: 'An early thought, revisited' })
    expect(edited.status, JSON.stringify(edited.body)).toBe(200)
    expect(edited.body.body).toBe('An early thought, revisited')
    await ctx.dataSource.query(`DELETE FROM memos WHERE body LIKE 'later %'`)
  })

  it('searches excerpts and transcripts with filters and context, own excerpts only without comparison', async () => {
    const res = await coder.get(`${base()}/search?q=stairs`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const kinds = new Set(res.body.hits.map((h: { kind: string }) => h.kind))
    expect(kinds).toEqual(new Set(['excerpt', 'transcript']))
    for (const hit of res.body.hits) {
      expect(hit.highlights.length).toBeGreaterThan(0)
      for (const [s, e] of hit.highlights) expect(hit.context.slice(s, e).toLowerCase()).toMatch(/^stair/)
    }
    const stairsCode = (await coder.get(`${base()}/codes`)).body.codes.find((c: { label: string }) => c.label === 'Stairs at home')
    const byCode = (await coder.get(`${base()}/search?q=stairs&codeId=${stairsCode.id}`)).body.hits
    expect(byCode.length).toBeGreaterThan(0)
    expect(byCode.every((h: { kind: string; codeIds: string[] }) => h.kind === 'excerpt' && h.codeIds.includes(stairsCode.id))).toBe(true)
    const other = (await coder2.get(`${base()}/search?q=stairs&in=excerpts`)).body.hits
    expect(other).toEqual([]) // the second coder coded no stairs, and the first coder's excerpts stay theirs
    expect((await coder.get(`${base()}/search?q=stairs&characteristic=region=coast`)).body.hits.length).toBeGreaterThan(0)
    expect((await coder.get(`${base()}/search?q=stairs&characteristic=region=nowhere`)).body.hits).toEqual([])
    expect((await coordinator.get(`${base()}/search?q=stairs`)).status).toBe(403)
  })

  it('counts codes by participant and co-occurrence in SQL; withdrawn data never counts', async () => {
    const m = (await lead.get(`${base()}/matrices/code-participant`)).body
    const stairs = m.codes.find((c: { label: string }) => c.label === 'Stairs at home')
    const relief = m.codes.find((c: { label: string }) => c.label === 'Relief')
    expect(m.cells.find((c: { codeId: string }) => c.codeId === relief.id)).toMatchObject({ participantId, count: 2 })
    const co = (await lead.get(`${base()}/matrices/co-occurrence`)).body
    const pair = co.cells.find((c: { a: string; b: string }) => [c.a, c.b].sort().join() === [stairs.id, relief.id].sort().join())
    // "the stairs were hard" carries both codes (1) and overlaps the wider relief excerpt (1)
    expect(pair.count).toBe(2)
    expect(co.cells.find((c: { a: string; b: string }) => c.a === relief.id && c.b === relief.id).count).toBe(2)
    const csv = await lead.get(`${base()}/matrices/code-participant.csv`)
    const rows = Papa.parse<string[]>(csv.text.trim()).data
    expect(rows[0]![0]).toBe('code')
    expect(rows.find((r) => r[0] === 'Relief')!.at(-1)).toBe('2')

    const withdrawn = await coordinator.post(`${base()}/participants/${participantId}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10), reason: 'Changed their mind' })
    expect(withdrawn.status, JSON.stringify(withdrawn.body)).toBe(201)
    const after = (await lead.get(`${base()}/matrices/code-participant`)).body
    expect(after.cells).toEqual([])
    expect(after.excluded).toBeGreaterThan(0)
    expect((await coder.get(`${base()}/search?q=stairs`)).body.hits).toEqual([])
    expect((await coder.get(excerpts())).status).toBe(404)
    expect((await coder.get(`${base()}/codes`)).body.codes.every((c: { excerptCount: number }) => c.excerptCount === 0)).toBe(true)
  })
})

describe('search snippets keep the transcript’s own words', () => {
  it('shows angle-bracket notes such as <inaudible> in the context, which PostgreSQL’s headline would drop as a tag', async () => {
    const said = 'P: The evenings were long <inaudible> and the kettle was always on.'
    await approvedTranscript(coordinator, lead, team.study.id, 'Ida Bracket', uniqueEmail('ida'), `Interviewer: And the evenings?\n${said}`)
    const hits = (await lead.get(`${base()}/search?q=kettle&in=transcripts`)).body.hits as { context: string; highlights: [number, number][] }[]
    expect(hits).toHaveLength(1)
    expect(hits[0]!.context).toContain('long <inaudible> and the kettle')
    const [[start, end]] = hits[0]!.highlights as [[number, number]]
    expect(hits[0]!.context.slice(start, end)).toBe('kettle')
  })
})

import { randomBytes } from 'node:crypto'
import { readdir, readFile, stat } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ListObjectsV2Command } from '@aws-sdk/client-s3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_UPLOAD_BYTES } from '../../server/middleware/upload.js'
import { buildDocx, buildZip, setDeclaredSize } from '../fixtures/transcripts/docx.js'
import { approvedForm, FORM_V1, makePdf } from '../support/consent.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { consentedParticipant, doneInterview } from '../support/interviews.js'
import { ELIGIBLE_ANSWERS, openRecruitment } from '../support/recruitment.js'
import { listRoutes } from '../support/routes.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * Attacks through every upload route (security.md tests 61, 63, 64, 65, 66, 68; ASVS 5.0 5.2.1, 5.2.2,
 * 5.2.3, 5.3.2, 5.4.1): files whose content is not what their name says, one byte over the size limit,
 * hostile file names, and zip bombs dressed as Word files. After every refusal: no database row, no object
 * in the bucket, no temporary file holding the upload.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let interviewId: string
let participantId: string
let formId: string
const S = () => team.study.id

/** a marker written into every hostile file, so a copy of it left anywhere can be found */
const MARKER = `upload-attack-${randomBytes(8).toString('hex')}`
const DOCX = 'application/vnd.openxmlformats-officedocument.wordprocessingml.document'

interface UploadRoute {
  name: string
  path: () => string
  metadata: () => string | undefined
  /** the status a file of the wrong kind gets: transcripts are read by content (400, with the reason), files by magic bytes (415) */
  wrongType: number
}

const ROUTES: UploadRoute[] = [
  { name: 'transcript', path: () => `/api/studies/${S()}/interviews/${interviewId}/transcripts`, metadata: () => undefined, wrongType: 400 },
  {
    name: 'interview guide',
    path: () => `/api/studies/${S()}/interview-guides`,
    metadata: () => JSON.stringify({ label: `G-${randomBytes(3).toString('hex')}`, approvalDate: '2026-02-02', text: 'Ask about the first week at home.' }),
    wrongType: 415,
  },
  { name: 'consent form', path: () => `/api/studies/${S()}/consent-forms`, metadata: () => JSON.stringify({ ...FORM_V1, label: `v-${randomBytes(3).toString('hex')}` }), wrongType: 415 },
  {
    name: 'signed consent',
    path: () => `/api/studies/${S()}/participants/${participantId}/consents/written`,
    metadata: () => JSON.stringify({ formId, clauses: { audio_recording: true, direct_quotes: true, future_contact: true }, signerName: 'Hollis Brackenridge' }),
    wrongType: 415,
  },
]

function send(route: UploadRoute, file: Buffer, name: string) {
  const req = lead.agent.post(route.path()).set('X-CSRF-Token', lead.csrf)
  const metadata = route.metadata()
  if (metadata) void req.field('metadata', metadata)
  return req.attach('file', file, name)
}

beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  coordinator = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  await coordinator.signIn(team.users.coordinator.email, TEST_PASSWORD)
  await openRecruitment(lead, S())
  formId = (await approvedForm(lead, S())).id
  const interviewed = await consentedParticipant(coordinator, lead, S(), 'Hollis Brackenridge', uniqueEmail('hollis'))
  interviewId = (await doneInterview(coordinator, S(), interviewed, team.users.coordinator.id)).id
  // a participant who has not consented yet, for the signed-consent upload
  const created = await coordinator.post(`/api/studies/${S()}/participants`, {
    contact: { name: 'Hollis Brackenridge', email: uniqueEmail('hb'), phone: '', country: 'Canada', timeZone: 'America/Vancouver' },
    source: 'phone',
    answers: ELIGIBLE_ANSWERS,
  })
  expect(created.status).toBe(201)
  participantId = created.body.id
})
afterAll(() => ctx?.close())

/** Rows the upload routes write, the study's objects in the bucket, and temporary files holding the marker. */
async function uploadState() {
  const [rows] = await ctx.dataSource.query(
    `SELECT (SELECT count(*) FROM transcripts WHERE study_id = $1) AS transcripts, (SELECT count(*) FROM interview_guides WHERE study_id = $1) AS guides,
            (SELECT count(*) FROM consent_forms WHERE study_id = $1) AS forms, (SELECT count(*) FROM consent_records WHERE study_id = $1) AS consents,
            (SELECT count(*) FROM audit_events WHERE study_id = $1) AS audit`,
    [S()],
  )
  const objects: string[] = []
  for (const prefix of [`studies/${S()}/`, `quarantine/studies/${S()}/`]) {
    let token: string | undefined
    do {
      const page = await ctx.storage.client.send(new ListObjectsV2Command({ Bucket: ctx.storage.bucket, Prefix: prefix, ContinuationToken: token }))
      objects.push(...(page.Contents ?? []).map((o) => `${o.Key}`))
      token = page.NextContinuationToken
    } while (token)
  }
  return { rows, objects: objects.sort() }
}

/** Files in the temp directory (one level down too) that hold the marker: an upload kept on disk. */
async function tempFilesWithMarker(): Promise<string[]> {
  const found: string[] = []
  const look = async (dir: string, depth: number) => {
    for (const entry of await readdir(dir, { withFileTypes: true }).catch(() => [])) {
      const path = join(dir, entry.name)
      if (entry.isDirectory() && depth > 0) await look(path, depth - 1)
      if (!entry.isFile()) continue
      const info = await stat(path).catch(() => null)
      if (!info || info.size > 64 * 1024 * 1024 || Date.now() - info.mtimeMs > 30 * 60_000) continue
      const body = await readFile(path).catch(() => null)
      if (body?.includes(MARKER)) found.push(path)
    }
  }
  await look(tmpdir(), 1)
  return found
}

async function expectRefusedWithoutTrace(route: UploadRoute, file: Buffer, name: string, status: number, reason?: RegExp) {
  const before = await uploadState()
  const res = await send(route, file, name)
  const label = `${route.name} ← ${name} (${file.length} bytes)`
  expect(res.status, `${label}: ${JSON.stringify(res.body).slice(0, 200)}`).toBe(status)
  expect(res.headers['content-type'], label).toMatch(/^application\/problem\+json/)
  expect(String(res.body.detail ?? '').length, `${label}: a readable reason`).toBeGreaterThan(15)
  if (reason) expect(res.body.detail, label).toMatch(reason)
  expect(await uploadState(), `${label}: no row, no object`).toEqual(before)
  return res
}

/* hostile files, each carrying the marker */
const exe = () => Buffer.concat([Buffer.from([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00, 0x04, 0x00]), Buffer.alloc(50), Buffer.from('PE\0\0'), Buffer.from(MARKER), Buffer.alloc(200)])
const html = () => Buffer.from(`<!DOCTYPE html><html><body><script>fetch('/api/auth/me')</script><p>${MARKER}</p></body></html>`)
const jar = () => buildZip({ 'META-INF/MANIFEST.MF': `Manifest-Version: 1.0\nMain-Class: Main\n`, 'Main.class': `\xca\xfe\xba\xbe${MARKER}` })
const plainZip = () => buildZip({ 'notes.txt': `Interviewer: hello\nP01: ${MARKER}\n` })

describe('every upload route is covered', () => {
  it('the routes that take multipart files are exactly the ones this file attacks', () => {
    // the upload middleware is named uploadSingle; a route that gains or loses it changes this list
    const stack = (ctx.app as unknown as { router: { stack: unknown[] } }).router.stack
    const uploads: string[] = []
    const walk = (layers: unknown[], prefix: string) => {
      for (const layer of layers as { route?: { path: string; stack: { name: string; method?: string }[] }; rawPath?: string; handle: { stack?: unknown[] } }[]) {
        if (layer.route?.stack.some((l) => l.name === 'uploadSingle')) uploads.push(prefix + layer.route.path)
        else if (layer.handle.stack) walk(layer.handle.stack, prefix + (typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : ''))
      }
    }
    walk(stack, '')
    expect(uploads.sort()).toEqual(
      ['/api/studies/:studyId/consent-forms', '/api/studies/:studyId/interview-guides', '/api/studies/:studyId/interviews/:interviewId/transcripts', '/api/studies/:studyId/participants/:participantId/consents/written'].sort(),
    )
    expect(listRoutes(ctx.app).filter((r) => uploads.includes(r.path) && r.method === 'POST')).toHaveLength(4)
  })
})

describe('wrong type by content (security.md tests 63, 64; ASVS 5.0 5.2.2)', () => {
  it.each(ROUTES.map((r) => [r.name, r] as const))('%s: EXE, JAR, plain zip and HTML under innocent names are refused by their bytes', async (_n, route) => {
    await expectRefusedWithoutTrace(route, exe(), 'minutes.docx', route.wrongType)
    await expectRefusedWithoutTrace(route, exe(), 'minutes.pdf', route.wrongType)
    await expectRefusedWithoutTrace(route, await jar(), 'minutes.docx', route.wrongType)
    await expectRefusedWithoutTrace(route, await plainZip(), 'minutes.docx', route.wrongType, route.wrongType === 400 ? /zip archive that is not a Word/ : /not/)
    await expectRefusedWithoutTrace(route, html(), 'form.pdf', route.wrongType)
    expect(await tempFilesWithMarker()).toEqual([])
  })

  it('transcripts: text that is not UTF-8, or holds NUL bytes, is refused with the reason (test 64)', async () => {
    const route = ROUTES[0]!
    await expectRefusedWithoutTrace(route, Buffer.from(`Interviewer: caf\xe9 ${MARKER}\n`, 'latin1'), 'latin1.txt', 400, /not UTF-8/)
    await expectRefusedWithoutTrace(route, Buffer.from(`Interviewer: hello\0${MARKER}\n`), 'nul.txt', 400, /NUL/)
    await expectRefusedWithoutTrace(route, Buffer.from(`\ufeffWEBVTT\n\n00:00.000 --> 00:01.000\n\0${MARKER}`), 'cues.vtt', 400)
  })
})

describe('size limit (security.md test 61; ASVS 5.0 5.2.1)', () => {
  /** a real PDF padded with a trailing comment up to `size` bytes */
  async function pdfOfSize(size: number): Promise<Buffer> {
    const pdf = await makePdf('padded')
    const tail = Buffer.alloc(size - pdf.length, 0x20)
    Buffer.from(`\n%${MARKER}`).copy(tail)
    return Buffer.concat([pdf, tail])
  }

  it.each(ROUTES.map((r) => [r.name, r] as const))('%s: one byte over the limit → 413 problem+json, nothing kept', async (_n, route) => {
    const res = await expectRefusedWithoutTrace(route, await pdfOfSize(MAX_UPLOAD_BYTES + 1), 'big.pdf', 413)
    expect(res.body.type).toMatch(/\/too-large$/)
    expect(await tempFilesWithMarker()).toEqual([])
  })

  it('a consent form of exactly the limit and a guide one byte under it are accepted', async () => {
    const form = await send(ROUTES[2]!, await pdfOfSize(MAX_UPLOAD_BYTES), 'exact.pdf')
    expect(form.status, JSON.stringify(form.body).slice(0, 200)).toBe(201)
    expect(form.body.file.size).toBe(MAX_UPLOAD_BYTES)
    const guide = await send(ROUTES[1]!, await pdfOfSize(MAX_UPLOAD_BYTES - 1), 'under.pdf')
    expect(guide.status).toBe(201)
    expect(guide.body.file.size).toBe(MAX_UPLOAD_BYTES - 1)
  })
})

describe('zip bombs dressed as Word files (security.md tests 65, 66; ASVS 5.0 5.2.3, 5.2.5)', () => {
  const bombs = async () => ({
    // a small file whose central directory claims one part unpacks to 201 MB (limit 200 MB)
    declared: setDeclaredSize(await buildDocx(['Interviewer: Hello.', `P01: ${MARKER}`], { 'word/big.xml': '<x/>' }), 'word/big.xml', 201 * 1024 * 1024),
    // 1,001 parts (limit 1,000)
    entries: await buildDocx(['Interviewer: Hello.', `P01: ${MARKER}`], Object.fromEntries(Array.from({ length: 1_001 }, (_, i) => [`customXml/item${i}.xml`, '<x/>']))),
    // a part whose name climbs out of the archive (zip slip)
    slip: await buildDocx(['Interviewer: Hello.', `P01: ${MARKER}`], { '../../outside.xml': '<x/>' }),
  })

  it('transcripts: refused from the directory before anything is extracted, with a readable reason', async () => {
    const route = ROUTES[0]!
    const b = await bombs()
    expect(b.declared.length).toBeLessThan(20_000)
    await expectRefusedWithoutTrace(route, b.declared, 'interview.docx', 400, /unpacks to far more data/)
    await expectRefusedWithoutTrace(route, b.entries, 'interview.docx', 400, /more than 1000 parts/)
    await expectRefusedWithoutTrace(route, b.slip, 'interview.docx', 400, /unsafe path/)
    expect(await tempFilesWithMarker()).toEqual([])
  })

  it.each(ROUTES.slice(1, 3).map((r) => [r.name, r] as const))('%s: a Word bomb is refused with a readable reason, never stored', async (_n, route) => {
    const b = await bombs()
    await expectRefusedWithoutTrace(route, b.declared, 'form.docx', 415, /unpacks to more than 200 MB/)
    await expectRefusedWithoutTrace(route, b.entries, 'form.docx', 415, /more than 1000 parts/)
    await expectRefusedWithoutTrace(route, b.slip, 'form.docx', 415, /unsafe path/)
  })

  it('a well-formed Word file is still accepted as a consent form', async () => {
    const res = await send(ROUTES[2]!, await buildDocx(['Consent form', 'You can stop at any time.']), 'form.docx')
    expect(res.status, JSON.stringify(res.body).slice(0, 200)).toBe(201)
    expect(res.body.file.contentType).toBe(DOCX)
  })
})

describe('the name must not claim another type than the content (security.md test 63; ASVS 5.0 5.2.2)', () => {
  it.each(ROUTES.slice(1).map((r) => [r.name, r] as const))('%s: a real PDF named .docx, .html or .exe is refused; .PDF and a name without a type are accepted', async (_n, route) => {
    const pdf = await makePdf(MARKER)
    await expectRefusedWithoutTrace(route, pdf, '<script>.docx', 415, /name ends in \.docx/)
    await expectRefusedWithoutTrace(route, pdf, 'form.html', 415, /name ends in \.html/)
    await expectRefusedWithoutTrace(route, pdf, '../../etc/passwd.exe', 415, /name ends in \.exe/)
    if (route.name === 'signed consent') return // one consent per participant: the accepted case is below
    expect((await send(route, pdf, 'SCAN.PDF')).status).toBe(201)
    expect((await send(route, pdf, 'Consent v1.2')).status).toBe(201)
  })
})

describe('hostile file names (security.md test 68; ASVS 5.0 5.3.2, 5.4.1)', () => {
  const NAMES = ['../../etc/passwd.pdf', '..\\..\\windows\\win.ini.pdf', 'a\r\nContent-Type: text/html\r\n.pdf', '<script>alert(1)</script>.pdf', 'résumé 📄 "quoted".pdf', `${'n'.repeat(300)}.pdf`]

  it.each(ROUTES.slice(1, 3).map((r) => [r.name, r] as const))('%s: the key is made by the server; the name is cleaned and sent back with filename*', async (_n, route) => {
    const table = route.name === 'consent form' ? 'consent_forms' : 'interview_guides'
    const folder = route.name === 'consent form' ? 'consent-forms' : 'interview-guides'
    for (const name of NAMES) {
      const res = await send(route, await makePdf('named'), name)
      if (res.status === 400) continue // refused at the multipart level: nothing to clean
      expect(res.status, `${name}: ${JSON.stringify(res.body).slice(0, 200)}`).toBe(201)
      const stored = res.body.file.name as string
      expect(stored, name).not.toMatch(/[\\/\u0000-\u001f\u007f]/)
      expect(stored.length, name).toBeLessThanOrEqual(200)
      expect(stored.length).toBeGreaterThan(0)
      expect(stored, `${name}: keeps its extension`).toMatch(/\.pdf$/)
      if (name.startsWith('résumé')) expect(stored).toBe(name) // UTF-8 names arrive intact (multer defParamCharset)
      const [row] = await ctx.dataSource.query(`SELECT file_key AS key, file_name AS name FROM ${table} WHERE id = $1`, [res.body.id])
      expect(row.key).toBe(`studies/${S()}/${folder}/${res.body.id}`)
      expect(row.name).toBe(stored)
      const download = await lead.get(`/api/studies/${S()}/${folder}/${res.body.id}/file`)
      expect(download.status).toBe(200)
      const disposition = String(download.headers['content-disposition'])
      expect(disposition).not.toMatch(/[\r\n]/)
      const match = disposition.match(/^attachment; filename="([^"]*)"; filename\*=UTF-8''(\S+)$/)
      expect(match, disposition).not.toBeNull()
      expect(match![1]).toMatch(/^[\x20-\x7e]*$/)
      expect(match![1]).not.toMatch(/["\\]/)
      expect(decodeURIComponent(match![2]!)).toBe(stored)
      expect(download.headers['content-type']).toBe('application/pdf')
      expect(download.headers['x-content-type-options']).toBe('nosniff')
      expect(download.headers['content-security-policy']).toMatch(/sandbox/)
    }
  })

  it('signed consent: the stored name is cleaned and its key made by the server', async () => {
    const res = await send(ROUTES[3]!, await makePdf('signed'), '../../etc/passwd\r\n<b>.pdf')
    if (res.status !== 400) {
      expect(res.status, JSON.stringify(res.body).slice(0, 200)).toBe(201)
      const [row] = await ctx.dataSource.query(`SELECT id, signed_file_key AS key, signed_file_name AS name FROM consent_records WHERE participant_id = $1`, [participantId])
      expect(row.key).toBe(`studies/${S()}/consents/${row.id}/signed-form`)
      expect(row.name).not.toMatch(/[\\/\u0000-\u001f\u007f]/)
      expect(row.name).toBe('passwd<b>.pdf')
    }
  })
})

import { spawnSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import Papa from 'papaparse'
import { PDFDocument, StandardFonts } from 'pdf-lib'
import type { Page } from 'playwright-core'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { buildDocx } from '../fixtures/transcripts/docx.js'
import { linkIn, waitForMail } from '../support/mailbox.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'
import { select } from './support/coding.js'
import { keyboardGaps } from './support/keyboard.js'

/**
 * One whole study, on a fresh database, through the browser only: the site administrator creates the
 * study; the lead sets it up and invites the team (each invitation read from the fake mailbox); a person
 * applies on the public page; the coordinator screens, sends the e-consent link and the participant
 * consents from the e-mail; the coordinator books and records the interview, uploads the transcript,
 * de-identifies and approves it; two coders code it; the lead checks agreement, builds a theme and opens
 * a partner round; the partner answers; the lead downloads the quotes by theme.
 *
 * Every page on the way is screenshotted (test-output/e2e/journey-*.png), scanned with axe (no serious
 * or critical violations: WCAG 2.2 AA rules) and walked with the Tab key (every control reachable:
 * WCAG 2.2 SC 2.1.1). Every name, place and word is invented.
 */
const PASSWORD = 'a quiet kitchen table at dusk'
const STUDY = { code: 'HOMEWARD', title: 'Coming home after a hip fracture', summary: 'How older people and their families manage the first months at home.' }
const PEOPLE = {
  admin: { email: 'site.admin@journey.test', name: 'Sol Amberley' },
  lead: { email: 'lead@journey.test', name: 'Dr Ines Harrowgate' },
  coordinator: { email: 'coordinator@journey.test', name: 'Theo Brackwater' },
  coder1: { email: 'coder.one@journey.test', name: 'Maren Quill' },
  coder2: { email: 'coder.two@journey.test', name: 'Ade Lindqvist' },
  partner: { email: 'partner@journey.test', name: 'Rosa Penhallow' },
}
const APPLICANT = { name: 'Edith Marchbank', email: 'edith.marchbank@example.org' }
const QUESTION = 'Have you or a relative come home from hospital after a broken hip in the last two years?'
const PASSAGE = 'the first night home I sat up listening for every sound'
const SECOND = 'nobody told us who to ring at the weekend'
const TRANSCRIPT = [
  'Interviewer: Thank you for talking with me. How was coming home?',
  `Edith Marchbank: Honestly ${PASSAGE}, in Wickerbrook, because the hospital had sent him home on a Friday.`,
  'Interviewer: Who helped you in those first days?',
  `Edith Marchbank: My daughter came, but ${SECOND}, and I kept the number (250) 555-0143 by the phone.`,
]

let e2e: E2E
let studyId = ''

beforeAll(async () => {
  e2e = await startE2E() // a fresh database: no demo study, no accounts
  await e2e.ctx.startMailWorker()
})
afterAll(() => e2e?.close())
// a failed step leaves a picture of every open page, to see what stood in the way
afterEach(async (context) => {
  if (context.task.result?.state !== 'fail') return
  for (const [i, open] of e2e.browser.pages().entries()) await open.screenshot({ path: `test-output/e2e/journey-failed-${context.task.name.split('.')[0]}-${i}.png`, fullPage: true }).catch(() => {})
  for (const open of e2e.browser.pages()) await open.close().catch(() => {})
})

/** Axe scan, screenshot and Tab walk of the page (or open dialog) as it stands. */
async function look(page: Page, name: string): Promise<void> {
  await page.waitForLoadState('networkidle')
  const a11y = await seriousA11yViolations(page) // waits for transitions to settle, so it goes before the picture
  await screenshot(page, `journey-${name}`)
  const keyboard = await keyboardGaps(page)
  expect(a11y, `axe on ${name}`).toEqual([])
  expect(keyboard, `keyboard on ${name}`).toEqual([])
}

async function signInAs(page: Page, who: keyof typeof PEOPLE): Promise<void> {
  await signInAndArrive(page, e2e.baseUrl, PEOPLE[who].email, PASSWORD)
}

/** Follows the newest e-mailed link containing `path` as a signed-out visitor. */
async function followMail(page: Page, to: string, subject: RegExp, path: string): Promise<void> {
  const mail = await waitForMail(to, subject)
  await e2e.browser.clearCookies()
  await page.goto(`${e2e.baseUrl}${path}/${linkIn(mail, path)}`)
}

async function joinFromInvitation(page: Page, who: keyof typeof PEOPLE): Promise<void> {
  await followMail(page, PEOPLE[who].email, /invited to join/, '/invitations')
  await page.getByLabel('Your name').fill(PEOPLE[who].name)
  await page.getByLabel('Choose a password', { exact: true }).fill(PASSWORD)
  await page.getByRole('button', { name: 'Join the study' }).click()
  await page.getByRole('heading', { name: STUDY.title }).first().waitFor()
}

async function chooseOption(page: Page, label: string | RegExp, option: string | RegExp, within = page.locator('body')): Promise<void> {
  // the field, as a person clicks it (a Vuetify select's own input is a hidden one-character box)
  const exactly = typeof label === 'string' ? new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}$`) : label
  await within.locator('.v-input').filter({ has: page.locator('label.v-field-label', { hasText: exactly }) }).first().locator('.v-field').click()
  await page.getByRole('option', { name: option }).first().click()
}

async function consentFormPdf(): Promise<Buffer> {
  const pdf = await PDFDocument.create()
  const font = await pdf.embedFont(StandardFonts.Helvetica)
  pdf.addPage().drawText('Coming home after a hip fracture: consent form, version 1.0', { x: 50, y: 750, size: 12, font })
  return Buffer.from(await pdf.save())
}

const today = () => new Date().toISOString().slice(0, 10)

describe('a whole study, from an empty site to the quotes by theme', () => {
  it('1. the site administrator, created on the command line, creates the study and names its lead', async () => {
    const created = spawnSync('npx', ['tsx', '--tsconfig', 'tsconfig.server.json', 'server/cli/create-admin.ts', PEOPLE.admin.email, PEOPLE.admin.name], {
      env: { ...process.env, DATABASE_URL: e2e.ctx.databaseUrl, PUBLIC_URL: e2e.baseUrl },
      encoding: 'utf8',
    })
    expect(created.status, created.stderr).toBe(0)
    const link = created.stdout.match(/https?:\/\/\S+\/reset-password\/\S+/)![0]
    const page = await e2e.newPage()
    await page.goto(link)
    await page.getByLabel('New password', { exact: true }).fill(PASSWORD)
    await look(page, '01-admin-chooses-password')
    await page.getByRole('button', { name: 'Save the new password' }).click()
    await page.getByLabel('E-mail address').waitFor()
    await signInAs(page, 'admin')
    await page.getByText('No studies yet').waitFor()
    await look(page, '02-admin-empty-site')
    await page.getByRole('link', { name: 'Go to site administration' }).click()
    await page.getByRole('tab', { name: 'Studies' }).click()
    await page.getByRole('button', { name: 'Create a study' }).first().click()
    const dialog = page.getByRole('dialog')
    await dialog.getByLabel('Short code').fill(STUDY.code)
    await dialog.getByLabel('Title').fill(STUDY.title)
    await dialog.getByLabel('Summary (optional)').fill(STUDY.summary)
    await dialog.getByLabel("Lead researcher's e-mail").fill(PEOPLE.lead.email)
    await look(page, '03-admin-creates-study')
    await dialog.getByRole('button', { name: 'Create the study' }).click()
    await page.getByRole('cell', { name: STUDY.title, exact: true }).waitFor()
    await look(page, '04-admin-studies')
    await page.close()
  })

  it('2. the lead joins from the e-mail and sets the study up: questions, public page, consent form', async () => {
    const page = await e2e.newPage()
    await joinFromInvitation(page, 'lead')
    studyId = page.url().match(/studies\/([0-9a-f-]{36})/)![1]!
    await look(page, '05-lead-overview')

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/screening-form`)
    await page.getByRole('button', { name: 'Write the first question' }).click()
    await page.getByLabel('Question', { exact: true }).fill(QUESTION)
    await chooseOption(page, 'Condition', 'is')
    await chooseOption(page, 'Value', 'Yes')
    await page.getByRole('button', { name: 'Save the questions' }).first().click()
    await page.getByText(/saved/i).first().waitFor()
    await look(page, '06-lead-screening-questions')

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/recruitment/settings`)
    await page.getByLabel('Not taking new enquiries').check()
    await page.getByLabel('What the study is about, in plain words').fill('We would like to hear how the first months at home went, in your own words.')
    await page.getByLabel('Who can take part').fill('Anyone who came home after a broken hip in the last two years, or who cared for someone who did.')
    await page.getByRole('button', { name: 'Save the settings' }).first().click()
    await page.getByText(/saved/i).first().waitFor()
    await look(page, '07-lead-recruitment-settings')

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/consent-forms`)
    await page.getByRole('button', { name: 'Add a version' }).first().click()
    const dialog = page.getByRole('dialog')
    await dialog.getByLabel('Version label').fill('1.0')
    await dialog.getByLabel('Ethics approval date').fill(today())
    await dialog.getByLabel('In use from').fill(today())
    await dialog.locator('input[type=file]').setInputFiles({ name: 'consent-v1.pdf', mimeType: 'application/pdf', buffer: await consentFormPdf() })
    await dialog
      .getByLabel('The form text')
      .fill('We will talk with you for about an hour about coming home. You can stop at any time. Your name will not appear in anything we write.')
    for (const [i, wording, topic, required] of [
      [0, 'May we record the interview?', 'Audio recording of the interview', true],
      [1, 'May we quote your words in reports, without your name?', 'Quoting their words in reports', false],
    ] as const) {
      await dialog.getByRole('button', { name: 'Add a clause' }).click()
      await dialog.getByLabel(`Clause ${i + 1}: wording`).fill(wording)
      await chooseOption(page, 'Heardwell uses this answer for', topic, dialog.locator('.consent-form-clauses .v-card').nth(i))
      if (required) await dialog.locator('.consent-form-clauses .v-card').nth(i).getByLabel('The study cannot go ahead without a yes').check()
    }
    await look(page, '08-lead-consent-form-dialog')
    await dialog.getByRole('button', { name: 'Add this version' }).click()
    await page.getByRole('button', { name: 'Approve this version' }).click()
    await page.getByRole('dialog').getByRole('button', { name: 'Approve this version' }).click()
    await page.getByText(/approved/i).first().waitFor()
    await look(page, '09-lead-consent-forms')
    await page.close()
  })

  it('3. the lead invites the team, and each member joins from the e-mail', async () => {
    const page = await e2e.newPage()
    await signInAs(page, 'lead')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/team`)
    const roles = { coordinator: 'Coordinator', coder1: 'Coder', coder2: 'Coder', partner: 'Patient partner' } as const
    for (const [who, role] of Object.entries(roles) as [keyof typeof roles, string][]) {
      await page.getByRole('button', { name: 'Invite someone' }).click()
      const dialog = page.getByRole('dialog')
      await dialog.getByLabel('E-mail address').fill(PEOPLE[who].email)
      // the role with the keyboard: focus the field, open it with the arrow key, pick with Enter
      await dialog.getByLabel('Role on this study').focus()
      await page.keyboard.press('ArrowDown')
      await page.getByRole('option', { name: role, exact: true }).waitFor()
      await page.getByRole('option', { name: role, exact: true }).click()
      if (who === 'coordinator') await look(page, '10-lead-invitation-dialog')
      await dialog.getByRole('button', { name: 'Send the invitation' }).click()
      await dialog.waitFor({ state: 'hidden' })
      await page.getByText(PEOPLE[who].email).first().waitFor()
    }
    await look(page, '10-lead-team-invited-all')
    for (const who of Object.keys(roles) as (keyof typeof roles)[]) {
      await joinFromInvitation(page, who)
      if (who === 'coordinator') await look(page, '11-coordinator-joined')
    }
    await page.close()
  })

  it('4. a person applies on the public page', async () => {
    const page = await e2e.newPage()
    await page.goto(`${e2e.baseUrl}/join/${STUDY.code.toLowerCase()}`)
    await page.getByRole('heading', { name: STUDY.title }).first().waitFor()
    await page.getByRole('radiogroup', { name: QUESTION }).getByLabel('Yes', { exact: true }).check()
    await page.getByLabel('Your name').fill(APPLICANT.name)
    await page.getByLabel('E-mail address').fill(APPLICANT.email)
    await page.getByLabel('You may contact me about this study').check()
    await look(page, '12-public-page')
    await page.getByRole('button', { name: 'Send my answers' }).click()
    await page.getByRole('heading', { name: 'Thank you' }).waitFor()
    await look(page, '13-public-page-thanks')
    await waitForMail(APPLICANT.email, /Thank you for contacting/)
    await page.close()
  })

  it('5. the coordinator screens and sends the e-consent link; the participant consents from the e-mail', async () => {
    const page = await e2e.newPage()
    await signInAs(page, 'coordinator')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/participants`)
    const row = page.getByRole('row').filter({ hasText: APPLICANT.email })
    await row.waitFor()
    await look(page, '14-coordinator-participants-list')
    await row.getByText('P01').click()
    await page.getByRole('button', { name: 'Screen again' }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByRole('radiogroup', { name: QUESTION }).getByLabel('Yes', { exact: true }).check()
    await dialog.getByLabel('Note (optional)').fill('Confirmed on the phone.')
    await look(page, '14-coordinator-screening-dialog')
    await dialog.getByRole('button', { name: 'Screen again' }).click()
    await dialog.waitFor({ state: 'hidden' })
    await page.getByText('Eligible', { exact: true }).first().waitFor()
    await page.getByRole('button', { name: 'Send an e-consent link' }).click()
    await page.getByText(/An e-consent link for version 1\.0 is on its way/).waitFor()
    await page.getByText(/works until/).first().waitFor()
    await look(page, '15-coordinator-participant')

    await followMail(page, APPLICANT.email, /Your consent form/, '/consent')
    await page.getByRole('heading', { name: 'Please read the form' }).waitFor()
    await page.getByRole('radiogroup', { name: 'May we record the interview?' }).getByLabel('Yes').check()
    await page.getByRole('radiogroup', { name: /May we quote your words/ }).getByLabel('Yes').check()
    await page.getByLabel('Type your full name').fill(APPLICANT.name)
    await page.getByLabel('I have read the form and I agree to take part').check()
    await look(page, '16-participant-consent-page')
    await page.getByRole('button', { name: 'Sign' }).click()
    await page.getByRole('heading', { name: 'Thank you. You have signed.' }).waitFor()
    await look(page, '17-participant-signed')
    await waitForMail(APPLICANT.email, /Your signed consent/)
    await page.close()
  })

  it('6. the coordinator books and records the interview, uploads the transcript, de-identifies and approves it', async () => {
    const page = await e2e.newPage()
    await signInAs(page, 'coordinator')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/participants`)
    await page.getByRole('row').filter({ hasText: APPLICANT.email }).getByText('P01').click()
    await page.getByText('Consented', { exact: true }).first().waitFor()
    await page.getByRole('button', { name: 'Book an interview' }).click()
    const booking = page.getByRole('dialog')
    const when = new Date(Date.now() - 2 * 86_400_000)
    await booking.getByLabel('Date and time').fill(`${when.toISOString().slice(0, 10)}T10:00`)
    await chooseOption(page, 'Interviewer', PEOPLE.coordinator.name, booking)
    await look(page, '18-coordinator-booking')
    await booking.getByRole('button', { name: 'Book the interview' }).click()
    await booking.waitFor({ state: 'hidden' })

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/interviews`)
    await page.getByRole('button', { name: 'Record how the interview with P01 went' }).click()
    const outcome = page.getByRole('dialog')
    await outcome.getByLabel('It took place').check()
    await outcome.getByLabel('How long it took, in minutes').fill('52')
    await outcome.getByRole('button', { name: 'Save the outcome' }).click()
    await outcome.waitFor({ state: 'hidden' })
    await look(page, '19-coordinator-interviews')

    await page.getByRole('button', { name: 'Upload a transcript of the interview with P01' }).click()
    await page.locator('input[type=file]').setInputFiles({ name: 'interview-p01.docx', mimeType: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document', buffer: await buildDocx(TRANSCRIPT) })
    await page.getByRole('button', { name: 'Upload and scan' }).click()
    await page.waitForURL(/\/review$/)
    await page.getByText(/The scan is an aid/).waitFor()
    await look(page, '20-coordinator-transcript-review')
    await page.getByRole('button', { name: 'Accept all remaining' }).click()
    await page.getByRole('button', { name: 'Approve' }).and(page.locator(':not([disabled])')).waitFor()
    await page.getByRole('button', { name: 'Approve' }).click()
    await page.waitForURL(/\/transcripts\/[0-9a-f-]+$/)
    await look(page, '21-coordinator-transcript-approved')
    await page.close()
  })

  it('7. two coders code the transcript, one with the mouse and one with the keyboard only', async () => {
    const [{ id: transcriptId }] = await e2e.ctx.dataSource.query(`SELECT id FROM transcripts WHERE study_id = $1`, [studyId])
    for (const [who, codes] of [
      ['coder1', [[PASSAGE, 'Listening at night'], [SECOND, 'Who to call']]],
      ['coder2', [[PASSAGE, 'Listening at night']]],
    ] as const) {
      const page = await e2e.newPage()
      await signInAs(page, who)
      await page.goto(`${e2e.baseUrl}/studies/${studyId}/transcripts`)
      await page.getByRole('link', { name: /Read P01’s transcript/ }).click()
      await page.goto(`${e2e.baseUrl}/studies/${studyId}/transcripts/${transcriptId}/coding`)
      await page.getByTestId('coding-turn').first().waitFor()
      const body = await page.content()
      for (const secret of ['Edith Marchbank', 'Wickerbrook', '555-0143']) expect(body, `a coder never sees ${secret}`).not.toContain(secret)
      for (const [passage, label] of codes) {
        const panel = page.getByTestId('coding-apply-panel')
        if (who === 'coder1') {
          // with the mouse: select the words, pick the code, press Apply
          await select(page, passage)
          await panel.waitFor()
          await panel.getByLabel('Find or create a code').fill(label)
          await panel.getByRole('option', { name: new RegExp(label) }).first().click()
          await panel.getByRole('button', { name: 'Apply' }).click()
        } else {
          // with the keyboard only: into the text, ] twice to the participant's first sentence, Enter opens
          // the code panel, type the code, Enter takes it, Enter again applies
          await page.getByTestId('coding-text').focus()
          await page.keyboard.press(']')
          await page.keyboard.press(']')
          await page.keyboard.press('Enter')
          await panel.waitFor()
          await page.keyboard.type(label)
          await page.keyboard.press('Enter')
          await page.keyboard.press('Enter')
        }
        const excerpt = page.getByTestId('coding-excerpt-list').getByTestId('coding-excerpt').filter({ hasText: label })
        await excerpt.waitFor()
        expect(await excerpt.innerText()).toContain(passage)
      }
      await look(page, `22-${who}-coding`)
      await page.close()
    }
  })

  it('8. the lead checks agreement, builds a theme and opens a partner round', async () => {
    const page = await e2e.newPage()
    await signInAs(page, 'lead')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/agreement`)
    await page.getByTestId('agreement-table').getByText('Listening at night').waitFor()
    expect(await page.locator('body').innerText()).not.toMatch(/NaN/)
    await look(page, '23-lead-agreement')

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/themes`)
    await page.getByRole('button', { name: 'Add theme' }).first().click()
    const dialog = page.getByRole('dialog')
    await dialog.getByLabel('Name', { exact: true }).fill('Keeping watch through the night')
    await dialog.getByLabel('Analytic description (for the team)').fill('Vigilance as unpaid work in the first weeks at home.')
    await dialog.getByLabel('Plain-language description (for partners)').fill('People stayed awake at night to keep watch over the person who came home.')
    await dialog.getByLabel('Codes this theme draws on').click()
    await page.getByRole('option', { name: /Listening at night/ }).first().click()
    await page.keyboard.press('Escape')
    const row = dialog.getByText(PASSAGE).first()
    await row.waitFor()
    await dialog.getByLabel('Use as supporting excerpt').first().check()
    await dialog.getByLabel('Share with partners').first().check()
    await look(page, '24-lead-theme-editor')
    await dialog.getByRole('button', { name: 'Add theme' }).click()
    await dialog.waitFor({ state: 'hidden' })
    await page.getByText('Keeping watch through the night').first().waitFor()
    await look(page, '25-lead-themes')

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/review-rounds`)
    await page.getByRole('button', { name: 'Open a review round' }).first().click()
    const round = page.getByRole('dialog')
    await round.getByLabel('Title').fill('First look at the themes')
    await round.getByLabel('Keeping watch through the night').check()
    await round.getByLabel('Closing date').fill(new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10))
    await look(page, '26-lead-round-dialog')
    await round.getByRole('button', { name: 'Open the round' }).click()
    await page.getByText(/e-mailed/).first().waitFor()
    await look(page, '27-lead-review-rounds')
    await page.close()
  })

  it('9. the partner answers from the e-mailed link', async () => {
    const mail = await waitForMail(PEOPLE.partner.email, /Themes to read/)
    const roundPath = new URL(mail.text.match(/https?:\/\/\S+\/studies\/\S+\/review\/[0-9a-f-]+/)![0]).pathname
    const page = await e2e.newPage()
    await signInAs(page, 'partner')
    await page.goto(`${e2e.baseUrl}${roundPath}`)
    const card = page.getByTestId('partner-theme')
    await card.first().waitFor()
    await card.getByText(PASSAGE).waitFor()
    expect(await page.content()).not.toMatch(/Vigilance as unpaid work|Edith Marchbank/)
    await look(page, '28-partner-review')
    await card.getByLabel('This rings true').check()
    await card.getByLabel('Tell us more (optional)').fill('Yes. I did the same for weeks.')
    await card.getByRole('button', { name: 'Send my answer' }).click()
    await card.getByText(/Sent on/).waitFor()
    await look(page, '29-partner-answered')
    await page.close()
  })

  it('10. the lead reads the answer and downloads the quotes by theme', async () => {
    const page = await e2e.newPage()
    await signInAs(page, 'lead')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/review-rounds`)
    await page.getByText('First look at the themes').first().click()
    await page.getByTestId('round-answers').getByText('Yes. I did the same for weeks.').waitFor()
    await look(page, '30-lead-round-answers')
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/reports`)
    await page.getByTestId('export-quotes-by-theme').first().waitFor()
    await look(page, '31-lead-reports')
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-quotes-by-theme').first().click()])
    const rows = Papa.parse<Record<string, string>>(readFileSync((await download.path())!, 'utf8').replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data
    // one quote row for the theme, then the counts of what was left out
    const quotes = rows.filter((r) => r.theme === 'Keeping watch through the night')
    expect(quotes).toEqual([{ theme: 'Keeping watch through the night', theme_status: expect.any(String), pseudonym: 'P01', characteristics: expect.any(String), quote: expect.stringContaining(PASSAGE) }])
    expect(rows.filter((r) => r.theme.startsWith('(left out')).map((r) => r.quote)).toEqual(['0 excerpts', '0 excerpts'])
    expect(JSON.stringify(rows)).not.toMatch(/Edith Marchbank|edith\.marchbank/)
    await page.close()
  })
})

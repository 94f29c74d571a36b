import { DEMO_QUESTIONNAIRE, DEMO_RECRUITMENT } from '../../server/seed/demo-questionnaire.js'
import type { Answers } from '../../shared/schemas/recruitment.js'
import { Client } from './test-app.js'

/** Sets up recruitment on a study through the API, as its lead would. */
export async function openRecruitment(lead: Client, studyId: string) {
  const settings = await lead.patch(`/api/studies/${studyId}/recruitment-settings`, DEMO_RECRUITMENT)
  if (settings.status !== 200) throw new Error(`settings: ${settings.status} ${JSON.stringify(settings.body)}`)
  const form = await lead.put(`/api/studies/${studyId}/screening-form`, DEMO_QUESTIONNAIRE)
  if (form.status !== 200) throw new Error(`form: ${form.status} ${JSON.stringify(form.body)}`)
  return form.body
}

const yearsAgo = (years: number) => {
  const d = new Date()
  d.setUTCFullYear(d.getUTCFullYear() - years)
  return d.toISOString().slice(0, 10)
}

export const ELIGIBLE_ANSWERS: Answers = {
  reason: 'take_part',
  age: 54,
  cared_after_stroke: 'yes',
  discharge_date: yearsAgo(2),
  region: 'coast',
  relationship: 'adult_child',
  anything_else: 'My mother came home in <b>spring</b>, "we" managed, = somehow',
}

export const HELP_SEEKING_ANSWERS: Answers = { ...ELIGIBLE_ANSWERS, reason: 'help_for_myself', anything_else: '' }
export const TOO_YOUNG_ANSWERS: Answers = { ...ELIGIBLE_ANSWERS, age: 17 }


import { afterEach, describe, expect, it } from 'vitest'
import { READABILITY_GUIDANCE, readability } from '@shared/readability'
import ConsentFormReadability from '@/components/consent/ConsentFormReadability.vue'
import { mountView } from './support'

// Long words and long sentences: well above grade 8 by Flesch–Kincaid.
const HARD =
  'Participation in this investigation necessitates comprehensive documentation of longitudinal experiences regarding rehabilitation, ' +
  'institutional communication, and interdisciplinary coordination following hospitalisation, which investigators will systematically characterise.'
// One-syllable words in short sentences: well below.
const EASY = 'We want to talk with you. It will take one hour. You can stop at any time. You do not have to say why.'

async function panel(text: string) {
  const { wrapper } = await mountView(ConsentFormReadability, { props: { text } })
  return wrapper
}

describe('the readability panel', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('flags a form above grade 8 in words and with an icon, and cites its source', async () => {
    const grade = readability(HARD)!.grade
    expect(grade).toBeGreaterThan(8)
    const wrapper = await panel(HARD)
    const flag = wrapper.find('.consent-form-readability__flag')
    expect(flag.exists()).toBe(true)
    expect(flag.text()).toContain('Above grade 8')
    expect(flag.find('.v-alert__prepend .v-icon').exists()).toBe(true)
    expect(wrapper.find('.consent-form-readability__grade').text()).toBe((Math.round(grade * 10) / 10).toFixed(1))
    expect(wrapper.text()).toContain('Flesch Reading Ease')
    expect(wrapper.text()).toContain(READABILITY_GUIDANCE.text)
    expect(wrapper.find('.consent-form-readability__source').text()).toContain(READABILITY_GUIDANCE.source)
  })

  it('does not flag plain text at or below grade 8, and still shows the guidance and source', async () => {
    const wrapper = await panel(EASY)
    expect(wrapper.find('.consent-form-readability__flag').exists()).toBe(false)
    expect(wrapper.text()).toContain('At or below grade 8')
    expect(wrapper.text()).toContain(READABILITY_GUIDANCE.source)
  })

  it('asks for the form text when there is none to measure', async () => {
    const wrapper = await panel('   ')
    expect(wrapper.text()).toContain('There is no form text to measure yet')
    expect(wrapper.find('.consent-form-readability__flag').exists()).toBe(false)
  })
})

import { afterEach, describe, expect, it } from 'vitest'
import { VSelect } from 'vuetify/components'
import type { QuestionKind } from '@shared/schemas/recruitment'
import ScreeningFormRule from '@/components/recruitment/ScreeningFormRule.vue'
import { mountView } from './support'

async function operatorsFor(kind: QuestionKind) {
  const { wrapper } = await mountView(ScreeningFormRule, {
    props: { kind, options: [{ value: 'north', label: 'North' }], modelValue: null },
  })
  const select = wrapper.findComponent(VSelect)
  const titles = select.exists() ? (select.props('items') as { title: string }[]).map((item) => item.title) : []
  return { wrapper, titles }
}

describe('the rule editor of a screening question', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('offers only number comparisons for a number question', async () => {
    const { titles } = await operatorsFor('number')
    expect(titles).toEqual(['is at least', 'is at most', 'is more than', 'is less than', 'is exactly', 'is between'])
  })

  it('offers only "is" for a yes-or-no question', async () => {
    expect((await operatorsFor('yes_no')).titles).toEqual(['is'])
  })

  it('offers the "includes" operators for a several-choices question and no single-value ones', async () => {
    const { titles } = await operatorsFor('multiple_choice')
    expect(titles).toEqual(['includes any of', 'includes all of', 'includes none of'])
    expect(titles).not.toContain('is')
  })

  it('offers date comparisons and a period for a date question', async () => {
    expect((await operatorsFor('date')).titles).toEqual(['is on or after', 'is on or before', 'is within the last'])
  })

  it('offers no condition for a free-text question and says a person reads it', async () => {
    const { wrapper, titles } = await operatorsFor('free_text')
    expect(titles).toEqual([])
    expect(wrapper.text()).toContain('a person on the team reads them and decides')
  })

  it('asks for two numbers once "is between" is chosen', async () => {
    const { wrapper } = await mountView(ScreeningFormRule, {
      props: { kind: 'number', options: [], modelValue: { operator: 'between', min: 18, max: 65 } },
    })
    const numbers = wrapper.findAll('input[type="number"]')
    expect(numbers).toHaveLength(2)
    expect((numbers[0].element as HTMLInputElement).value).toBe('18')
    expect((numbers[1].element as HTMLInputElement).value).toBe('65')
  })
})

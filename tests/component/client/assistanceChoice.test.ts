// The assistance level as people see it: each level's label and description when choosing, the chip's words,
// and never the key.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { createVuetify } from 'vuetify'
import {
  ASSISTANCE_LEVEL_INFO,
  ASSISTANCE_LEVEL_KEYS,
  type AssistanceLevel,
} from '@shared/scenario/assistance'
import AssistanceLevelChoice from '@/components/assistance/AssistanceLevelChoice.vue'
import AssistanceChip from '@/components/assistance/AssistanceChip.vue'

const global = { plugins: [createVuetify()] }

describe('choosing an assistance level', () => {
  it('lists every level with its description and reports the choice', async () => {
    const wrapper = mount(AssistanceLevelChoice, {
      props: {
        modelValue: 'standard' as AssistanceLevel,
        'onUpdate:modelValue': (v: AssistanceLevel) => wrapper.setProps({ modelValue: v }),
      },
      global,
    })
    const text = wrapper.text()
    for (const key of ASSISTANCE_LEVEL_KEYS) {
      expect(text).toContain(ASSISTANCE_LEVEL_INFO[key].label)
      expect(text).toContain(ASSISTANCE_LEVEL_INFO[key].description)
    }
    expect(text).not.toMatch(/\bguided\b|\bstandard\b|\bassessment\b/)
    await wrapper.get('[data-testid="assistance-guided"] input').setValue(true)
    expect(wrapper.emitted('update:modelValue')?.at(-1)).toEqual(['guided'])
  })

  it('shows the level on a chip in words', () => {
    const chip = mount(AssistanceChip, { props: { level: 'assessment' }, global })
    expect(chip.text()).toBe('Assistance: Assessment')
    expect(chip.attributes('aria-label')).toContain(ASSISTANCE_LEVEL_INFO.assessment.description)
  })
})

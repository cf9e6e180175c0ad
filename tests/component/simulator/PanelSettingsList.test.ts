// The settings list: search narrows it, edits write setting changes, and the save button saves them.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { createVuetify } from 'vuetify'
import { DEFAULT_SETTINGS } from '@shared/model/settings'
import PanelSettingsList from '@/simulator/components/PanelSettingsList.vue'

function mountList(pending = {}) {
  return mount(PanelSettingsList, {
    props: { active: DEFAULT_SETTINGS, pending },
    global: { plugins: [createVuetify()] },
  })
}

describe('the settings list', () => {
  it('shows only the settings that match the search', async () => {
    const wrapper = mountList()
    expect(wrapper.find('[data-testid="setting-ramp.accelSeconds"]').exists()).toBe(true)
    await wrapper.get('[data-testid="settings-search"] input').setValue('deceleration')
    expect(wrapper.find('[data-testid="setting-ramp.accelSeconds"]').exists()).toBe(false)
    expect(wrapper.find('[data-testid="setting-ramp.decelSeconds"]').exists()).toBe(true)
  })

  it('writes a number within range as a setting change', async () => {
    const wrapper = mountList()
    const input = wrapper.get('[data-testid="setting-ramp.accelSeconds"] input')
    await input.setValue('12.5') // fires input and change, as a user leaving the field does
    expect(wrapper.emitted('change')).toEqual([['ramp.accelSeconds', 12.5]])
  })

  it('refuses a number outside the range with a clear message and writes nothing', async () => {
    const wrapper = mountList()
    const input = wrapper.get('[data-testid="setting-ramp.accelSeconds"] input')
    await input.setValue('900')
    expect(wrapper.emitted('change')).toBeUndefined()
    expect(wrapper.text()).toContain('Between 0.1 and 600 s')
  })

  it('offers to save only when something is not saved yet', async () => {
    expect(mountList().get('[data-testid="settings-save"]').attributes('disabled')).toBeDefined()
    const wrapper = mountList({ 'speed.max': 60 })
    expect(wrapper.text()).toContain('1 not saved')
    await wrapper.get('[data-testid="settings-save"]').trigger('click')
    expect(wrapper.emitted('save')).toHaveLength(1)
  })
})

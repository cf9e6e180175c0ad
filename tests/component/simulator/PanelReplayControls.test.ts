// The replay's timeline: an instructor's fault and message get marks of their own and words in the legend,
// which names them only where the timeline has them.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { createVuetify } from 'vuetify'
import PanelReplayControls from '@/simulator/components/PanelReplayControls.vue'
import type { TimelineMark } from '@/simulator/components/replayMarks'

function controls(marks: TimelineMark[]) {
  return mount(PanelReplayControls, {
    props: { position: 0, end: 10_000, playing: false, rate: 1, rates: [1, 4, 16], marks },
    global: { plugins: [createVuetify()] },
  })
}

describe('the replay timeline', () => {
  it('marks a fault put in and a message each in its own way, and says so in the legend', () => {
    const wrapper = controls([
      { t: 1000, kind: 'event', label: 'added wire W1 BU' },
      { t: 4000, kind: 'injection', label: 'Ottilie Marsh put in a fault: broke wire W1 BU' },
      { t: 5000, kind: 'message', label: 'Hint from Ottilie Marsh' },
    ])
    const track = wrapper.get('.panel-replay__marks')
    expect(track.find('.panel-replay__mark--injection').attributes('style')).toContain('left: 40%')
    expect(track.find('.panel-replay__mark--message').attributes('style')).toContain('left: 50%')
    expect(wrapper.get('[data-testid="legend-injection"]').text()).toBe('fault put in by an instructor')
    expect(wrapper.get('[data-testid="legend-message"]').text()).toBe("instructor's hint or message")
  })

  it('leaves them out of the legend when the timeline has none', () => {
    const wrapper = controls([{ t: 1000, kind: 'event', label: 'added wire W1 BU' }])
    expect(wrapper.find('[data-testid="legend-injection"]').exists()).toBe(false)
    expect(wrapper.find('[data-testid="legend-message"]').exists()).toBe(false)
  })
})

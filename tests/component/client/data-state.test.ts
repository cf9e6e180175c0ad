// Every data screen's three states, from one component.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { mount } from '@vue/test-utils'
import DataState from '@/components/common/DataState.vue'
import { ApiError } from '@/api/errors'
import { testVuetify } from './helpers'

const mountState = (props: Record<string, unknown>) =>
  mount(DataState, {
    props: { loading: false, ...props },
    slots: { default: '<p class="content">the rows</p>' },
    global: { plugins: [testVuetify()] },
  })

describe('the data state wrapper', () => {
  afterEach(() => vi.restoreAllMocks())

  it('says it is loading, and shows no content yet', () => {
    const wrapper = mountState({ loading: true })
    expect(wrapper.get('[role="status"]').text()).toContain('Loading')
    expect(wrapper.find('.content').exists()).toBe(false)
  })

  it('shows the error in words, never its code, and retries on request', async () => {
    const retry = vi.fn()
    const wrapper = mountState({
      error: new ApiError(503, 'server_error', 'The server had a problem.'),
      retry,
    })
    expect(wrapper.text()).toContain('The server had a problem.')
    expect(wrapper.text()).not.toContain('server_error')
    await wrapper.get('button').trigger('click')
    expect(retry).toHaveBeenCalledOnce()
  })

  it('explains an empty list', () => {
    const wrapper = mountState({
      empty: true,
      emptyTitle: 'No cohorts yet',
      emptyText: 'Create a cohort first.',
    })
    expect(wrapper.text()).toContain('No cohorts yet')
    expect(wrapper.text()).toContain('Create a cohort first.')
    expect(wrapper.find('.content').exists()).toBe(false)
  })

  it('shows the content once loaded', () => {
    expect(mountState({}).find('.content').text()).toBe('the rows')
  })
})

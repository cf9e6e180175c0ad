// The schematic tab's drawing as a lazy component: the layout code and its font metrics load in their own
// chunk when the tab is first opened, so the panel's chunk does not carry them.
import { defineAsyncComponent, h } from 'vue'

export const PanelSchematic = defineAsyncComponent({
  loader: () => import('./components/PanelSchematic.vue'),
  loadingComponent: { render: () => h('p', { class: 'text-body-2' }, 'Loading the drawing…') },
  errorComponent: {
    render: () =>
      h(
        'p',
        { class: 'text-body-2', role: 'alert' },
        'The drawing could not be loaded. Reload the page to try again.',
      ),
  },
  delay: 100,
  timeout: 30_000,
})

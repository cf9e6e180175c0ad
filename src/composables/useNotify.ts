// App-wide short messages ("Invitation sent"), shown by the snackbar queue in App.vue.
import { ref } from 'vue'

export interface Notice {
  text: string
  color?: 'success' | 'error' | 'info' | 'warning'
}

const queue = ref<Notice[]>([])

export function useNotify() {
  return {
    queue,
    notify: (text: string, color: Notice['color'] = 'success') => queue.value.push({ text, color }),
  }
}

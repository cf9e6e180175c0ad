// Loading / error / data for one async loader, with the last call winning when calls overlap.
import { ref, shallowRef, type Ref } from 'vue'

export function useAsync<T, A extends unknown[] = []>(loader: (...args: A) => Promise<T>) {
  const data = shallowRef<T | null>(null) as Ref<T | null>
  const loading = ref(false)
  const error = shallowRef<unknown>(null)
  let generation = 0

  async function run(...args: A): Promise<T | null> {
    const mine = ++generation
    loading.value = true
    error.value = null
    try {
      const result = await loader(...args)
      if (mine === generation) data.value = result
      return result
    } catch (e) {
      if (mine === generation) error.value = e
      return null
    } finally {
      if (mine === generation) loading.value = false
    }
  }

  return { data, loading, error, run }
}

import { browserStorage } from '@/composables/browserStorage'
import { computed } from 'vue'
import { useTheme } from 'vuetify'
import { THEME_STORAGE_KEY } from '@/plugins/theme'

export function useThemeToggle() {
  const theme = useTheme()
  const isDark = computed(() => theme.global.current.value.dark)
  function toggle() {
    const next = isDark.value ? 'slipwayLight' : 'slipwayDark'
    theme.change(next)
    browserStorage('localStorage').setItem(THEME_STORAGE_KEY, next)
  }
  return { isDark, toggle }
}

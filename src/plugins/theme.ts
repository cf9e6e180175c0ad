// Slipway's own palette: a deep teal-blue primary, a safety amber used sparingly, warm neutral surfaces.
// Every text/background pair here is checked for WCAG contrast ≥ 4.5:1 in tests/component/theme.test.ts.
import { browserStorage } from '@/composables/browserStorage'
import type { ThemeDefinition } from 'vuetify'

export const slipwayLight: ThemeDefinition = {
  dark: false,
  colors: {
    background: '#f7f4ee',
    surface: '#fffdf9',
    'surface-variant': '#e9e2d4',
    'on-surface-variant': '#3b362e',
    primary: '#0d4f5c',
    'on-primary': '#ffffff',
    secondary: '#f2b233',
    'on-secondary': '#241a05',
    error: '#a3302a',
    'on-error': '#ffffff',
    success: '#2f6b3d',
    'on-success': '#ffffff',
    warning: '#8a5300',
    'on-warning': '#ffffff',
    info: '#1f5f86',
    'on-info': '#ffffff',
    'on-background': '#23201b',
    'on-surface': '#23201b',
    muted: '#5c574e',
  },
  variables: { 'border-color': '#5c574e', 'medium-emphasis-opacity': 0.78 },
}

export const slipwayDark: ThemeDefinition = {
  dark: true,
  colors: {
    background: '#151a1c',
    surface: '#1f2629',
    'surface-variant': '#2c3538',
    'on-surface-variant': '#e3ddd2',
    primary: '#74c6d3',
    'on-primary': '#06282f',
    secondary: '#f5bd45',
    'on-secondary': '#241a05',
    error: '#ef8a80',
    'on-error': '#2a0d0a',
    success: '#84c99a',
    'on-success': '#0d2414',
    warning: '#f0b458',
    'on-warning': '#241a05',
    info: '#82bde6',
    'on-info': '#0a2130',
    'on-background': '#ece6dc',
    'on-surface': '#ece6dc',
    muted: '#b8b0a4',
  },
  variables: { 'border-color': '#b8b0a4', 'medium-emphasis-opacity': 0.8 },
}

export const THEME_STORAGE_KEY = 'slipway.theme'
export type ThemeName = 'slipwayLight' | 'slipwayDark'

export function preferredTheme(): ThemeName {
  const saved = browserStorage('localStorage').getItem(THEME_STORAGE_KEY)
  if (saved === 'slipwayLight' || saved === 'slipwayDark') return saved
  const dark = typeof matchMedia === 'function' && matchMedia('(prefers-color-scheme: dark)').matches
  return dark ? 'slipwayDark' : 'slipwayLight'
}

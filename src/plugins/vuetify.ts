// Vuetify, tree-shaken by vite-plugin-vuetify (autoImport); SVG icons from @mdi/js, no icon font.
import 'vuetify/styles'
import '@fontsource/atkinson-hyperlegible/latin-400.css'
import '@fontsource/atkinson-hyperlegible/latin-700.css'
import { createVuetify } from 'vuetify'
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg'
import { preferredTheme, slipwayDark, slipwayLight } from './theme'

export default createVuetify({
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  theme: {
    defaultTheme: preferredTheme(),
    themes: { slipwayLight, slipwayDark },
  },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VFileInput: { variant: 'outlined', density: 'comfortable' },
    VCard: { rounded: 'lg' },
    VBtn: { rounded: 'lg' },
  },
})

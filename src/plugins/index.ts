// One place that wires the app's plugins, so main.ts stays a few lines.
import type { App } from 'vue'
import { createPinia } from 'pinia'
import vuetify from './vuetify'
import router from '@/router'
import '@/styles/main.css'

export function registerPlugins(app: App) {
  app.use(createPinia())
  app.use(vuetify)
  app.use(router)
}

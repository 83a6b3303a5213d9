/** Client entry: Vue app with router, Pinia and PrimeVue in Cavitrace's own theme. */
import { createApp } from 'vue'
import { createPinia } from 'pinia'
import PrimeVue from 'primevue/config'
import App from './App.vue'
import { router } from './router'
import { cavitraceTheme } from './theme'
import './styles/main.css'

const app = createApp(App)
app.use(createPinia())
app.use(router)
app.use(PrimeVue, { theme: { preset: cavitraceTheme, options: { darkModeSelector: '.ct-dark', cssLayer: false } } })
app.mount('#app')

import { createApp } from 'vue'
import { createPinia } from 'pinia'
import PrimeVue from 'primevue/config'
import ToastService from 'primevue/toastservice'
import ConfirmationService from 'primevue/confirmationservice'
import '@fontsource/inter/400.css'
import '@fontsource/inter/500.css'
import '@fontsource/inter/600.css'
import 'primeicons/primeicons.css'
import './assets/base.css'
import App from './App.vue'
import { router } from './router'
import { endplatePreset } from './theme/preset'

createApp(App)
  .use(createPinia())
  .use(router)
  .use(PrimeVue, { theme: { preset: endplatePreset, options: { darkModeSelector: '.ep-dark' } } })
  .use(ToastService)
  .use(ConfirmationService)
  .mount('#app')

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
import { pageCspNonce } from './utils/csp-nonce'

createApp(App)
  .use(createPinia())
  .use(router)
  .use(PrimeVue, {
    theme: { preset: endplatePreset, options: { darkModeSelector: '.ep-dark' } },
    // The <style> tags PrimeVue injects carry the page's nonce; the server allows no other.
    csp: { nonce: pageCspNonce() },
  })
  .use(ToastService)
  .use(ConfirmationService)
  .mount('#app')

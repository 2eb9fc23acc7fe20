import { computed, onMounted, onUnmounted, ref } from 'vue'
import { useRouter } from 'vue-router'
import { useSessionStore } from '@/stores/session'
import { idlePhase, type IdlePhase } from '@/session/idle-phase'

const ACTIVITY_EVENTS = ['pointerdown', 'pointermove', 'keydown', 'wheel', 'touchstart'] as const
/** While the user works, the server hears from the browser at least this often (renewal). */
const KEEP_ALIVE_MS = 5 * 60_000

/**
 * Signs the browser out after the site's idle limit without mouse or keyboard, with a one-minute
 * warning first: an unattended workstation does not stay signed in to patient data. Activity
 * also reaches the server now and then, so a session in use is renewed even while the user
 * only measures on screen.
 */
export function useIdleSignOut() {
  const session = useSessionStore()
  const router = useRouter()
  const lastActivityMs = ref(Date.now())
  const nowMs = ref(Date.now())
  let lastKeepAliveMs = Date.now()
  let timer: ReturnType<typeof setInterval> | undefined
  let signingOut = false

  const idleLimitMs = computed(() => (session.session?.idleSignOutMinutes ?? 30) * 60_000)
  const phase = computed<IdlePhase>(() =>
    idlePhase(nowMs.value - lastActivityMs.value, idleLimitMs.value),
  )

  function noteActivity(): void {
    // The warning is answered with its button only, so a stray mouse move does not hide it.
    if (phase.value.kind === 'warning') return
    lastActivityMs.value = Date.now()
    if (session.isSignedIn && Date.now() - lastKeepAliveMs > KEEP_ALIVE_MS) {
      lastKeepAliveMs = Date.now()
      void session.refresh().catch(() => undefined)
    }
  }

  /** "Stay signed in" in the warning. */
  function carryOn(): void {
    lastActivityMs.value = Date.now()
    nowMs.value = Date.now()
    lastKeepAliveMs = Date.now()
    void session.refresh().catch(() => undefined)
  }

  async function tick(): Promise<void> {
    nowMs.value = Date.now()
    if (!session.isSignedIn) {
      lastActivityMs.value = nowMs.value
      return
    }
    if (phase.value.kind !== 'expired' || signingOut) return
    signingOut = true
    try {
      await session.logout().catch(() => undefined)
      await router.push({ name: 'sign-in', query: { idle: '1' } })
    } finally {
      signingOut = false
      lastActivityMs.value = Date.now()
    }
  }

  onMounted(() => {
    for (const name of ACTIVITY_EVENTS)
      window.addEventListener(name, noteActivity, { passive: true, capture: true })
    timer = setInterval(() => void tick(), 1000)
  })
  onUnmounted(() => {
    for (const name of ACTIVITY_EVENTS)
      window.removeEventListener(name, noteActivity, { capture: true })
    clearInterval(timer)
  })

  return { phase, carryOn }
}

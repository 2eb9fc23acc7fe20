/// <reference lib="webworker" />
/**
 * Corner suggestion off the main thread: the film's full-depth pixels once, then one answer
 * per click (see corner-suggestion-protocol.ts for the messages).
 */
import {
  createCornerSuggestionHandler,
  type CornerWorkerRequest,
} from './corner-suggestion-protocol'

const handle = createCornerSuggestionHandler()

self.onmessage = (event: MessageEvent<CornerWorkerRequest>) => {
  ;(self as DedicatedWorkerGlobalScope).postMessage(handle(event.data))
}

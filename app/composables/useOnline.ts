/**
 * Whether the browser thinks it has a connection (navigator.onLine), kept up to date by the
 * online/offline events: @vueuse/core's, under the name the pages already use. True during server
 * rendering. A phone can say "online" with no real signal, so a send that fails with a network
 * error is also treated as offline (stores/visitDraft).
 */
export { useOnline } from '@vueuse/core'

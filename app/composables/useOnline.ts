/**
 * Whether the browser thinks it has a connection (navigator.onLine), kept up to date by the
 * online/offline events. True during server rendering. A phone can say "online" with no real
 * signal, so a send that fails with a network error is also treated as offline (stores/visitDraft).
 */
export function useOnline() {
  const online = ref(true)
  const update = () => {
    online.value = navigator.onLine
  }
  onMounted(() => {
    update()
    window.addEventListener('online', update)
    window.addEventListener('offline', update)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('online', update)
    window.removeEventListener('offline', update)
  })
  return readonly(online)
}

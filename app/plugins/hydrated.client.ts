// Marks <html data-hydrated> once Vue has taken over the server-rendered page: until then a tap or
// typed text can be lost. The browser tests wait for it; it costs nothing otherwise.
export default defineNuxtPlugin((nuxtApp) => {
  nuxtApp.hook('app:suspense:resolve', () => {
    document.documentElement.dataset.hydrated = 'true'
  })
})

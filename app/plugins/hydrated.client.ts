/** Marks the page once Vue has hydrated it, so a browser test acts only when the handlers are attached. */
export default defineNuxtPlugin((nuxtApp) => {
  nuxtApp.hook('app:suspense:resolve', () => {
    document.documentElement.dataset.hydrated = 'true'
  })
})

import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

const require = createRequire(import.meta.url)
const nextAuthCore = join(dirname(dirname(require.resolve('next-auth/jwt'))), 'core', 'index.js')
const root = dirname(fileURLToPath(import.meta.url))

export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', '@sidebase/nuxt-auth'],
  css: [
    '@fontsource-variable/atkinson-hyperlegible-next/index.css',
    '@fontsource-variable/fraunces/index.css',
    '~/assets/css/main.css',
  ],
  app: {
    head: {
      htmlAttrs: { lang: 'en-GB' },
      title: 'Bloomline',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'description', content: 'Coat work, readiness and show plans for kennels that campaign hand-stripped dogs.' },
        { name: 'theme-color', content: '#24463a' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    authSecret: '',
    public: { version: '0.1.0', demoMode: false },
  },
  auth: {
    isEnabled: true,
    originEnvKey: 'AUTH_ORIGIN',
    baseURL: '/api/auth',
    provider: { type: 'authjs', trustHost: false },
    sessionRefresh: { enableOnWindowFocus: true, enablePeriodically: false },
    globalAppMiddleware: { isEnabled: true, addDefaultCallbackUrl: true },
  },
  tailwindcss: { cssPath: '~/assets/css/main.css', viewer: false },
  nitro: {
    alias: { 'next-auth/core': join(root, 'server/shims/next-auth-core.ts') },
    externals: { traceInclude: [nextAuthCore] },
  },
  typescript: { strict: true },
})

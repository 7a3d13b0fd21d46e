import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

const root = fileURLToPath(new URL('.', import.meta.url))

export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias: { '#shared': `${root}shared` } },
        test: {
          name: 'unit',
          environment: 'node',
          include: ['tests/unit/**/*.test.ts'],
        },
      },
      await defineVitestProject({
        test: {
          name: 'nuxt',
          environment: 'nuxt',
          // Components are tested without the sign-in module, which would call a server that is not there.
          environmentOptions: { nuxt: { overrides: { auth: { isEnabled: false } } } },
          include: ['tests/nuxt/**/*.test.ts'],
        },
      }),
      {
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/e2e/setup/global.ts'],
          testTimeout: 60_000,
          // Pages settle over a few requests on a busy two-core machine; 1 s (the default) is too tight.
          expect: { poll: { timeout: 10_000 } },
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
})

import { mockNuxtImport, mountSuspended } from '@nuxt/test-utils/runtime'
import { describe, expect, it } from 'vitest'
import { computed, ref } from 'vue'
import LayoutNav from '~/components/layout/LayoutNav.vue'

const role = ref<'manager' | 'handler' | 'assistant'>('manager')
mockNuxtImport('useCaller', () => () => ({ role: computed(() => role.value), session: computed(() => null) }))

describe('LayoutNav', () => {
  it.each([
    // The demo mailbox shows only in demo mode, which `npm test` turns on (NUXT_PUBLIC_DEMO_MODE).
    ['manager', ['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Coat profiles', 'Team', 'Weekly status', 'Mail log', ...(process.env.NUXT_PUBLIC_DEMO_MODE === 'true' ? ['Demo mailbox'] : []), 'Organisation']],
    ['assistant', ['My tasks', 'Home', 'Dogs']],
  ] as const)('renders the links a %s may use, each a real link', async (r, labels) => {
    role.value = r
    const wrapper = await mountSuspended(LayoutNav)
    const links = wrapper.findAll('a')
    expect(links.map(a => a.text())).toEqual(labels)
    expect(links.every(a => a.attributes('href')?.startsWith('/'))).toBe(true)
  })
})

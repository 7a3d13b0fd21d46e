import { defineStore } from 'pinia'
import type { SortingState } from '@tanstack/vue-table'

/** Which show the grid is assessed for: one show by id, or each dog's own next show. */
export type GridShowChoice = 'next' | number

/** The coat grid's chosen show, filters, search and sort; kept while the user visits other pages. */
export const useGridStore = defineStore('grid', () => {
  const show = ref<GridShowChoice>('next')
  /** A handler's member id, 'none' for dogs with no handler, null for everyone. */
  const handler = ref<number | 'none' | null>(null)
  const breed = ref<string | null>(null)
  /** With each dog's next show: only dogs whose next show is this one ('none': no show ahead). */
  const nextShow = ref<number | 'none' | null>(null)
  const onTrack = ref<'yes' | 'no' | null>(null)
  const search = ref('')
  const sorting = ref<SortingState>([])

  const filtering = computed(() =>
    handler.value !== null || breed.value !== null || onTrack.value !== null || search.value.trim() !== ''
    || (show.value === 'next' && nextShow.value !== null))

  /** Clears the filters and the search; the chosen show and the sort stay. */
  function clearFilters() {
    handler.value = null
    breed.value = null
    nextShow.value = null
    onTrack.value = null
    search.value = ''
  }

  return { show, handler, breed, nextShow, onTrack, search, sorting, filtering, clearFilters }
})

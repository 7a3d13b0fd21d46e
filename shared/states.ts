import type { RegionState } from './coat'

/** How a region state reads in the interface: a word, a shape and a colour, so it reads without colour too. */
export interface StateLook {
  word: string
  /** A shape of our own, drawn by CoatStateBadge. */
  shape: 'ring-dashed' | 'square-open' | 'circle-half' | 'circle-full' | 'triangle-down'
  /** Tailwind classes for the chip: background, text, border (text meets WCAG AA on the background). */
  chip: string
  /** The colour of the shape and of charts. */
  colour: string
  hint: string
}

export const STATE_LOOKS: Record<RegionState, StateLook> = {
  'no-record': { word: 'No record', shape: 'ring-dashed', chip: 'bg-oat-100 text-oat-800 border-oat-300', colour: '#7a6d53', hint: 'No strip or layer logged for this region yet' },
  'bare': { word: 'Bare', shape: 'square-open', chip: 'bg-ember-100 text-ember-700 border-ember-300', colour: '#c4562a', hint: 'Hair has not broken the skin yet on the show day' },
  'coming-in': { word: 'Coming in', shape: 'circle-half', chip: 'bg-amber-50 text-amber-900 border-amber-300', colour: '#b7791f', hint: 'Growing, but short of show length on the show day' },
  'in-bloom': { word: 'In bloom', shape: 'circle-full', chip: 'bg-moss-50 text-moss-800 border-moss-300', colour: '#2d5f45', hint: 'At show length on the show day' },
  'past-peak': { word: 'Past peak', shape: 'triangle-down', chip: 'bg-heather-100 text-heather-700 border-heather-300', colour: '#8e5a8c', hint: 'Grown past its best by the show day' },
}

/** States in the order they are listed in legends and filters. */
export const STATE_ORDER: readonly RegionState[] = ['in-bloom', 'coming-in', 'past-peak', 'bare', 'no-record']

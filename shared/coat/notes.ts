import type { CoatProfile, ISODate, RegionProfile, Unreachable } from './types'

/** Joins words as people write them: "a", "a and b", "a, b and c". */
export function listWords(words: readonly string[]): string {
  if (words.length <= 1) return words[0] ?? ''
  return `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`
}

// Labels are lower-cased in running text; a plan names the same few labels over and over.
const lowerLabels = new Map<string, string>()
function lower(label: string): string {
  let text = lowerLabels.get(label)
  if (text === undefined) {
    if (lowerLabels.size >= 1024) lowerLabels.clear()
    lowerLabels.set(label, (text = label.toLowerCase()))
  }
  return text
}

function named(regions: readonly RegionProfile[]): string {
  let text = 'the '
  for (let i = 0; i < regions.length; i++) {
    text += (i === 0 ? '' : i === regions.length - 1 ? ' and ' : ', ') + lower(regions[i]!.label)
  }
  return text
}

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat']
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']
const dayWordsCache = new Map<string, string>()

/** A calendar date as people read it in a note: `2026-12-07` is "Mon 7 Dec 2026". */
export function dayWords(date: ISODate): string {
  let text = dayWordsCache.get(date)
  if (text === undefined) {
    const [y, m, d] = date.split('-').map(Number) as [number, number, number]
    text = `${WEEKDAYS[new Date(Date.UTC(y, m - 1, d)).getUTCDay()]} ${d} ${MONTHS[m - 1]} ${y}`
    if (dayWordsCache.size >= 4096) dayWordsCache.clear()
    dayWordsCache.set(date, text)
  }
  return text
}

const showWords = (shows: readonly ISODate[]): string => `the show${shows.length > 1 ? 's' : ''} on ${listWords(shows.map(dayWords))}`

export interface LastDay {
  date: ISODate
  regions: RegionProfile[]
}

/** Why a layer step is there, and the last day each of its regions may be touched, slowest first. */
export function layerNote(date: ISODate, regions: readonly RegionProfile[], shows: readonly ISODate[], lastDays: readonly LastDay[], noBath: boolean): string {
  const parts = [`Take a serious layer off ${named(regions)} so the new coat is in bloom for ${showWords(shows)}.`]
  const [slowest, ...rest] = lastDays
  if (slowest) {
    parts.push(slowest.date === date
      ? `This is the last day to touch ${named(slowest.regions)} for ${shows.length > 1 ? 'these shows' : 'this show'}.`
      : `The last day to touch ${named(slowest.regions)} is ${dayWords(slowest.date)}.`)
  }
  if (rest.length) parts.push(`For ${rest.map((d) => `${named(d.regions)} it is ${dayWords(d.date)}`).join('; for ')}.`)
  if (noBath) parts.push('No bath first: this work cannot wait a day for one, so work the coat as it is.')
  return parts.join(' ')
}

/** Why a bath step is there, with the last day for the slowest region of the session it prepares. */
export function bathNote(sessionDate: ISODate, slowest: LastDay): string {
  return `Bath the dog so the coat stands up for the layer on ${dayWords(sessionDate)}: work it within a day or two of a bath. The last day to touch ${named(slowest.regions)} is ${dayWords(slowest.date)}.`
}

/** Why a roll step is there. */
export function rollNote(regions: readonly RegionProfile[], show: ISODate): string {
  return `Roll ${named(regions)}, taking only the longest hairs: the coat there passes its best before the show on ${dayWords(show)}, and rolling about every three weeks keeps it tight until the next coat comes through.`
}

/** Plain words for a (show, region) pair the plan cannot bring into bloom. */
export function unreachableNote(profile: CoatProfile, item: Unreachable): string {
  const region = profile.regions.find((r) => r.key === item.region)
  const label = region ? lower(region.label) : item.region
  return `The show on ${dayWords(item.showDate)} is too close for the ${label} to be in bloom: the last day to take a layer off it was ${dayWords(item.lastUsefulDate)}.`
}

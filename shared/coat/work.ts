import { toDayNumber } from './dates'
import type { CoatWork, WorkKind } from './types'

export const WORK_KINDS: readonly WorkKind[] = ['strip', 'layer', 'roll', 'card', 'bath', 'trim']

const KINDS = new Set<string>(WORK_KINDS)

/** Whether a value is one of the work kinds. */
export function isWorkKind(value: unknown): value is WorkKind {
  return typeof value === 'string' && KINDS.has(value)
}

/**
 * A region's clock: the days of its `strip` and `layer` work, ascending, each coded as
 * day * 2 + (1 for a strip), so one numeric sort keeps the strip flag with its day:
 * `code >> 1` is the day, `code & 1` the flag (written out where read, as these loops are hot).
 */
export type RegionClock = number[]

export interface ReadWork {
  /** One clock per key asked for, in the same order. */
  clocks: RegionClock[]
  /** The latest entry of any kind, or null when there is no work. */
  latest: { day: number; kind: WorkKind } | null
}

/** Sorts a clock in place (insertion sort: clocks hold a handful of entries, where it beats Array.prototype.sort). */
export function sortClock(clock: RegionClock): void {
  for (let i = 1; i < clock.length; i++) {
    const code = clock[i]!
    let j = i - 1
    while (j >= 0 && clock[j]! > code) {
      clock[j + 1] = clock[j]!
      j--
    }
    clock[j + 1] = code
  }
}

/** The clocks of the given regions (other regions and kinds left out); throws an Error naming an unknown kind or a malformed date. */
export function readWork(work: readonly CoatWork[], keys: readonly string[]): ReadWork {
  const index = new Map<string, number>()
  const clocks: RegionClock[] = new Array(keys.length)
  for (let i = 0; i < keys.length; i++) {
    clocks[i] = []
    index.set(keys[i]!, i)
  }
  let latest: ReadWork['latest'] = null
  for (let i = 0; i < work.length; i++) {
    const entry = work[i]!
    const kind = entry.kind
    if (!isWorkKind(kind)) {
      throw new Error(`Unknown coat work kind ${JSON.stringify(kind)} on ${String(entry.date)}: expected one of ${WORK_KINDS.join(', ')}`)
    }
    const day = toDayNumber(entry.date)
    if (!Array.isArray(entry.regions)) throw new Error(`Coat work ${kind} on ${entry.date} has no list of regions`)
    if (latest === null || day > latest.day) latest = { day, kind }
    if (kind !== 'strip' && kind !== 'layer') continue
    const code = day * 2 + (kind === 'strip' ? 1 : 0)
    const named = entry.regions
    for (let r = 0; r < named.length; r++) {
      const at = index.get(named[r]!)
      if (at !== undefined) clocks[at]!.push(code)
    }
  }
  for (const clock of clocks) sortClock(clock)
  return { clocks, latest }
}

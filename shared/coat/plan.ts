import { fromDayNumber, toDayNumber } from './dates'
import { bathNote, layerNote, rollNote, type LastDay } from './notes'
import { checkProfile } from './profile'
import { anchorDay, bloomAnchor } from './readiness'
import type { CoatProfile, CoatWork, ISODate, PlanStep, RegionProfile, Unreachable, WorkBackPlan, WorkKind } from './types'
import { readWork, sortClock, type RegionClock } from './work'

// DESIGN.md §4: tight regions are kept tight with roll passes about every three weeks.
export const ROLL_INTERVAL_DAYS = 21
// A roll may come up to a week early, so that regions whose peaks end days apart share a day.
export const ROLL_EARLY_DAYS = 7

const KIND_ORDER: Record<WorkKind, number> = { layer: 0, strip: 1, roll: 2, card: 3, trim: 4, bath: 5 }

interface Need {
  region: number
  /** Earliest useful day for the layer: the window's start, or today. */
  from: number
  /** Last useful day: the show less sprout and growth. */
  until: number
}

/** One planned layer: a region, a day, and the shows it brings into bloom. */
interface Layer {
  region: number
  day: number
  shows: number[]
}

const leadDays = (region: RegionProfile): number => region.sproutDays + region.growDays
const byDay = (a: number, b: number): number => a - b

// How the plan is built, and why it holds:
// - Only layers are proposed, and a new layer never spoils a show already in bloom: a show's
//   anchor is the latest pull on or before its last useful day, so a newer pull lands either
//   after that day (no effect) or between the old anchor and it (still inside the window). A
//   strip could spoil an earlier show, so the plan never proposes one.
// - So each (show, region) pair not yet in bloom is one need: a window [from, until], from its
//   start (or today) to its last useful day. The fewest session days that put one day in every
//   window come from the earliest-deadline greedy, which is optimal for intervals.
// - Each region then takes, need by need, a session day in that need's window that covers as
//   many of its later needs as any day could, so one layer serves every show it can.
// - Existing strips need no special case: all existing work is on or before today, and a strip
//   only spoils a show when it falls after that show's last useful day, so such a show is
//   already out of reach (and listed); a strip on or before that day is itself a pull.
/** The dated steps that bring a dog into bloom for its shows, and the pairs already too close. */
export function planWorkBack(profile: CoatProfile, work: CoatWork[], showDates: ISODate[], today: ISODate): WorkBackPlan {
  checkProfile(profile)
  const now = toDayNumber(today)
  const regions = profile.regions
  const { clocks, latest } = readWork(work, regions.map((r) => r.key))
  // A pull logged after today could be a strip that spoils a show no layer can rescue; the
  // plan starts from work already done, so such an entry is an input error.
  if (latest && latest.day > now) throw new Error(`Coat work ${latest.kind} dated ${fromDayNumber(latest.day)} is after today ${today}: plan from work already done`)
  const shows = [...new Set(showDates.map(toDayNumber))].sort(byDay)

  const unreachable: Unreachable[] = []
  const needs: Need[] = []
  for (const show of shows) {
    for (let i = 0; i < regions.length; i++) {
      const region = regions[i]!
      if (!Number.isNaN(bloomAnchor(clocks[i]!, show, region))) continue
      const until = show - leadDays(region)
      if (until < now) unreachable.push({ showDate: fromDayNumber(show), region: region.key, lastUsefulDate: fromDayNumber(until) })
      else needs.push({ region: i, from: Math.max(now, until - region.holdDays), until })
    }
  }
  needs.sort((a, b) => a.until - b.until || a.from - b.from)

  const sessions = sessionDays(needs)
  const needsByRegion = regions.map(() => [] as Need[])
  for (const need of needs) needsByRegion[need.region]!.push(need)
  const layers: Layer[] = []
  const gaps: RollGap[] = []
  for (let i = 0; i < regions.length; i++) {
    const region = regions[i]!
    const days = regionLayers(needsByRegion[i]!, sessions)
    let clock = clocks[i]!
    if (days.length) {
      clock = clock.concat(days.map((d) => d * 2))
      sortClock(clock)
    }
    const anchors: number[] = new Array(shows.length)
    for (let s = 0; s < shows.length; s++) anchors[s] = bloomAnchor(clock, shows[s]!, region)
    for (const day of days) {
      const served: number[] = []
      for (let s = 0; s < shows.length; s++) if (anchors[s] === day) served.push(shows[s]!)
      layers.push({ region: i, day, shows: served })
    }
    rollGaps(region, i, clock, shows, anchors, now, gaps)
  }

  const steps = [...sessionSteps(regions, layers, now), ...rollSteps(regions, layers, gaps, shows)]
  steps.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : KIND_ORDER[a.kind] - KIND_ORDER[b.kind]))
  return { steps, unreachable }
}

// The fewest days that put one day inside every need's window (needs sorted by deadline).
function sessionDays(needs: readonly Need[]): number[] {
  const done = new Uint8Array(needs.length)
  const days: number[] = []
  for (let i = 0; i < needs.length; i++) {
    if (done[i]) continue
    const until = needs[i]!.until
    let from = needs[i]!.from
    for (let j = i; j < needs.length; j++) {
      if (!done[j] && needs[j]!.from <= until) {
        done[j] = 1
        from = Math.max(from, needs[j]!.from)
      }
    }
    // Every window in this session holds all of [from, until]: take the middle (the later of
    // two), so a day's slip either way still works. That is today only when until is today,
    // so otherwise there is always a day left for the bath.
    days.push(until - Math.floor((until - from) / 2))
  }
  return days
}

// For each need still open (earliest deadline first), the latest session day in it covers the
// most later needs; any session day from the latest start among those needs covers the same
// ones, so take the one nearest the middle of what they allow.
function regionLayers(needs: readonly Need[], sessions: readonly number[]): number[] {
  const days: number[] = []
  for (let i = 0; i < needs.length; i++) {
    const need = needs[i]!
    const last = days[days.length - 1]
    if (last !== undefined && last >= need.from) continue
    let latest = -Infinity
    for (const day of sessions) if (day >= need.from && day <= need.until) latest = day
    let from = need.from
    for (let j = i; j < needs.length; j++) if (needs[j]!.from <= latest) from = Math.max(from, needs[j]!.from)
    const middle = (from + need.until) / 2
    let best = latest
    for (const day of sessions) {
      if (day >= from && day <= need.until && Math.abs(day - middle) < Math.abs(best - middle)) best = day
    }
    days.push(best)
  }
  return days
}

// One layer step per (day, set of shows), so every region of a step is inside every show's
// window, and a bath the day before each session day. A session that has to be today gets no
// bath: the bath would have to be yesterday, and a same-day bath leaves no time for the coat
// to stand up, which is the bath's whole point.
function sessionSteps(regions: readonly RegionProfile[], layers: readonly Layer[], now: number): PlanStep[] {
  const sessions = new Map<number, { shows: number[]; regions: RegionProfile[] }[]>()
  for (const layer of layers) {
    let groups = sessions.get(layer.day)
    if (!groups) sessions.set(layer.day, (groups = []))
    let group = groups.find((g) => sameDays(g.shows, layer.shows))
    if (!group) groups.push((group = { shows: layer.shows, regions: [] }))
    group.regions.push(regions[layer.region]!)
  }
  const wholeDog = regions.map((r) => r.key)
  const steps: PlanStep[] = []
  for (const [day, groups] of sessions) {
    const date = fromDayNumber(day)
    const served = new Set<number>()
    let slowest: LastDay | undefined
    for (const group of groups) {
      const forShows = group.shows.map(fromDayNumber)
      for (const show of group.shows) served.add(show)
      const last = lastDays(group.regions, group.shows[0]!)
      if (!slowest || last[0]!.date < slowest.date) slowest = last[0]
      steps.push({ date, kind: 'layer', regions: group.regions.map((r) => r.key), forShows, note: layerNote(date, group.regions, forShows, last, day === now) })
    }
    if (day > now) {
      const forShows = [...served].sort(byDay).map(fromDayNumber)
      steps.push({ date: fromDayNumber(day - 1), kind: 'bath', regions: wholeDog, forShows, note: bathNote(date, slowest!) })
    }
  }
  return steps
}

function sameDays(a: readonly number[], b: readonly number[]): boolean {
  if (a.length !== b.length) return false
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false
  return true
}

// The last useful day of each region for the earliest show of a step, slowest first.
function lastDays(regions: readonly RegionProfile[], firstShow: number): LastDay[] {
  const days = new Map<number, RegionProfile[]>()
  for (const region of regions) {
    const day = firstShow - leadDays(region)
    const list = days.get(day)
    if (list) list.push(region)
    else days.set(day, [region])
  }
  return [...days].sort((a, b) => a[0] - b[0]).map(([day, rs]) => ({ date: fromDayNumber(day), regions: rs }))
}

interface RollGap {
  region: number
  /** First day a roll is useful: the last day at its best, or today. */
  start: number
  /** First day it is no longer useful: the next bloom starts, or the last show comes. */
  end: number
}

// Where a region's bloom for one show ends before a later show, the days from the last day at
// its best until the next bloom starts (or the last show): the stretch that roll passes keep tight.
function rollGaps(region: RegionProfile, index: number, clock: RegionClock, shows: readonly number[], anchors: readonly number[], now: number, gaps: RollGap[]): void {
  const lastShow = shows[shows.length - 1]!
  const lead = leadDays(region)
  let handled = Number.NaN
  for (const anchor of anchors) {
    // Shows come in order, so a bloom that serves several of them comes up back to back.
    if (Number.isNaN(anchor) || anchor === handled) continue
    handled = anchor
    const bloomEnd = anchor + lead + region.holdDays
    if (bloomEnd >= lastShow) continue
    // A later bloom that follows straight on (or a strip) leaves nothing to keep tight: past
    // its peak the day after means that day's anchor is still this one.
    if (anchorDay(clock, bloomEnd + 1, region.sproutDays, region.growDays) !== anchor) continue
    let end = lastShow
    for (const code of clock) {
      const day = code >> 1
      if (day > handled) end = Math.min(end, code & 1 ? day : day + lead)
    }
    // Under a week past its best before the next coat is through is not worth a pass.
    if (end - (bloomEnd + 1) < ROLL_EARLY_DAYS) continue
    const start = Math.max(now, bloomEnd)
    if (start < end) gaps.push({ region: index, start, end })
  }
}

// Roll days shared between regions: the first pass within a week of a region's last day at
// its best, then every two to three weeks ("about every three weeks", DESIGN.md §4), each day
// taken as late as the most pressing region allows so that others can join it.
function rollSteps(regions: readonly RegionProfile[], layers: readonly Layer[], gaps: readonly RollGap[], shows: readonly number[]): PlanStep[] {
  if (!gaps.length) return []
  const layerDays = regions.map(() => [] as number[])
  for (const layer of layers) layerDays[layer.region]!.push(layer.day)
  const pending = gaps.map((gap) => ({ gap, open: gap.start, due: Math.min(gap.start + ROLL_EARLY_DAYS, gap.end - 1) }))
  const rolls = new Map<number, Set<number>>()
  while (pending.length) {
    let day = Infinity
    for (const p of pending) day = Math.min(day, p.due)
    const members = rolls.get(day) ?? new Set<number>()
    rolls.set(day, members)
    for (let i = pending.length - 1; i >= 0; i--) {
      const p = pending[i]!
      if (p.open > day) continue
      if (!layerDays[p.gap.region]!.includes(day)) members.add(p.gap.region)
      p.open = day + ROLL_INTERVAL_DAYS - ROLL_EARLY_DAYS
      p.due = Math.min(day + ROLL_INTERVAL_DAYS, p.gap.end - 1)
      // No further pass when the next coat is through within three weeks of this one.
      if (day + ROLL_INTERVAL_DAYS >= p.gap.end) pending.splice(i, 1)
    }
  }
  const steps: PlanStep[] = []
  for (const [day, members] of rolls) {
    if (!members.size) continue
    const rolled = regions.filter((_, i) => members.has(i))
    const show = fromDayNumber(shows.find((s) => s > day)!)
    steps.push({ date: fromDayNumber(day), kind: 'roll', regions: rolled.map((r) => r.key), forShows: [show], note: rollNote(rolled, show) })
  }
  return steps
}

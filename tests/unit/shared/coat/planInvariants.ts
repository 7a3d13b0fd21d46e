import { addDays, assessDog, assessRegion, dayWords } from '../../../../shared/coat'
import type { CoatProfile, CoatWork, ISODate, RegionProfile, WorkBackPlan } from '../../../../shared/coat'

const lead = (r: RegionProfile): number => r.sproutDays + r.growDays

/** The (show, region) pairs the existing work leaves out of bloom with a layer still possible: [from, until]. */
export function openNeeds(profile: CoatProfile, work: CoatWork[], shows: ISODate[], today: ISODate): { region: string; show: ISODate; from: ISODate; until: ISODate }[] {
  const needs = []
  for (const show of new Set(shows)) {
    for (const r of profile.regions) {
      if (assessRegion(r, work, show).state === 'in-bloom') continue
      const until = addDays(show, -lead(r))
      if (until < today) continue
      const start = addDays(until, -r.holdDays)
      needs.push({ region: r.key, show, from: start > today ? start : today, until })
    }
  }
  return needs
}

/** The most needs no one day can share: by interval duality, the fewest sessions any plan needs. */
export function fewestSessions(needs: { from: ISODate; until: ISODate }[]): number {
  let count = 0
  let last = ''
  for (const need of [...needs].sort((a, b) => (a.until < b.until ? -1 : a.until > b.until ? 1 : 0))) {
    if (need.from > last) {
      count++
      last = need.until
    }
  }
  return count
}

/** Every way a plan breaks the rules of issue 3, in words; empty when it keeps them all. */
export function planViolations(profile: CoatProfile, work: CoatWork[], shows: ISODate[], today: ISODate, plan: WorkBackPlan): string[] {
  const bad: string[] = []
  const region = new Map(profile.regions.map((r) => [r.key, r]))
  const after: CoatWork[] = [...work, ...plan.steps.map((s) => ({ date: s.date, kind: s.kind, regions: s.regions }))]
  const unreachable = new Set(plan.unreachable.map((u) => `${u.showDate}|${u.region}`))
  const showSet = [...new Set(shows)].sort()
  // Per region, only the work that can touch it: the same answers, fewer entries to read.
  const own = new Map(profile.regions.map((r) => [r.key, after.filter((w) => w.regions.includes(r.key))]))
  const afterFor = (key: string): CoatWork[] => own.get(key)!

  if (unreachable.size !== plan.unreachable.length) bad.push('an unreachable pair is listed twice')
  for (let i = 1; i < plan.steps.length; i++) if (plan.steps[i]!.date < plan.steps[i - 1]!.date) bad.push('steps are not in date order')

  for (const step of plan.steps) {
    if (step.date < today) bad.push(`${step.kind} on ${step.date} is before today ${today}`)
    if (!step.regions.length || step.regions.some((k) => !region.has(k))) bad.push(`${step.kind} on ${step.date} has regions ${step.regions}`)
    if (!step.note.trim()) bad.push(`${step.kind} on ${step.date} has no note`)
    if (step.forShows.some((s) => !showSet.includes(s))) bad.push(`${step.kind} on ${step.date} names a show not asked for`)
    if (step.kind === 'strip') bad.push(`the plan proposes a strip on ${step.date}`)
    if (step.kind !== 'layer') continue
    if (!step.forShows.length) bad.push(`layer on ${step.date} serves no show`)
    for (const key of step.regions) {
      const r = region.get(key)!
      for (const show of step.forShows) {
        const until = addDays(show, -lead(r))
        if (step.date < addDays(until, -r.holdDays) || step.date > until) bad.push(`layer on ${key} ${step.date} is outside its window for ${show}`)
      }
    }
    const slowest = Math.max(...step.regions.map((k) => lead(region.get(k)!)))
    const lastDay = addDays(step.forShows[0]!, -slowest)
    if (!step.note.includes(lastDay === step.date ? 'This is the last day to touch' : `The last day to touch`) || (lastDay !== step.date && !step.note.includes(dayWords(lastDay)))) {
      bad.push(`layer on ${step.date} does not name the last day ${lastDay}: ${step.note}`)
    }
  }

  for (const show of showSet) {
    for (const r of profile.regions) {
      const pair = `${show}|${r.key}`
      const before = assessRegion(r, work, show)
      const state = assessRegion(r, afterFor(r.key), show)
      if (unreachable.has(pair)) {
        const u = plan.unreachable.find((x) => `${x.showDate}|${x.region}` === pair)!
        if (u.lastUsefulDate !== addDays(show, -lead(r))) bad.push(`${pair} has last useful date ${u.lastUsefulDate}`)
        if (u.lastUsefulDate >= today) bad.push(`${pair} is listed unreachable but its last useful date ${u.lastUsefulDate} is not before today`)
        if (before.state === 'in-bloom') bad.push(`${pair} is listed unreachable but the work already brings it into bloom`)
      } else if (state.state !== 'in-bloom') {
        bad.push(`${pair} is ${state.state} after the plan and not listed unreachable`)
      } else if (state.anchor! >= today && state.anchor !== before.anchor) {
        const step = plan.steps.find((s) => s.kind === 'layer' && s.date === state.anchor && s.regions.includes(r.key))
        if (!step?.forShows.includes(show)) bad.push(`the layer on ${r.key} ${state.anchor} brings ${show} into bloom but does not name it`)
      }
    }
    const weighed = profile.regions.some((r) => r.weight > 0)
    if (weighed && !plan.unreachable.some((u) => u.showDate === show) && !assessDog(profile, after, show).onTrack) {
      bad.push(`the dog is not on track for ${show} after the plan`)
    }
  }

  const sessions = [...new Set(plan.steps.filter((s) => s.kind === 'layer').map((s) => s.date))]
  const needed = fewestSessions(openNeeds(profile, work, shows, today))
  if (sessions.length !== needed) bad.push(`${sessions.length} layer sessions where ${needed} would do`)
  const baths = plan.steps.filter((s) => s.kind === 'bath').map((s) => s.date)
  for (const session of sessions) {
    const eve = addDays(session, -1)
    if (session > today && !baths.includes(eve)) bad.push(`no bath on ${eve} before the session on ${session}`)
    if (session === today && !plan.steps.some((s) => s.date === session && s.kind === 'layer' && s.note.includes('No bath'))) {
      bad.push(`the session today ${session} does not say it goes without a bath`)
    }
    const forced = plan.steps.some((s) => s.date === session && s.kind === 'layer' && s.regions.some((k) => addDays(s.forShows[0]!, -lead(region.get(k)!)) === today))
    if (session === today && !forced) bad.push(`the session is today ${session}, leaving no day for a bath, though no region's last day is today`)
  }
  for (const bath of baths) if (!sessions.includes(addDays(bath, 1))) bad.push(`bath on ${bath} comes before no session`)

  const rolls = plan.steps.filter((s) => s.kind === 'roll')
  const pulls = plan.steps.filter((s) => s.kind === 'roll' || s.kind === 'layer')
  for (const roll of rolls) {
    if (roll.forShows.length !== 1 || roll.forShows[0]! <= roll.date) bad.push(`roll on ${roll.date} is for no later show`)
    for (const key of roll.regions) {
      const state = assessRegion(region.get(key)!, afterFor(key), roll.date)
      if (!(state.state === 'past-peak' || (state.state === 'in-bloom' && state.bloomEnd === roll.date))) {
        bad.push(`roll on ${key} ${roll.date} while it is ${state.state}`)
      } else {
        // Under a week past its best before the next coat (or the last show) is not worth a pass.
        let pastPeak = 0
        for (let t = addDays(state.bloomEnd!, 1); t < showSet[showSet.length - 1]! && assessRegion(region.get(key)!, afterFor(key), t).state === 'past-peak'; t = addDays(t, 1)) pastPeak++
        if (pastPeak < 7) bad.push(`roll on ${key} ${roll.date} for a stretch of ${pastPeak} days past its peak`)
      }
    }
  }
  // Where a region's bloom for a show ends at least a week before the coat is in bloom again
  // and a later show is still to come, a roll (or a layer) on it is never more than three weeks
  // behind nor a week ahead (DESIGN.md §4: roll passes about every three weeks).
  const lastShow = showSet[showSet.length - 1]
  for (const r of profile.regions) {
    const anchors = new Set<string>()
    for (const show of showSet) {
      const bloom = assessRegion(r, afterFor(r.key), show)
      if (bloom.state !== 'in-bloom' || anchors.has(bloom.anchor!)) continue
      anchors.add(bloom.anchor!)
      let end = addDays(bloom.bloomEnd!, 1)
      while (end < lastShow! && assessRegion(r, afterFor(r.key), end).state === 'past-peak') end = addDays(end, 1)
      if (addDays(bloom.bloomEnd!, 7 + 1) > end) continue
      for (let t = bloom.bloomEnd! > today ? bloom.bloomEnd! : today; t < end; t = addDays(t, 1)) {
        const near = pulls.some((p) => p.regions.includes(r.key) && p.date >= addDays(t, -21) && p.date <= addDays(t, 7))
        if (!near) bad.push(`${r.key} is past its peak on ${t} before ${lastShow} with no roll near it`)
      }
    }
  }
  return bad
}

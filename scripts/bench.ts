import { performance } from 'node:perf_hooks'
import { addDays, assessDog, DEFAULT_PROFILE, planWorkBack } from '../shared/coat'
import type { CoatWork, WorkKind } from '../shared/coat'
import { median } from './lib/benchApp'
import { prng } from './lib/prng'

// Times the coat model the way the coat grid and the weekly status use it: assessDog for
// every (dog, show) and planWorkBack per dog, 10 regions, 5 shows and ~40 work entries a dog.

const TODAY = '2026-03-02'
const SHOWS_PER_DOG = 5
const RUNS = 5
const KEYS = DEFAULT_PROFILE.regions.map((r) => r.key)

interface Dog {
  work: CoatWork[]
  shows: string[]
}


function makeDogs(count: number, seed: number): Dog[] {
  const random = prng(seed)
  const int = (lo: number, hi: number) => lo + Math.floor(random() * (hi - lo + 1))
  const some = (min: number, max: number) => [...KEYS].sort(() => random() - 0.5).slice(0, int(min, max))
  // A year of sessions, as a kennel logs them: mostly layers and rolls, baths before work,
  // carding and trimming now and then, the odd strip to the skin.
  const kinds: [WorkKind, number][] = [['layer', 0.32], ['roll', 0.24], ['bath', 0.16], ['card', 0.12], ['trim', 0.1], ['strip', 0.06]]
  const kind = (): WorkKind => {
    let r = random()
    for (const [k, p] of kinds) if ((r -= p) < 0) return k
    return 'layer'
  }
  const dogs: Dog[] = []
  for (let i = 0; i < count; i++) {
    const work: CoatWork[] = []
    const entries = int(34, 46)
    for (let j = 0; j < entries; j++) {
      const k = kind()
      const regions = k === 'bath' ? KEYS : k === 'trim' ? ['head', 'ears', 'tail'] : some(1, 6)
      work.push({ date: addDays(TODAY, -int(0, 365)), kind: k, regions })
    }
    const shows = new Set<string>()
    while (shows.size < SHOWS_PER_DOG) shows.add(addDays(TODAY, int(7, 300)))
    dogs.push({ work, shows: [...shows].sort() })
  }
  return dogs
}

function runOnce(dogs: Dog[]): number {
  let sink = 0
  const start = performance.now()
  for (const dog of dogs) {
    for (const show of dog.shows) sink += assessDog(DEFAULT_PROFILE, dog.work, show).score
    sink += planWorkBack(DEFAULT_PROFILE, dog.work, dog.shows, TODAY).steps.length
  }
  const ms = performance.now() - start
  // Keeps the work observable so the engine cannot drop it.
  if (sink < 0) console.log(sink)
  return ms
}

const small = makeDogs(1_000, 1)
const large = makeDogs(10_000, 2)
const entries = small.reduce((n, d) => n + d.work.length, 0) / small.length

for (let i = 0; i < 3; i++) runOnce(small)
runOnce(large)

const rows = [small, large].map((dogs) => {
  const ms = median(Array.from({ length: RUNS }, () => runOnce(dogs)))
  return { dogs: dogs.length, ms, perDogUs: (ms * 1000) / dogs.length }
})

console.log('Bloomline coat bench: assessDog for every (dog, show) and planWorkBack per dog')
console.log(`${KEYS.length} regions, ${SHOWS_PER_DOG} shows and ${entries.toFixed(1)} work entries a dog (seeded); median of ${RUNS} runs after warm-up`)
console.log('')
console.log('    dogs    whole run     per dog')
for (const row of rows) {
  console.log(`${row.dogs.toLocaleString('en-GB').padStart(8)}  ${row.ms.toFixed(1).padStart(8)} ms  ${row.perDogUs.toFixed(1).padStart(7)} µs`)
}
const ratio = rows[1]!.ms / rows[0]!.ms
console.log('')
console.log(`10k / 1k: ${ratio.toFixed(2)} (10.00 is linear)`)
console.log(`target, 1k whole run well under 100 ms: ${rows[0]!.ms < 100 ? 'met' : 'MISSED'} (${rows[0]!.ms.toFixed(1)} ms)`)

import { describe, expect, it } from 'vitest'
import { COAT_CAUTIONS } from '../../../../shared/coat'

describe('COAT_CAUTIONS', () => {
  // DESIGN.md §7: the four cautions every coat-work prompt shows.
  it.each([
    ['work gently and with the dog', /gently.*with the dog/i],
    ['stop at reddened or broken skin', /stop.*reddened or broken/i],
    ['use a timer', /timer/i],
    ['ask a veterinarian about sore or inflamed skin', /veterinarian.*sore or inflamed/i],
  ])('says: %s', (_, words) => {
    expect(COAT_CAUTIONS.some((c) => words.test(c))).toBe(true)
  })
})

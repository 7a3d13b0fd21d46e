// DESIGN.md §7: coat work can hurt a dog, so every place that prompts coat work shows these.
export const COAT_CAUTIONS: readonly string[] = [
  'Work gently and with the dog: short spells, and stop when the dog has had enough.',
  'Stop at once where the skin is reddened or broken.',
  'Run the area timer, so no area is worked until it goes bare.',
  'Ask a veterinarian about skin that is sore or inflamed before working it again.',
]

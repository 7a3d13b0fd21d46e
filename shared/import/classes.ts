import { CLASS_DEFINITIONS, type RuleSet } from '../coat'
import { headerKey } from './parse'

// Each rule set's classes by code and by normalised name, built once: a file names the same few
// classes on thousands of rows.
const classKeys = new Map<RuleSet, { codes: Set<string>, byKey: Map<string, string> }>()

function keysOf(ruleSet: RuleSet) {
  let keys = classKeys.get(ruleSet)
  if (!keys) {
    const defs = CLASS_DEFINITIONS[ruleSet]
    const byKey = new Map<string, string>()
    // A label wins over another class's code suffix, as the first match of the definitions did.
    for (const d of defs) {
      for (const key of [headerKey(d.label), headerKey(d.code.slice(d.code.indexOf(':') + 1))]) {
        if (!byKey.has(key)) byKey.set(key, d.code)
      }
    }
    keys = { codes: new Set(defs.map(d => d.code)), byKey }
    classKeys.set(ruleSet, keys)
  }
  return keys
}

/** The class code a cell names in a rule set: a code like `kc:junior` or a label like "Junior"; undefined when the rule set has none. */
export function resolveClassCode(ruleSet: RuleSet, value: string): string | undefined {
  const text = value.trim().toLowerCase()
  const { codes, byKey } = keysOf(ruleSet)
  if (codes.has(text)) return text
  // Only the organisation's own prefix: "fci:junior" is not a KC class.
  if (text.includes(':') && !text.startsWith(`${ruleSet.toLowerCase()}:`)) return undefined
  return byKey.get(headerKey(text.includes(':') ? text.slice(text.indexOf(':') + 1) : text))
}

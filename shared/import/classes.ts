import { CLASS_DEFINITIONS, type RuleSet } from '../coat'
import { headerKey } from './parse'

/** The class code a cell names in a rule set: a code like `kc:junior` or a label like "Junior"; undefined when the rule set has none. */
export function resolveClassCode(ruleSet: RuleSet, value: string): string | undefined {
  const text = value.trim().toLowerCase()
  const defs = CLASS_DEFINITIONS[ruleSet]
  const byCode = defs.find(d => d.code === text)
  if (byCode) return byCode.code
  const key = headerKey(text.includes(':') ? text.slice(text.indexOf(':') + 1) : text)
  // Only the organisation's own prefix: "fci:junior" is not a KC class.
  if (text.includes(':') && !text.startsWith(`${ruleSet.toLowerCase()}:`)) return undefined
  return defs.find(d => headerKey(d.label) === key || headerKey(d.code.slice(d.code.indexOf(':') + 1)) === key)?.code
}

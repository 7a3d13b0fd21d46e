/** The largest file Bloomline imports: 10 MiB (10 × 1024 × 1024 bytes). */
export const MAX_IMPORT_BYTES = 10 * 1024 * 1024

/** A file the importer refuses as a whole, with the one sentence that says why. */
export class ImportFileError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'ImportFileError'
  }
}

/** How the bytes were read. */
export type ImportEncoding = 'utf-8' | 'windows-1252'

// Control characters other than tab, line feed and carriage return, C1 included: text files do not hold them.
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/

/** Whether the bytes hold at least one well-formed multi-byte UTF-8 sequence (RFC 3629 §4). */
function hasUtf8Sequence(bytes: Uint8Array): boolean {
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i]!
    const length = b >= 0xC2 && b <= 0xDF ? 2 : b >= 0xE0 && b <= 0xEF ? 3 : b >= 0xF0 && b <= 0xF4 ? 4 : 0
    if (!length || i + length > bytes.length) continue
    let ok = true
    for (let k = 1; k < length; k++) if ((bytes[i + k]! & 0xC0) !== 0x80) ok = false
    if (ok) return true
  }
  return false
}

/**
 * The text of an uploaded file: UTF-8 with or without a byte-order mark, or Windows-1252 when
 * the bytes are not UTF-8 at all. Refuses (ImportFileError) a file over 10 MiB, an empty one,
 * UTF-16, binary junk and a file that mixes UTF-8 with another encoding.
 */
export function decodeImportFile(bytes: Uint8Array): { text: string, encoding: ImportEncoding } {
  if (bytes.length > MAX_IMPORT_BYTES) {
    throw new ImportFileError(`The file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; Bloomline imports files of up to 10 MB, so split it into smaller files.`)
  }
  if (bytes.length === 0) throw new ImportFileError('The file is empty: there is nothing to import.')
  if ((bytes[0] === 0xFF && bytes[1] === 0xFE) || (bytes[0] === 0xFE && bytes[1] === 0xFF)) {
    throw new ImportFileError('The file is saved as UTF-16; save it again as "CSV UTF-8" and import that.')
  }
  if (bytes.includes(0)) throw new ImportFileError('The file holds binary data (NUL bytes), not text: choose the CSV export of the spreadsheet, not the spreadsheet itself.')
  const bom = bytes[0] === 0xEF && bytes[1] === 0xBB && bytes[2] === 0xBF
  const body = bom ? bytes.subarray(3) : bytes
  let text: string
  let encoding: ImportEncoding = 'utf-8'
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(body)
  }
  catch {
    if (bom || hasUtf8Sequence(body)) {
      throw new ImportFileError('The file mixes two text encodings (some accented letters are UTF-8, others are not), so its letters cannot be read safely; save it again as "CSV UTF-8" and import that.')
    }
    text = new TextDecoder('windows-1252').decode(body)
    encoding = 'windows-1252'
  }
  if (CONTROL.test(text)) throw new ImportFileError('The file holds control characters that text files do not have, so it is not a CSV file (or it is damaged): choose the CSV export again.')
  if (!text.trim()) throw new ImportFileError('The file is empty: there is nothing to import.')
  return { text, encoding }
}

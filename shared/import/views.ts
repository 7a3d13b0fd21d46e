import type { ISODate } from '../coat'
import type { DayOrder } from './dates'
import type { ImportMapping } from './fields'
import type { ImportCounts, PreviewRow } from './preview'

/** The preview answer: how the file was read, the proposed (or given) mapping and every row. */
export interface ImportPreviewView {
  fileName: string
  encoding: 'utf-8' | 'windows-1252'
  delimiter: ',' | ';' | '\t'
  headers: string[]
  mapping: ImportMapping
  dayOrder: DayOrder
  dayOrderFromFile: boolean
  rows: Omit<PreviewRow, 'plan'>[]
  counts: ImportCounts
}

/** A dog the committed rows name: made by this import (`created`) or already there. */
export interface ImportedDog { id: number, callName: string, created: boolean }

/** A show the committed rows name: made by this import (`created`) or already there. */
export interface ImportedShow { id: number, name: string, firstDay: ISODate, created: boolean }

/**
 * The commit answer: how the file was read, the counts, the ids of what was written by kind,
 * and only the rows worth a second look (with a problem, or left out). The rows that went in
 * cleanly are not sent back: the caller has the file, and a large one would make the answer
 * larger than the file.
 */
export interface ImportCommitView extends Omit<ImportPreviewView, 'rows'> {
  importId: number
  /** Every dog the chosen rows name, by call name. */
  dogs: ImportedDog[]
  /** Every show the chosen rows name, by first day. */
  shows: ImportedShow[]
  /** Entry ids: made by this import, changed by it (armband or handler), and found as they were. */
  entries: { created: number[], updated: number[], unchanged: number[] }
  /** The rows with a warning or an error, and the rows left out, in file order. */
  rows: Omit<PreviewRow, 'plan'>[]
}

/** One import in the history. */
export interface ImportHistoryView {
  id: number
  fileName: string
  createdAt: string
  user: { id: number, name: string } | null
  counts: ImportCounts
  mapping: ImportMapping
  leftOut: number
}

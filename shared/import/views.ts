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

/** The commit answer: the preview as committed and the history record it made. */
export interface ImportCommitView extends ImportPreviewView {
  importId: number
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

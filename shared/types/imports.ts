// What the CSV import routes send: a preview of every row as it will land, with its problems.

export interface ImportProblem {
  /** the column as the file names it, or '' for the whole row or file */
  column: string
  message: string
}

export interface ImportRowPreview {
  /** the line in the file (the header is line 1) */
  line: number
  /** the row's cells by column, as they will be stored (numbers as figures) */
  cells: Record<string, string>
  problems: ImportProblem[]
}

export interface ImportPreview {
  kind: string
  fileName: string
  columns: string[]
  /** problems with the file itself (encoding, a spreadsheet, unknown or missing columns) */
  fileProblems: string[]
  rows: ImportRowPreview[]
  rowCount: number
  problemRows: number
  /** true when the file can be imported as it is */
  ready: boolean
}

export interface ImportResult {
  kind: string
  imported: number
}

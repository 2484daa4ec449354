/**
 * A piece's mark, one printable scheme for every piece Setline makes:
 * - a piece of a job: the job code as written, '#', the piece's number within the job, three
 *   digits at least (J-2601#017). A pour of an N-cavity mould makes N pieces numbered one after
 *   the other (J-2601#017 … J-2601#020), in cavity order.
 * - a piece cast for stock: the mould code, '#M' and the mould's pull (CR-101#M117); from a
 *   multi-cavity mould, '.' and the cavity (CR-101#M117.1 … CR-101#M117.4).
 * Short, printable on a label, and unambiguous: codes cannot contain '#', a stock piece's number
 * starts with M, and a job piece's number is digits only (piecesRepo.nextInJob counts those).
 * Marks stored before this scheme keep their form. Pure.
 */

/** The marks of a job's pieces from one pour: `count` numbers from `first`. */
export function jobPieceMarks(jobCode: string, first: number, count: number): string[] {
  return Array.from({ length: count }, (_, i) => `${jobCode}#${String(first + i).padStart(3, '0')}`)
}

/** The marks of stock pieces from one pour: the mould's pull, and the cavity when there are several. */
export function stockPieceMarks(mouldCode: string, pull: number, count: number): string[] {
  const base = `${mouldCode}#M${String(pull).padStart(3, '0')}`
  return count === 1 ? [base] : Array.from({ length: count }, (_, i) => `${base}.${i + 1}`)
}

/** A pour's marks as one short label: 'J-2601#017' or 'J-2601#017–#020' (first–last, same prefix). */
export function markRange(marks: readonly string[]): string {
  if (marks.length <= 1) return marks[0] ?? ''
  const first = marks[0]!
  const last = marks[marks.length - 1]!
  const hash = last.indexOf('#')
  const samePrefix = hash > 0 && first.slice(0, hash + 1) === last.slice(0, hash + 1)
  return `${first}–${samePrefix ? last.slice(hash) : last}`
}

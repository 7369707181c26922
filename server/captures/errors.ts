/**
 * A capture file that cannot be read as a capture. `line` is the 1-based line of the
 * file the problem was found on (every line counts, header and blank lines included),
 * or null when the problem is the file as a whole (binary content, too few samples).
 * The message already starts with "line N: " when a line is known, so it can be shown
 * to the user as it is.
 */
export class CaptureFormatError extends Error {
  readonly code = 'capture-format'
  readonly line: number | null
  constructor(line: number | null, problem: string) {
    super(line === null ? problem : `line ${line}: ${problem}`)
    this.name = 'CaptureFormatError'
    this.line = line
  }
}

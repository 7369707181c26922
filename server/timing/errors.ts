/**
 * The engine's one error type: an input that passes the schema's shape but cannot be
 * computed (or does not pass the schema when the engine parses it itself).
 * `path` names the offending field the way zod does, e.g. ['channels', 0, 'receiver', 'vih'].
 */
export class EngineInputError extends Error {
  readonly code = 'engine-input'
  readonly path: (string | number)[]
  /** the schema's issues, when the error comes from validation */
  readonly issues?: { path: (string | number)[]; message: string }[]
  constructor(path: (string | number)[], message: string, issues?: { path: (string | number)[]; message: string }[]) {
    super(message)
    this.name = 'EngineInputError'
    this.path = path
    if (issues) this.issues = issues
  }
}

/** Throw an EngineInputError unless `value` is a finite number. */
export function requireFinite(value: number, path: (string | number)[], what: string): number {
  if (!Number.isFinite(value)) throw new EngineInputError(path, `${what} must be a finite number`)
  return value
}

/**
 * While rendering on the server Vue runs a computed getter again on every read (there are no
 * effects there, so nothing caches), and the link editor reads the draft's issues once per
 * field: about fifty schema checks of the whole link per page. On the server this remembers the
 * last result for the same inputs (compared by identity; a render replaces the draft, never
 * edits it). In the browser Vue's own cache holds, and the function is used as it is.
 */
export function memoOnServer<A extends readonly unknown[], R>(fn: (...args: A) => R): (...args: A) => R {
  if (!import.meta.server) return fn
  let last: { args: A; result: R } | undefined
  return (...args: A) => {
    if (last && last.args.length === args.length && last.args.every((a, i) => a === args[i])) return last.result
    const result = fn(...args)
    last = { args, result }
    return result
  }
}

/**
 * The layer rules of DEVELOPERS.md, checked on the import statements of the source tree:
 * app -> shared; server -> shared; the engine (server/timing) -> shared only; and no import
 * circle anywhere in app, shared or server.
 */
import { readdirSync, readFileSync, existsSync, statSync } from 'node:fs'
import { dirname, join, relative, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'

const ROOT = resolve(__dirname, '../../..')

function filesUnder(dir: string): string[] {
  return readdirSync(join(ROOT, dir), { recursive: true, encoding: 'utf8' })
    .filter((f) => /\.(ts|vue)$/.test(f) && !f.endsWith('.d.ts'))
    .map((f) => join(dir, f))
}

/** The module specifiers a file imports (static imports and re-exports, type-only included). */
function importsOf(file: string): string[] {
  const text = readFileSync(join(ROOT, file), 'utf8')
  const out: string[] = []
  for (const m of text.matchAll(/^\s*(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]/gm)) out.push(m[1]!)
  for (const m of text.matchAll(/^\s*import\s+['"]([^'"]+)['"]/gm)) out.push(m[1]!)
  return out
}

/** A specifier resolved to a project file, or null for a package. */
function resolveImport(from: string, spec: string): string | null {
  let base: string | null = null
  if (spec.startsWith('.')) base = join(dirname(from), spec)
  else if (spec.startsWith('#shared/')) base = join('shared', spec.slice('#shared/'.length))
  else if (spec.startsWith('~~/')) base = spec.slice(3)
  else if (spec.startsWith('~/')) base = join('app', spec.slice(2))
  if (base === null) return null
  for (const candidate of [base, `${base}.ts`, `${base}.vue`, join(base, 'index.ts')])
    if (existsSync(join(ROOT, candidate)) && statSync(join(ROOT, candidate)).isFile()) return relative(ROOT, join(ROOT, candidate))
  return null
}

const all = [...filesUnder('app'), ...filesUnder('shared'), ...filesUnder('server')]
const graph = new Map(all.map((f) => [f, importsOf(f).map((s) => resolveImport(f, s)).filter((t): t is string => t !== null)]))

describe('layer rules', () => {
  it('nothing under app/ or shared/ imports from server/', () => {
    const bad = [...graph].filter(([f]) => f.startsWith('app/') || f.startsWith('shared/')).flatMap(([f, ts]) => ts.filter((t) => t.startsWith('server/')).map((t) => `${f} -> ${t}`))
    expect(bad).toEqual([])
  })

  it('the engine (server/timing) imports only itself and shared/', () => {
    const bad = [...graph].filter(([f]) => f.startsWith('server/timing/')).flatMap(([f, ts]) => ts.filter((t) => !t.startsWith('server/timing/') && !t.startsWith('shared/')).map((t) => `${f} -> ${t}`))
    expect(bad).toEqual([])
    // and no framework: the engine's package imports are none
    const packages = filesUnder('server/timing').flatMap((f) => importsOf(f).filter((s) => !s.startsWith('.')).map((s) => `${f}: ${s}`))
    expect(packages).toEqual([])
  })

  it('shared/ imports only shared/, zod and papaparse (CSV), never a framework', () => {
    const allowed = new Set(['zod', 'papaparse'])
    const bad = filesUnder('shared').flatMap((f) =>
      importsOf(f)
        .filter((s) => !s.startsWith('.') && !allowed.has(s))
        .map((s) => `${f}: ${s}`),
    )
    expect(bad).toEqual([])
  })

  it('has no import circle', () => {
    const state = new Map<string, 'active' | 'done'>()
    const cycles: string[] = []
    const visit = (f: string, trail: string[]) => {
      if (state.get(f) === 'done') return
      if (state.get(f) === 'active') {
        cycles.push([...trail.slice(trail.indexOf(f)), f].join(' -> '))
        return
      }
      state.set(f, 'active')
      for (const t of graph.get(f) ?? []) visit(t, [...trail, f])
      state.set(f, 'done')
    }
    for (const f of graph.keys()) visit(f, [])
    expect(cycles).toEqual([])
  })
})

describe('function size (issue 12)', () => {
  it('no function in server/ or shared/ runs over 80 lines: each reads as one step of its method', async () => {
    const ts = (await import('typescript')).default
    const long: string[] = []
    for (const file of [...filesUnder('server'), ...filesUnder('shared')].filter((f) => f.endsWith('.ts'))) {
      const src = ts.createSourceFile(file, readFileSync(join(ROOT, file), 'utf8'), ts.ScriptTarget.Latest, true)
      const visit = (n: import('typescript').Node) => {
        if (ts.isFunctionDeclaration(n) || ts.isMethodDeclaration(n) || ts.isArrowFunction(n) || ts.isFunctionExpression(n)) {
          const a = src.getLineAndCharacterOfPosition(n.getStart()).line
          const b = src.getLineAndCharacterOfPosition(n.getEnd()).line
          if (b - a + 1 > 80) long.push(`${file}:${a + 1} (${b - a + 1} lines)`)
        }
        ts.forEachChild(n, visit)
      }
      visit(src)
    }
    expect(long).toEqual([])
  })
})

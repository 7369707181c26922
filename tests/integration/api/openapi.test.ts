/**
 * The OpenAPI description (GET /api/openapi.json): a valid OpenAPI 3.1 document by an
 * independent validator (@seriousme/openapi-schema-validator, the OpenAPI Initiative's JSON
 * schemas), public, and covering every route file of the public API (analysis, projects,
 * links, captures, reports, exports) with its method.
 */
import { readdirSync } from 'node:fs'
import { Validator } from '@seriousme/openapi-schema-validator'
import { describe, expect, it } from 'vitest'
import { apiClient } from '../../support/api'

const PUBLIC_API = ['server/api/analyze', 'server/api/links', 'server/api/projects', 'server/api/captures', 'server/api/reports', 'server/api/teams/[teamId]/projects']
const EXPORTS = ['server/routes/links', 'server/routes/reports']

/** `server/api/links/[linkId]/analysis.get.ts` -> `GET /api/links/{linkId}/analysis` */
function routesIn(folder: string, prefix: string): string[] {
  return readdirSync(folder, { recursive: true, encoding: 'utf8' })
    .filter((f) => /\.(get|post|patch|delete|put)\.ts$/.test(f))
    .map((f) => {
      const [, p, method] = `${prefix}/${f}`.match(/^(.*)\.(get|post|patch|delete|put)\.ts$/)!
      return `${method!.toUpperCase()} ${p!.replace(/\/index$/, '').replace(/\[(\w+)\]/g, '{$1}')}`
    })
}

describe('GET /api/openapi.json', () => {
  it('is a valid OpenAPI 3.1 document, served without signing in', async () => {
    const res = await apiClient().get('/api/openapi.json')
    expect(res.status).toBe(200)
    expect(res.data.openapi).toBe('3.1.0')
    const validator = new Validator()
    const result = await validator.validate(res.data)
    expect(result.errors ?? []).toEqual([])
    expect(result.valid).toBe(true)
    expect(validator.version).toBe('3.1')
  })

  it('documents every public route with its method, parameters from the route schemas, and the bearer token', async () => {
    const doc = (await apiClient().get('/api/openapi.json')).data
    const documented = new Set(Object.entries(doc.paths as Record<string, Record<string, unknown>>).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`)))
    const files = [
      ...PUBLIC_API.flatMap((f) => routesIn(f, f.replace(/^server/, ''))),
      ...EXPORTS.flatMap((f) => routesIn(f, f.replace(/^server\/routes/, ''))),
    ]
    expect(files.length).toBeGreaterThan(30)
    expect(files.filter((r) => !documented.has(r))).toEqual([])
    // the analysis body is the shared link schema, with its limits (shared/schemas/link.ts)
    const link = doc.components.schemas.Link
    expect(link.properties.protocol).toBeDefined()
    expect(JSON.stringify(link)).toContain('baud')
    expect(doc.paths['/api/analyze'].post.requestBody.content['application/json'].schema.$ref).toBe('#/components/schemas/Link')
    expect(doc.paths['/reports/{reportId}/tables.csv'].get.parameters.find((p: { name: string }) => p.name === 'table').schema.enum).toContain('bits')
    expect(doc.components.securitySchemes.apiToken).toMatchObject({ type: 'http', scheme: 'bearer' })
  })
})

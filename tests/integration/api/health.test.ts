import { inject, describe, expect, it } from 'vitest'
import { $fetch } from 'ofetch'
import pkg from '../../../package.json' with { type: 'json' }

const baseURL = inject('baseURL')

describe('GET /api/health', () => {
  it('reports the app version and a database that answers', async () => {
    const health = await $fetch<{ name: string; version: string; database: string }>('/api/health', { baseURL })
    expect(health).toEqual({ name: 'Bitslack', version: pkg.version, database: 'up' })
  })
})

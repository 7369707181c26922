/** Projects, links and parts, created through the API as a given user. */
import { expect } from 'vitest'
import type { LinkInput } from '../../shared/schemas/link'
import { ADC_SPI_LINK, DEBUG_LINK, FIELD_RS485_LINK, LOC10, MONITOR_I2C_LINK, PUMP_CAN_LINK, TELEMETRY_LINK } from '../../server/db/seeders/demo-links'
import type { ApiClient } from '../support/api'

/** A valid link input (a deep copy of a demo link, renamed). */
const DEMO_BY_KIND = { telemetry: TELEMETRY_LINK, spi: ADC_SPI_LINK, debug: DEBUG_LINK, i2c: MONITOR_I2C_LINK, can: PUMP_CAN_LINK, rs485: FIELD_RS485_LINK }

export function buildLinkSpec(kind: keyof typeof DEMO_BY_KIND = 'debug', name?: string): LinkInput {
  const base = DEMO_BY_KIND[kind]
  const spec = structuredClone(base)
  if (name) spec.name = name
  return spec
}

export function buildPartBody(name = 'Test logic coupler') {
  return { name, category: 'logic-output coupler', description: 'for tests', stage: structuredClone(LOC10) }
}

export async function buildProject(client: ApiClient, teamId: number, name = 'Test project') {
  const res = await client.post(`/api/teams/${teamId}/projects`, { name, description: 'for tests' })
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  return res.data as { id: number; version: number }
}

export async function buildLink(client: ApiClient, projectId: number, spec: LinkInput = buildLinkSpec()) {
  const res = await client.post(`/api/projects/${projectId}/links`, { spec })
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  return res.data as { id: number; version: number }
}

export async function buildPart(client: ApiClient, teamId: number, name?: string) {
  const res = await client.post(`/api/teams/${teamId}/parts`, buildPartBody(name))
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  return res.data as { id: number; version: number }
}

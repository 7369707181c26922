/**
 * The bitslack command line, run as a build script runs it (a child process of the checkout's
 * bin): its exit codes and its lines on the demo links and on bad input. What it prints must be
 * the engine's own answer, so each expectation is read from analyzeParsedLink in this process.
 */
import { execFile } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { promisify } from 'node:util'
import { beforeAll, describe, expect, it } from 'vitest'
import { ADC_SPI_LINK, DEBUG_LINK, FIELD_RS485_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK, TELEMETRY_LINK } from '../../../server/db/seeders/demo-links'
import { analyzeParsedLink } from '../../../server/timing'
import { LinkSpec } from '../../../shared/schemas/link'
import { formatEng, formatUi } from '../../../shared/utils/units'

const run = promisify(execFile)
const bin = path.resolve('bin/bitslack.mjs')
let dir = ''
const file = (name: string, content: unknown) => {
  const p = path.join(dir, name)
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content))
  return p
}

async function bitslack(...args: string[]): Promise<{ code: number; out: string; err: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [bin, ...args], { env: { ...process.env, BITSLACK_TOKEN: '' } })
    return { code: 0, out: stdout, err: stderr }
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string }
    return { code: x.code, out: x.stdout, err: x.stderr }
  }
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'bitslack-cli-'))
})

describe('bitslack check, locally', () => {
  it('checks the bus links: the limiting check, its slack and what the link allows at most', async () => {
    const i2c = analyzeParsedLink(LinkSpec.parse(MONITOR_I2C_LINK)).i2c!
    const a = await bitslack('check', file('i2c.json', MONITOR_I2C_LINK))
    expect(a.code).toBe(0)
    expect(a.out).toContain(`limiting check: ${i2c.limiting}, slack ${formatEng(i2c.worstSlack, 's')}`)
    expect(a.out).toContain(`SCL ${formatEng(i2c.maxSclHz, 'Hz')}`)
    const can = analyzeParsedLink(LinkSpec.parse(PUMP_CAN_LINK)).can!
    const b = await bitslack('check', file('can.json', PUMP_CAN_LINK))
    expect(b.code).toBe(0)
    expect(b.out).toContain(`bus up to ${can.maxBusLength!.toFixed(0)} m`)
    // the RS-485 demo fails its turnaround: exit 1, the failing check named
    const c = await bitslack('check', file('rs485.json', FIELD_RS485_LINK))
    expect(c.code).toBe(1)
    expect(c.out).toContain('verdict: FAIL')
    expect(c.out).toContain('failing: de-lead')
  }, 30_000)

  it('fails the demo telemetry link (exit 1) with the engine\'s verdict, worst bit and maximum rate', async () => {
    const a = analyzeParsedLink(LinkSpec.parse(TELEMETRY_LINK))
    expect(a.verdict).toBe('fail')
    const worst = a.uart!.bits.find((b) => b.index === a.uart!.worstBit)!
    const r = await bitslack('check', file('telemetry.json', TELEMETRY_LINK))
    expect(r.code).toBe(1)
    expect(r.out).toContain('verdict: FAIL')
    expect(r.out).toContain(`worst bit: ${worst.label}, margin ${formatUi(a.uart!.worstMarginUi)}`)
    expect(r.out).toMatch(/maximum rate: [\d.]+ kBd/)
    expect(r.out).toContain('bench verification')
  }, 30_000)

  it('passes the demo debug UART and the demo SPI link (exit 0); --json gives the same numbers', async () => {
    expect((await bitslack('check', file('adc.json', ADC_SPI_LINK))).code).toBe(0)
    const r = await bitslack('check', file('debug.json', DEBUG_LINK), '--json')
    expect(r.code).toBe(0)
    const a = analyzeParsedLink(LinkSpec.parse(DEBUG_LINK))
    const s = JSON.parse(r.out)
    expect(s.verdict).toBe('pass')
    expect(s.uart.worstMarginUi).toBeCloseTo(a.uart!.worstMarginUi!, 12)
    expect(s.uart.maxBaud).toBeCloseTo(a.uart!.maxBaud!, 6)
  }, 30_000)

  it('--baud and --required-margin change what is checked: a slower rate passes, a larger margin than it keeps fails', async () => {
    const slow = analyzeParsedLink(LinkSpec.parse({ ...TELEMETRY_LINK, uart: { ...TELEMETRY_LINK.uart!, baud: 4800 } }))
    expect(slow.verdict).toBe('pass')
    const f = file('telemetry.json', TELEMETRY_LINK)
    expect((await bitslack('check', f, '--baud', '4.8k')).code).toBe(0)
    // a required margin just above the worst margin the link keeps at 4800 Bd: marginal, which has lost its margin
    const above = (slow.uart!.worstMarginUi! + 0.005).toFixed(3)
    const r = await bitslack('check', f, '--baud', '4800', '--required-margin', above)
    expect(r.code).toBe(1)
    expect(r.out).toContain('verdict: MARGINAL')
  }, 30_000)

  it('exits 2 on bad input and names the problem: no file, not JSON, a refused field, a missing value, an option that does not apply, an unknown option', async () => {
    const missingFile = await bitslack('check', path.join(dir, 'nope.json'))
    expect(missingFile.code).toBe(2)
    expect(missingFile.err).toContain('cannot read')
    const notJson = await bitslack('check', file('bad.json', '{ "protocol": '))
    expect(notJson.code).toBe(2)
    expect(notJson.err).toContain('is not JSON')
    const refused = await bitslack('check', file('refused.json', { ...TELEMETRY_LINK, uart: { ...TELEMETRY_LINK.uart!, baud: -5 } }))
    expect(refused.code).toBe(2)
    expect(refused.err).toContain('uart.baud')
    const draft = structuredClone(TELEMETRY_LINK) as { channels: { receiver: { vih: number | null } }[] }
    draft.channels[0]!.receiver.vih = null
    const missing = await bitslack('check', file('draft.json', draft))
    expect(missing.code).toBe(2)
    expect(missing.err).toContain('channels.0.receiver.vih: enter a value')
    const spiBaud = await bitslack('check', file('adc.json', ADC_SPI_LINK), '--baud', '9600')
    expect(spiBaud.code).toBe(2)
    expect(spiBaud.err).toContain('apply to UART links')
    expect((await bitslack('check', '--bogus')).code).toBe(2)
    expect((await bitslack('check', file('telemetry.json', TELEMETRY_LINK), '--baud', 'banana')).code).toBe(2)
    const server = await bitslack('check', '--server', 'http://127.0.0.1:9', '--link', '1')
    expect(server.code).toBe(2)
    expect(server.err).toContain('--token')
  }, 60_000)
})

describe('bitslack diff', () => {
  it('lists the changed inputs and margins, the biggest change first', async () => {
    const a = file('a.json', TELEMETRY_LINK)
    const b = file('b.json', { ...TELEMETRY_LINK, uart: { ...TELEMETRY_LINK.uart!, baud: 4800 } })
    const r = await bitslack('diff', a, b, '--json')
    expect(r.code).toBe(0)
    const d = JSON.parse(r.out)
    expect(d.inputs).toEqual([{ path: 'uart.baud', a: 38400, b: 4800 }])
    expect(d.verdict).toEqual({ a: 'fail', b: 'pass' })
    const ra = analyzeParsedLink(LinkSpec.parse(TELEMETRY_LINK)).uart!
    const rb = analyzeParsedLink(LinkSpec.parse({ ...TELEMETRY_LINK, uart: { ...TELEMETRY_LINK.uart!, baud: 4800 } })).uart!
    const worst = d.margins.find((m: { what: string }) => m.what === 'worst margin')
    expect(worst.change).toBeCloseTo(rb.worstMarginUi! - ra.worstMarginUi!, 12)
    // ordered by size: every UI change after the first is no larger
    const ui = d.margins.filter((m: { unit: string }) => m.unit === 'UI').map((m: { change: number }) => Math.abs(m.change))
    expect(ui).toEqual([...ui].sort((x: number, y: number) => y - x))
    const text = await bitslack('diff', a, b)
    expect(text.out).toContain('uart.baud: 38400 -> 4800')
    expect(text.out).toContain('verdict: fail -> pass')
  }, 30_000)
})

describe('the publishable bundle (npm run cli:build)', () => {
  it('is one file that answers like the checkout\'s bin', async () => {
    await run('bash', ['cli/build.sh'])
    const f = file('telemetry.json', TELEMETRY_LINK)
    const fromSource = await bitslack('check', f, '--json')
    let bundled: { code: number; out: string }
    try {
      const { stdout } = await run(process.execPath, [path.resolve('cli/dist/bitslack.mjs'), 'check', f, '--json'])
      bundled = { code: 0, out: stdout }
    } catch (e) {
      const x = e as { code: number; stdout: string }
      bundled = { code: x.code, out: x.stdout }
    }
    expect(bundled.code).toBe(fromSource.code)
    expect(JSON.parse(bundled.out)).toEqual(JSON.parse(fromSource.out))
  }, 120_000)
})

/**
 * The bit timeline's geometry in time (issue 12): the frame's cells and their levels for
 * every data value, and the lanes a frame passes through — the sent frame, each stage's
 * output at typical delays, the receiving pin with its corner bands, and what the UART sees
 * after its own inversion. The chart places these numbers; it has no timing rule of its own.
 */
import type { ChannelResult, TimelineEdges, TimelineLane, UartChannelResult, UartTimeline } from '../../shared/types/analysis'
import { frameBits } from './uart'

const levelCache = new Map<string, { cells: string[]; levels: number[] }>()

/** Cell labels and levels (bit j of levels[v]) of a frame format, for every data value (cached). */
export function frameCells(frame: UartChannelResult['frame']): { cells: string[]; levels: number[] } {
  const stops = Math.ceil(frame.stopBits)
  const key = `${frame.dataBits}|${frame.parity}|${stops}`
  const hit = levelCache.get(key)
  if (hit) return hit
  const cells = ['start', ...Array.from({ length: frame.dataBits }, (_, i) => `d${i}`), ...(frame.parity === 'none' ? [] : ['parity'])]
  for (let i = 0; i < stops; i++) cells.push(i === 0 ? 'stop' : `stop ${i + 1}`)
  const levels: number[] = []
  for (let v = 0; v < 1 << frame.dataBits; v++) {
    // the sampled bits (start .. first stop), then the further stop bits, all 1
    const bits = [...frameBits(frame.dataBits, frame.parity, v), ...Array<number>(stops - 1).fill(1)]
    levels.push(bits.reduce((mask, b, j) => mask + b * 2 ** j, 0))
  }
  const out = { cells, levels }
  levelCache.set(key, out)
  return out
}

const ideal: TimelineEdges = { rise: 0, fall: 0, riseRange: null, fallRange: null, tr: 0, tf: 0, riseShape: 'ramp', fallShape: 'ramp' }

/**
 * The lanes of one direction: a rising and a falling sent edge followed through each stage
 * but the last at typical delays (tPLH where that stage's output rises, tPHL where it
 * falls), then the receiving pin with the chain's corners, then the UART's logical view.
 */
export function timelineLanes(ch: ChannelResult, receiverInvert: boolean): TimelineLane[] {
  const lanes: TimelineLane[] = [{ kind: 'sent', stage: null, inverted: false, edges: ideal }]
  let dirOfRise: 'rise' | 'fall' = 'rise'
  let tRise = 0
  let tFall = 0
  for (const s of ch.stages.slice(0, -1)) {
    const outDir: 'rise' | 'fall' = s.inverting ? (dirOfRise === 'rise' ? 'fall' : 'rise') : dirOfRise
    tRise += outDir === 'rise' ? s.tplh.typ : s.tphl.typ
    tFall += outDir === 'rise' ? s.tphl.typ : s.tplh.typ
    dirOfRise = outDir
    const inverted = outDir === 'fall'
    lanes.push({
      kind: 'stage',
      stage: s.name,
      inverted,
      edges: { ...ideal, rise: inverted ? tFall : tRise, fall: inverted ? tRise : tFall, tr: s.tr.typ, tf: s.tf.typ },
    })
  }
  const pinInverted = ch.polarity === 'inverted'
  lanes.push({
    kind: 'received',
    stage: null,
    inverted: pinInverted,
    edges: {
      rise: ch.rise.typ,
      fall: ch.fall.typ,
      riseRange: { min: ch.rise.min, max: ch.rise.max },
      fallRange: { min: ch.fall.min, max: ch.fall.max },
      tr: ch.tr.typ,
      tf: ch.tf.typ,
      riseShape: ch.riseShape,
      fallShape: ch.fallShape,
    },
  })
  // after the receiver's own inversion a rising pin edge is a logical fall
  lanes.push({
    kind: 'uart',
    stage: null,
    inverted: pinInverted !== receiverInvert,
    edges: {
      rise: receiverInvert ? ch.fall.typ : ch.rise.typ,
      fall: receiverInvert ? ch.rise.typ : ch.fall.typ,
      riseRange: null,
      fallRange: null,
      tr: receiverInvert ? ch.tf.typ : ch.tr.typ,
      tf: receiverInvert ? ch.tr.typ : ch.tf.typ,
      riseShape: receiverInvert ? ch.fallShape : ch.riseShape,
      fallShape: receiverInvert ? ch.riseShape : ch.fallShape,
    },
  })
  return lanes
}

/** The timeline of one UART direction. */
export function uartTimeline(r: UartChannelResult, ch: ChannelResult, receiverInvert: boolean): UartTimeline {
  const { cells, levels } = frameCells(r.frame)
  // the start bit is a logical fall at the UART: a rising pin edge when the receiver inverts
  return { cells, levels, sync: receiverInvert ? ch.rise.typ : ch.fall.typ, lanes: timelineLanes(ch, receiverInvert) }
}

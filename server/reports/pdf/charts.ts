/**
 * The report's charts as vector graphics: the bit timeline (each bit's valid window and
 * deciding samples, from the engine's per-bit result), the SPI slack bars and the rate
 * sweep. They place what the engine computed; no timing rule of their own.
 */
import type { BusTimeline, UartChannelResult } from '../../../shared/types/analysis'
import { MARGIN_LABEL, spiSlackState, uartMarginState, type ReadingThresholds } from '../../../shared/report/vocabulary'
import { formatEng, formatUi } from '../../../shared/utils/units'
import { INK, MUTED, RULE, STATE_COLOUR, type Layout } from './layout'

const eng = (v: number | null | undefined, unit: string, digits = 3) => formatEng(v, unit, { digits })

/**
 * The bit timeline: each bit's nominal cell, its worst-case valid window (coloured by state,
 * its margin in UI beside it) and the span of its deciding samples, on a time axis from the
 * start edge's arrival.
 */
export function drawTimeline(L: Layout, ch: UartChannelResult, x0: number, y0: number, w: number, t?: ReadingThresholds) {
  const doc = L.doc
  const T = ch.bitTime
  const n = ch.bits.length
  const end = Math.max(n * T, ...ch.bits.map((b) => b.samples.latest), ...ch.bits.map((b) => b.validTo ?? 0))
  const labelW = 34
  const plotW = w - labelW
  const xs = (time: number) => x0 + labelW + (Math.max(0, time) / end) * plotW
  const rowH = 15
  for (let k = 0; k <= n; k++) {
    const x = xs(k * T)
    doc.moveTo(x, y0).lineTo(x, y0 + n * rowH).lineWidth(0.3).dash(1.5, { space: 1.5 }).strokeColor(RULE).stroke().undash()
  }
  ch.bits.forEach((b, k) => {
    const y = y0 + k * rowH
    const state = uartMarginState(b.marginUi, ch.requiredMarginUi, t)
    const colour = STATE_COLOUR[state]
    L.mono(b.label, x0, y + 4, { size: 7, width: labelW - 4 })
    doc.rect(xs(k * T), y + 3, xs((k + 1) * T) - xs(k * T), rowH - 6).lineWidth(0.4).strokeColor(RULE).stroke()
    const from = b.validFrom
    const to = b.validTo ?? end
    if (to > from) doc.rect(xs(from), y + 4, Math.max(0.8, xs(to) - xs(from)), rowH - 8).fillOpacity(0.35).fill(colour).fillOpacity(1)
    else doc.rect(xs(to), y + 4, Math.max(0.8, xs(from) - xs(to)), rowH - 8).fillOpacity(0.6).fill(STATE_COLOUR.broken).fillOpacity(1)
    const sx = xs(b.samples.earliest)
    doc.rect(sx, y + 2, Math.max(1.2, xs(b.samples.latest) - sx), rowH - 4).fill(state === 'broken' ? STATE_COLOUR.broken : INK)
    // the margin beside the cell, or before it when the cell ends near the right edge
    const label = `${formatUi(b.marginUi)} ${MARGIN_LABEL[state]}`
    const after = xs((k + 1) * T) + 2
    const lx = after + 80 <= x0 + w ? after : xs(k * T) - 82
    L.mono(label, lx, y + 4.5, { size: 6, colour, width: 80, align: lx === after ? 'left' : 'right' })
  })
  const yb = y0 + n * rowH + 3
  for (let k = 0; k <= n; k += Math.max(1, Math.ceil(n / 6))) L.mono(eng(k * T, 's'), xs(k * T) - 20, yb, { size: 6.5, colour: MUTED, width: 40, align: 'center' })
  doc.x = x0
  doc.y = yb + 11
  L.text('Shaded: worst-case valid window of the bit (teal healthy, amber thin, rose broken). Solid bar: the span of the deciding samples. Time from the start edge at the receiver.', { size: 7, colour: MUTED, width: w })
  doc.moveDown(0.5)
}

/** Horizontal slack bars of the SPI checks around a zero line. */
export function drawSlackBars(L: Layout, checks: { id: string; slack: number; required: number }[], halfPeriod: number, x0: number, y0: number, w: number, t?: ReadingThresholds) {
  const doc = L.doc
  const labelW = 70
  const valueW = 80
  const maxAbs = Math.max(...checks.map((c) => Math.abs(c.slack)), 1e-12)
  const half = (w - labelW - valueW) / 2
  const mid = x0 + labelW + half
  const rowH = 13
  checks.forEach((c, i) => {
    const y = y0 + i * rowH
    const state = spiSlackState(c.slack, c.required, halfPeriod, t)
    const colour = STATE_COLOUR[state]
    L.mono(c.id, x0, y + 3, { size: 7, width: labelW - 4 })
    const len = (Math.abs(c.slack) / maxAbs) * half
    doc.rect(c.slack >= 0 ? mid : mid - len, y + 2, Math.max(0.8, len), rowH - 4).fill(colour)
    L.mono(`${eng(c.slack, 's')} ${MARGIN_LABEL[state]}`, mid + half + 4, y + 3, { size: 7, colour, width: valueW - 4 })
  })
  doc.moveTo(mid, y0).lineTo(mid, y0 + checks.length * rowH).lineWidth(0.6).strokeColor(INK).stroke()
  doc.y = y0 + checks.length * rowH + 6
}

/** The lowest margin the rate-sweep axis shows; lower values are marked at the axis with their true extreme. */
export const SWEEP_FLOOR_UI = -1

/** Margin (UI) against baud on a log axis, with the required margin, the configured rate and the maximum. */
export function drawRateSweep(L: Layout, u: UartChannelResult, x0: number, y0: number, w: number, h: number, t?: ReadingThresholds) {
  const doc = L.doc
  const pts = u.rateSweep.filter((p) => Number.isFinite(p.marginUi) && p.baud > 0)
  if (pts.length < 2) {
    doc.y = y0
    return
  }
  const padL = 40
  const padB = 18
  const pw = w - padL
  const ph = h - padB
  const lx = (b: number) => Math.log10(b)
  const bmin = lx(pts[0]!.baud)
  const bmax = lx(pts[pts.length - 1]!.baud)
  const lowest = Math.min(...pts.map((p) => p.marginUi))
  const ymin = Math.max(SWEEP_FLOOR_UI, Math.min(lowest, 0))
  const ymax = Math.max(0.5, ...pts.map((p) => p.marginUi))
  const X = (b: number) => x0 + padL + ((lx(b) - bmin) / (bmax - bmin)) * pw
  const Y = (m: number) => y0 + ph - ((Math.max(ymin, Math.min(ymax, m)) - ymin) / (ymax - ymin)) * ph
  doc.rect(x0 + padL, y0, pw, ph).lineWidth(0.4).strokeColor(RULE).stroke()
  for (let m = Math.ceil(ymin * 4) / 4; m <= ymax + 1e-9; m += 0.25) {
    doc.moveTo(x0 + padL, Y(m)).lineTo(x0 + padL + pw, Y(m)).lineWidth(m === 0 ? 0.8 : 0.2).strokeColor(m === 0 ? INK : RULE).stroke()
    L.mono(`${m.toFixed(2)} UI`, x0 - 8, Y(m) - 3, { size: 6.5, colour: MUTED, width: padL + 4, align: 'right' })
  }
  for (let d = Math.ceil(bmin); d <= Math.floor(bmax); d++) {
    doc.moveTo(X(10 ** d), y0).lineTo(X(10 ** d), y0 + ph).lineWidth(0.2).strokeColor(RULE).stroke()
    L.mono(eng(10 ** d, 'Bd'), X(10 ** d) - 20, y0 + ph + 4, { size: 6.5, colour: MUTED, width: 40, align: 'center' })
  }
  doc.moveTo(x0 + padL, Y(u.requiredMarginUi)).lineTo(x0 + padL + pw, Y(u.requiredMarginUi)).lineWidth(0.7).dash(3, { space: 2 }).strokeColor(STATE_COLOUR.thin).stroke().undash()
  doc.moveTo(X(pts[0]!.baud), Y(pts[0]!.marginUi))
  for (const p of pts.slice(1)) doc.lineTo(X(p.baud), Y(p.marginUi))
  doc.lineWidth(1.2).strokeColor(STATE_COLOUR.healthy).stroke()
  // below the axis floor: the clipped stretch drawn in rose along the floor; its true extreme is written under the chart
  const clipped = lowest < ymin ? pts.find((p) => p.marginUi < ymin)! : null
  if (clipped) doc.moveTo(X(clipped.baud), Y(ymin)).lineTo(x0 + padL + pw, Y(ymin)).lineWidth(1.6).strokeColor(STATE_COLOUR.broken).stroke()
  // configured rate (its label above the point) and maximum rate (its label at the foot of its line): apart by construction
  if (u.worstMarginUi !== null && u.baud >= pts[0]!.baud && u.baud <= pts[pts.length - 1]!.baud) {
    const cx = X(u.baud)
    const cy = Y(u.worstMarginUi)
    doc.circle(cx, cy, 2.5).fill(STATE_COLOUR[uartMarginState(u.worstMarginUi, u.requiredMarginUi, t)])
    const right = cx + 124 <= x0 + padL + pw
    // below the point when above it would meet the maximum's label at the top of the plot
    const ly = cy - 10 < y0 + 14 ? cy + 4 : cy - 10
    L.mono(`link ${eng(u.baud, 'Bd', 4)}: ${formatUi(u.worstMarginUi)}`, right ? cx + 4 : cx - 124, ly, { size: 6.5, width: 120, align: right ? 'left' : 'right' })
  }
  if (u.maxBaud !== null && u.maxBaud >= pts[0]!.baud && u.maxBaud <= pts[pts.length - 1]!.baud) {
    const mx = X(u.maxBaud)
    doc.moveTo(mx, y0).lineTo(mx, y0 + ph).lineWidth(0.6).dash(1, { space: 2 }).strokeColor(INK).stroke().undash()
    const right = mx + 94 <= x0 + padL + pw
    L.mono(`max ${eng(u.maxBaud, 'Bd', 4)}${u.maxBaudCapped ? ' (search limit)' : ''}`, right ? mx + 3 : mx - 93, y0 + 3, { size: 6.5, width: 90, align: right ? 'left' : 'right' })
  }
  doc.y = y0 + h + 4
  if (clipped) {
    const at = pts.find((p) => p.marginUi === lowest)!
    doc.x = x0
    L.text(`The curve leaves the axis below ${formatUi(ymin)} from ${eng(clipped.baud, 'Bd', 4)} (rose line along the floor); its lowest margin is ${formatUi(lowest)} at ${eng(at.baud, 'Bd', 4)}.`, { size: 7, colour: STATE_COLOUR.broken, width: w })
  }
}

/** A bus timeline the engine drew: lanes of levels, shaded windows (green passes, rose fails, grey neutral) and dashed marks. */
export function drawBusTimeline(L: Layout, tl: BusTimeline, x0: number, y0: number, w: number) {
  const doc = L.doc
  const labelW = 110
  const laneH = 34
  const all = tl.lanes.flatMap((l) => l.points.map((p) => p[0]))
  const t0 = Math.min(...all)
  const t1 = t0 + tl.span
  const X = (t: number) => x0 + labelW + ((Math.max(t0, Math.min(t1, t)) - t0) / (t1 - t0)) * (w - labelW)
  for (const win of tl.windows) {
    const y = y0 + win.lane * laneH
    const colour = win.pass === null ? MUTED : win.pass ? STATE_COLOUR.healthy : STATE_COLOUR.broken
    doc.rect(X(win.t0), y + 2, Math.max(0.8, X(win.t1) - X(win.t0)), laneH - 10).fillOpacity(0.18).fill(colour).fillOpacity(1)
    L.mono(`${win.label}${win.pass === false ? ' (fails)' : ''}`, X(win.t0) + 1, y + laneH - 8, { size: 5.5, colour, width: 160 })
  }
  tl.lanes.forEach((lane, i) => {
    const y = y0 + i * laneH
    L.mono(lane.label, x0, y + 9, { size: 6.5, width: labelW - 4 })
    const Y = (v: number) => y + 22 - v * 18
    lane.points.forEach((p, k) => (k ? doc.lineTo(X(p[0]), Y(p[1])) : doc.moveTo(X(p[0]), Y(p[1]))))
    doc.lineWidth(0.9).strokeColor(INK).stroke()
  })
  const bottom = y0 + tl.lanes.length * laneH
  for (const m of tl.marks) {
    doc.moveTo(X(m.t), y0).lineTo(X(m.t), bottom).lineWidth(0.6).dash(2, { space: 2 }).strokeColor('#0369a1').stroke().undash()
    L.mono(m.label, X(m.t) + 2, y0 - 7, { size: 5.5, colour: '#0369a1', width: 150 })
  }
  L.mono(`${formatEng(t0, 's')} … ${formatEng(t1, 's')}`, x0 + labelW, bottom + 2, { size: 6, colour: MUTED, width: w - labelW })
  doc.y = bottom + 14
}

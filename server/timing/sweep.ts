/**
 * Pull-up sweep (timing-model.md section 5): for every standard pull-up RL of an E series
 * in a range (and, when the stage has a base-emitter resistor, every RBE of E12 in its
 * range), the collector current, the LED current needed for saturation with the derated
 * CTR and the chosen overdrive, the standard LED resistor that still delivers it, the
 * ratings, the switching times the calibrated coupler model predicts at that RL, IF and
 * RBE, and the link's margin at the target baud and its maximum baud (on an RS-485 half-duplex
 * link also the driver-enable turnaround, whose data path runs through the coupler). Recommends the row
 * that meets the target with the least LED current (longest LED life), flags the faster
 * alternatives, and when no row meets the target evaluates the circuit changes a hardware
 * engineer tries next.
 */
import { DigitalStage, type Link, type PhototransistorStage, type StageSpec, type ThresholdSpec } from '../../shared/schemas/link'
import { VBE_HIGH, driverDropOf, rbeDivertedCurrent } from '../../shared/utils/coupler'
import { formatEng } from '../../shared/utils/units'
import { GENERIC_LOGIC_OUTPUT_COUPLER, schmittBufferFor } from '../../shared/parts/generic'
import { analyzeParsedLink, notFunctionalReason, type Verdict } from './analyze'
import { analyzeChain, type ChainAnalysis } from './chain'
import { EngineInputError } from './errors'
import { analyzeRs485Link } from './rs485'
import { nearestNotAbove, seriesValues, type SeriesName } from './eseries'
import { ctrDeratingOf, phototransistorInverts, phototransistorModel } from './phototransistor'
import { fixedClockCases, frameLayout, marginAndMaxBaud, statedClockErrors, type ClockErrors, type Distortion, type FixedClockCases, type MarginAndMaxBaud } from './uart'
import type { UartChannelResult } from './uart'
import type { BusCheck, PullupSweepOptions, PullupSweepRow, SweepAdvice, PullupSweepResult } from '../../shared/types/analysis'
export type { PullupSweepOptions, PullupSweepRow, SweepAdvice, PullupSweepResult }





/** Most rows a sweep computes (E96 over ten decades is 960). */
export const SWEEP_MAX_ROWS = 1000
/** Default RBE range swept when the stage has a base-emitter resistor, ohms. */
export const RBE_SWEEP_RANGE = [47e3, 1e6] as const

/** Everything a row's evaluation shares: the swept direction's cases and the rest of the link's result. */
interface SweepContext {
  link: Link
  ci: number
  stageIndex: number
  base: PhototransistorStage
  targetBaud: number
  requiredMarginUi: number
  cases: FixedClockCases
  cap: number
  others: UartChannelResult[]
  receiverInvert: boolean
  scratch: MarginAndMaxBaud
  /** RS-485 half duplex: every channel's chain at the base values (the turnaround is re-checked with the row's data channel). */
  chains: ChainAnalysis[] | null
}

/**
 * Sweep the pull-up of the phototransistor stage `stageIndex` of channel `channelId`
 * over the standard values of `options.series` in [rlMin, rlMax].
 */
export function sweepPullup(link: Link, channelId: string, stageIndex: number, options: PullupSweepOptions): PullupSweepResult {
  const { ci, base } = checkTarget(link, channelId, stageIndex)
  const o = checkOptions(link, options)
  const rls = seriesValues(o.series as SeriesName, o.rlMin, o.rlMax)
  const rbeValues = base.rbe !== undefined ? seriesValues('E12', o.rbeMin, o.rbeMax) : []
  const rbes: (number | null)[] = base.rbe !== undefined ? [null, ...rbeValues] : [null]
  if (rls.length * rbes.length > SWEEP_MAX_ROWS)
    throw new EngineInputError(['rlMax'], `the ranges hold ${rls.length * rbes.length} rows; at most ${SWEEP_MAX_ROWS} per sweep`)

  const ctx = sweepContext(link, ci, stageIndex, base, o.targetBaud)
  const rows = rls.flatMap((rl) => rbes.map((rbe) => sweepRow(ctx, rl, rbe, o.series, o.overdrive)))
  const commonNotes = hoistCommonNotes(rows)
  const { recommended, alternatives } = recommend(rows)
  const advice = recommended === null ? adviseCircuitChanges(ctx, rows, o) : null
  const ctr = base.ctrMin * ctrDeratingOf(base)
  return {
    channelId,
    stageIndex,
    series: o.series,
    targetBaud: o.targetBaud,
    overdrive: o.overdrive,
    requiredMarginUi: ctx.requiredMarginUi,
    rows,
    rbeValues,
    recommended,
    alternatives,
    commonNotes,
    points: base.characterization.map((p) => ({
      rl: p.rl,
      ledCurrent: p.ledCurrent ?? null,
      ...(p.tplh !== undefined ? { tplh: p.tplh } : {}),
      ...(p.tphl !== undefined ? { tphl: p.tphl } : {}),
      ...(p.tr !== undefined ? { tr: p.tr } : {}),
      ...(p.tf !== undefined ? { tf: p.tf } : {}),
    })),
    advice,
    assumptions: [
      `Pull-up sweep: the LED resistor is the largest ${o.series} value that still gives the LED current for saturation with CTR ${(ctr * 100).toPrecision(3)} % (minimum x derating) and overdrive ${o.overdrive}${base.rbe !== undefined ? ', plus the current each row\'s RBE diverts' : ''}; the drive loses the driver's own ${formatEng(driverDropOf(base), 'V')}.`,
      "Pull-up sweep: each row's switching times come from the calibrated coupler model at that row's RL, LED current and RBE.",
      'Pull-up sweep: a row is feasible when no absolute maximum is exceeded, the output saturates, and the margin at the target baud meets the required margin.',
      ...(rbeValues.length ? ['Pull-up sweep: RBE runs over the E12 values of its range; a row without RBE (open base) is included for comparison.'] : []),
    ],
  }
}

/** The channel and the phototransistor stage being swept, or a 400 naming what is wrong. */
function checkTarget(link: Link, channelId: string, stageIndex: number): { ci: number; base: PhototransistorStage } {
  const ci = link.channels.findIndex((c) => c.id === channelId)
  if (ci < 0) throw new EngineInputError(['channelId'], `no channel '${channelId}' in the link`)
  const base = link.channels[ci]!.stages[stageIndex]
  if (!base || base.kind !== 'phototransistor')
    throw new EngineInputError(['channels', ci, 'stages', stageIndex], `stage ${stageIndex} of channel '${channelId}' is not a phototransistor stage`)
  if ((link.protocol !== 'uart' && link.protocol !== 'rs485') || !link.uart)
    throw new EngineInputError(['protocol'], 'the pull-up sweep computes UART margins: the link must be a UART or RS-485 link')
  return { ci, base }
}

/** The options with their defaults, or a 400 naming the bad one. */
function checkOptions(link: Link, options: PullupSweepOptions) {
  const series = options.series
  if (series !== 'E12' && series !== 'E24' && series !== 'E96') throw new EngineInputError(['series'], 'series must be E12, E24 or E96')
  const { rlMin, rlMax } = options
  if (!(rlMin > 0) || !(rlMax > 0) || !Number.isFinite(rlMin) || !Number.isFinite(rlMax))
    throw new EngineInputError(['rlMin'], 'rlMin and rlMax must be positive resistances')
  if (rlMin > rlMax) throw new EngineInputError(['rlMin'], 'rlMin must not exceed rlMax')
  const overdrive = options.overdrive ?? 1
  if (!(overdrive > 0) || !Number.isFinite(overdrive)) throw new EngineInputError(['overdrive'], 'overdrive must be a positive number')
  const targetBaud = options.targetBaud ?? link.uart!.baud
  if (!(targetBaud > 0) || !Number.isFinite(targetBaud)) throw new EngineInputError(['targetBaud'], 'targetBaud must be a positive baud rate')
  const rbeMin = options.rbeMin ?? RBE_SWEEP_RANGE[0]
  const rbeMax = options.rbeMax ?? RBE_SWEEP_RANGE[1]
  if (!(rbeMin > 0) || !(rbeMax >= rbeMin) || !Number.isFinite(rbeMax)) throw new EngineInputError(['rbeMin'], 'rbeMin must be a positive resistance not above rbeMax')
  return { series, rlMin, rlMax, overdrive, targetBaud, rbeMin, rbeMax }
}

/**
 * One full analysis at the target baud gives everything a row does not change: the swept
 * direction's sampler, clock error bounds and search cap, and the other directions'
 * results. Each row then re-runs only the swept channel's chain and the closed-form
 * margin and maximum baud of its direction (the functions analyzeParsedLink uses).
 */
function sweepContext(link: Link, ci: number, stageIndex: number, base: PhototransistorStage, targetBaud: number): SweepContext {
  const uart = { ...link.uart!, baud: targetBaud }
  const baseAnalysis = analyzeParsedLink({ ...link, uart })
  const uartIdx = link.channels.map((c, i) => (c.role === 'uart' ? i : -1)).filter((i) => i >= 0)
  const direction = uartIdx.indexOf(ci)
  const byChannel = baseAnalysis.uart?.byChannel ?? []
  const swept = byChannel[direction]
  if (direction < 0 || !swept) throw new EngineInputError(['channelId'], `channel '${link.channels[ci]!.id}' is not a uart channel`)
  const layout = frameLayout(swept.frame.dataBits, swept.frame.parity, swept.frame.stopBits, swept.frame.backToBack)
  const errors: ClockErrors = { tx: swept.clocks.tx, rx: swept.clocks.rx }
  // the direction's ends: the first uart channel is uart.tx -> uart.rx, the second the other way
  const u = link.uart!
  const stated = direction === 0 ? statedClockErrors(u.tx, u.rx) : statedClockErrors(u.rx, u.tx)
  return {
    link,
    ci,
    stageIndex,
    base,
    targetBaud,
    requiredMarginUi: link.uart!.requiredMarginUi ?? 0.1,
    // the sampler and the clocks are fixed over the sweep: each case's clock part once
    cases: fixedClockCases(layout, swept.sampler, errors, stated),
    cap: swept.maxBaudCap,
    others: byChannel.filter((_, k) => k !== direction),
    receiverInvert: link.channels[ci]!.receiver.invert ?? false,
    scratch: { worstUi: 0, maxBaud: null },
    chains: link.protocol === 'rs485' && link.rs485 && (link.rs485.duplex ?? 'half') === 'half' ? link.channels.map((ch, i) => analyzeChain(ch, { path: ['channels', i] })) : null,
  }
}

/**
 * The link's margin, maximum baud and verdict with the swept channel's stages replaced; on an
 * RS-485 half-duplex link also the turnaround, whose data path runs through the swept stage.
 */
function evaluateStages(ctx: SweepContext, stages: StageSpec[]): { marginUi: number | null; maxBaud: number | null; verdict: Verdict; chain: ChainAnalysis; turnaround: BusCheck | null } {
  const channel = ctx.link.channels[ctx.ci]!
  const chain = analyzeChain({ ...channel, stages }, { path: ['channels', ctx.ci] })
  const broken = notFunctionalReason(chain, channel) !== null
  const pwd = ctx.receiverInvert ? { min: -chain.pwd.max, max: -chain.pwd.min } : chain.pwd
  const d: Distortion = { pwd, jitterPeak: chain.jitterPeak, jitterRms: chain.jitterRms }
  marginAndMaxBaud(ctx.cases, d, ctx.targetBaud, ctx.requiredMarginUi, ctx.cap, ctx.scratch)
  let margin: number | null = broken ? null : ctx.scratch.worstUi
  let max: number | null = broken ? null : ctx.scratch.maxBaud
  const verdicts: Verdict[] = [margin === null ? 'fail' : margin >= ctx.requiredMarginUi ? 'pass' : margin >= 0 ? 'marginal' : 'fail']
  for (const o of ctx.others) {
    margin = margin === null || o.worstMarginUi === null ? null : Math.min(margin, o.worstMarginUi)
    max = max === null || o.maxBaud === null ? null : Math.min(max, o.maxBaud)
    verdicts.push(o.verdict)
  }
  let turnaround: BusCheck | null = null
  if (ctx.chains) {
    const channels = ctx.link.channels.slice()
    channels[ctx.ci] = { ...channel, stages }
    const chains = ctx.chains.slice()
    chains[ctx.ci] = chain
    const t = analyzeRs485Link({ ...ctx.link, uart: { ...ctx.link.uart!, baud: ctx.targetBaud }, channels }, chains).result
    turnaround = t.checks.find((c) => !c.pass) ?? null
    if (turnaround) verdicts.push('fail')
  }
  const verdict: Verdict = verdicts.includes('fail') ? 'fail' : verdicts.includes('marginal') ? 'marginal' : 'pass'
  return { marginUi: margin, maxBaud: max, verdict, chain, turnaround }
}

/** One row: the LED resistor for saturation at this RL and RBE, the stage with it, and the link's margin. */
function sweepRow(ctx: SweepContext, rl: number, rbe: number | null, series: 'E12' | 'E24' | 'E96', overdrive: number): PullupSweepRow {
  const base = ctx.base
  const ctr = base.ctrMin * ctrDeratingOf(base)
  const vceSat = base.vceSat ?? 0.4
  const headroom = base.driveVoltage - base.vf - driverDropOf(base)
  const ic = Math.max(0, base.vcc - vceSat) / rl
  const diverted = rbeDivertedCurrent(rbe ?? undefined, base.hfe, VBE_HIGH)
  const ledCurrentRequired = (ic * overdrive + diverted) / ctr
  const reasons: string[] = []
  const notes: string[] = []
  let rLed: number | null = null
  let ledCurrent: number | null = null
  const rbeField = rbe !== null ? { rbe } : { rbe: undefined }
  let stage: PhototransistorStage
  if (headroom > 0 && ledCurrentRequired > 0) {
    // the largest standard resistor not above headroom / IF still gives at least IF
    rLed = nearestNotAbove(headroom / ledCurrentRequired, series)
    ledCurrent = headroom / rLed
    stage = { ...base, rl, rLed, ledCurrent: undefined, ...rbeField }
  } else {
    reasons.push(
      headroom > 0
        ? 'The output supply gives no swing above VCE(sat).'
        : `Drive voltage ${formatEng(base.driveVoltage, 'V')} does not exceed the LED forward voltage ${formatEng(base.vf, 'V')} plus the driver's own drop.`,
    )
    stage = { ...base, rl, rLed: undefined, ledCurrent: ledCurrentRequired, ...rbeField }
  }
  let marginUi: number | null = null
  let maxBaud: number | null = null
  let verdict: PullupSweepRow['verdict'] = null
  let turnaround: BusCheck | null = null
  let reduced: Pick<ReturnType<typeof phototransistorModel>, 'model' | 'operating' | 'warnings'>
  if (ledCurrent !== null) {
    const stages = ctx.link.channels[ctx.ci]!.stages.slice()
    stages[ctx.stageIndex] = stage
    const e = evaluateStages(ctx, stages)
    ;({ marginUi, maxBaud, verdict, turnaround } = e)
    // the chain already reduced the stage: take its model and warnings
    const c = e.chain.stages[ctx.stageIndex]!
    reduced = { model: c.model, operating: c.operating!, warnings: e.chain.warnings.filter((w) => w.stage === ctx.stageIndex) }
  } else {
    reduced = phototransistorModel(stage)
  }
  for (const w of reduced.warnings) {
    if (w.code === 'absolute-maximum' || w.code === 'unsaturated') reasons.push(w.message)
    else notes.push(w.message)
  }
  const withinRatings = reasons.length === 0
  const missed = ledCurrent !== null ? targetMisses(ctx, marginUi, turnaround) : []
  const meetsTarget = marginUi !== null && missed.length === 0
  reasons.push(...missed)
  const m = reduced.model
  return {
    rl,
    rbe,
    ic,
    ledCurrentRequired,
    rLed,
    ledCurrent,
    overdrive: reduced.operating.overdrive,
    power: reduced.operating.power,
    tplh: m.tplh.typ,
    tphl: m.tphl.typ,
    tr: m.tr.typ,
    tf: m.tf.typ,
    withinRatings,
    meetsTarget,
    feasible: withinRatings && meetsTarget,
    reasons,
    notes,
    marginUi,
    maxBaud,
    verdict,
    fasterAlternative: false,
  }
}

/** Why a row misses the target: its margin at the target baud, and on RS-485 the turnaround. */
function targetMisses(ctx: SweepContext, marginUi: number | null, turnaround: BusCheck | null): string[] {
  const misses: string[] = []
  if (marginUi === null) misses.push(`No margin at ${formatEng(ctx.targetBaud, 'Bd')}: the link cannot carry data.`)
  else if (marginUi < ctx.requiredMarginUi)
    misses.push(`Margin ${marginUi.toFixed(3)} UI at ${formatEng(ctx.targetBaud, 'Bd')} is below the required ${ctx.requiredMarginUi} UI.`)
  if (turnaround) misses.push(`RS-485 turnaround fails: ${turnaround.label} is short by ${formatEng(-turnaround.slack, 's')}.`)
  return misses
}

/** Notes every row shares (same words once the numbers are set aside) are stated once for the sweep. */
function hoistCommonNotes(rows: PullupSweepRow[]): string[] {
  if (!rows.length) return []
  const shape = (n: string) => n.replace(/-?\d+(\.\d+)?(e[-+]?\d+)?\s?[fpnuµmkMG]?(Ω|A|F|V|s|W|Bd|%)?/g, '#')
  const counts = new Map<string, { n: number; example: string }>()
  for (const r of rows)
    for (const s of new Set(r.notes.map(shape))) {
      const c = counts.get(s)
      counts.set(s, { n: (c?.n ?? 0) + 1, example: c?.example ?? r.notes.find((n) => shape(n) === s)! })
    }
  const common = [...counts.entries()].filter(([, c]) => c.n === rows.length)
  const commonShapes = new Set(common.map(([s]) => s))
  for (const r of rows) r.notes = r.notes.filter((n) => !commonShapes.has(shape(n)))
  return common.map(([, c]) => c.example)
}

/** Least LED current among feasible rows (ties: the larger margin); the faster feasible rows as alternatives. */
function recommend(rows: PullupSweepRow[]): { recommended: number | null; alternatives: number[] } {
  let recommended: number | null = null
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]!
    if (!r.feasible) continue
    const best = recommended === null ? null : rows[recommended]!
    if (
      best === null ||
      r.ledCurrent! < best.ledCurrent! * (1 - 1e-12) ||
      (Math.abs(r.ledCurrent! - best.ledCurrent!) <= 1e-12 * best.ledCurrent! && r.marginUi! > best.marginUi!)
    )
      recommended = i
  }
  const alternatives: number[] = []
  if (recommended !== null) {
    const recBaud = rows[recommended]!.maxBaud ?? 0
    for (let i = 0; i < rows.length; i++) {
      const r = rows[i]!
      if (i !== recommended && r.feasible && (r.maxBaud ?? 0) > recBaud) {
        r.fasterAlternative = true
        alternatives.push(i)
      }
    }
    alternatives.sort((a, b) => (rows[b]!.maxBaud ?? 0) - (rows[a]!.maxBaud ?? 0))
  }
  return { recommended, alternatives }
}

/**
 * No row meets the target: the highest rate a row within ratings reaches, and what each
 * circuit change gives at the target (a base-emitter resistor, a Schmitt-trigger buffer
 * after the coupler, a logic-output coupler in its place, a lower rate).
 */
function adviseCircuitChanges(ctx: SweepContext, rows: PullupSweepRow[], o: ReturnType<typeof checkOptions>): NonNullable<PullupSweepResult['advice']> {
  let bestRow: number | null = null
  rows.forEach((r, i) => {
    if (r.withinRatings && r.maxBaud !== null && (bestRow === null || r.maxBaud > rows[bestRow]!.maxBaud!)) bestRow = i
  })
  const best = bestRow === null ? null : rows[bestRow]!
  const reachedBaud = best?.maxBaud ?? null
  const options: SweepAdvice[] = []
  const atCap = (max: number | null) => max !== null && max >= ctx.cap * (1 - 1e-9)
  const stagesWith = (replace: (stages: StageSpec[]) => void) => {
    const stages = ctx.link.channels[ctx.ci]!.stages.slice()
    if (best) stages[ctx.stageIndex] = { ...ctx.base, rl: best.rl, rLed: best.rLed ?? undefined, ledCurrent: best.rLed === null ? best.ledCurrentRequired : undefined, rbe: best.rbe ?? ctx.base.rbe }
    replace(stages)
    return stages
  }
  const judge = (change: SweepAdvice['change'], description: string, stages: StageSpec[]): SweepAdvice => {
    const e = evaluateStages(ctx, stages)
    return { change, description, marginUi: e.marginUi, maxBaud: e.maxBaud, maxBaudCapped: atCap(e.maxBaud), meetsTarget: e.marginUi !== null && e.marginUi >= ctx.requiredMarginUi && e.turnaround === null }
  }
  if (ctx.base.rbe === undefined) {
    // a part with a base pin: the E12 RBE that gives the best margin at the best row's pull-up
    let pick: SweepAdvice | null = null
    for (const rbe of seriesValues('E12', o.rbeMin, o.rbeMax)) {
      if (!best) break
      const row = sweepRow(ctx, best.rl, rbe, o.series, o.overdrive)
      if (!row.withinRatings || row.marginUi === null) continue
      const a: SweepAdvice = {
        change: 'rbe',
        description: `A coupler with a base pin and a ${formatEng(rbe, 'Ω')} base-emitter resistor at RL ${formatEng(row.rl, 'Ω')}, LED resistor ${formatEng(row.rLed, 'Ω')} (hFE ${ctx.base.hfe ?? 'assumed'}).`,
        marginUi: row.marginUi,
        maxBaud: row.maxBaud,
        maxBaudCapped: atCap(row.maxBaud),
        meetsTarget: row.meetsTarget,
      }
      if (!pick || (a.marginUi ?? -Infinity) > (pick.marginUi ?? -Infinity)) pick = a
    }
    if (pick) options.push(pick)
  }
  const buffer = DigitalStage.parse(schmittBufferFor(ctx.base.vcc))
  options.push(
    judge(
      'schmitt-buffer',
      `A Schmitt-trigger buffer after the coupler (${buffer.name}, VT+ ${thresholdText(buffer.schmittInput!.vtPlus)}), which reads the slow rise at its threshold and hands the receiver a fast edge.`,
      stagesWith((s) => s.splice(ctx.stageIndex + 1, 0, buffer)),
    ),
  )
  options.push(
    judge(
      'logic-output-coupler',
      `A logic-output coupler in place of the phototransistor coupler (${GENERIC_LOGIC_OUTPUT_COUPLER.name}, class values).`,
      stagesWith((s) => {
        s[ctx.stageIndex] = DigitalStage.parse({ ...GENERIC_LOGIC_OUTPUT_COUPLER, inverting: phototransistorInverts(ctx.base.wiring ?? 'collector', ctx.base.ledOnWhen ?? 'high') })
      }),
    ),
  )
  if (reachedBaud !== null)
    options.push({
      change: 'lower-rate',
      description: `Run the link at ${formatEng(reachedBaud, 'Bd')} or below: the fastest a pull-up within ratings reaches (RL ${formatEng(best!.rl, 'Ω')}).`,
      marginUi: null,
      maxBaud: reachedBaud,
      maxBaudCapped: false,
      meetsTarget: false,
    })
  return { bestRow, reachedBaud, options }
}

/** A threshold as text: one value, or its range. */
function thresholdText(t: ThresholdSpec): string {
  return typeof t === 'number' ? formatEng(t, 'V') : `${formatEng(t.min, 'V')} to ${formatEng(t.max, 'V')}`
}

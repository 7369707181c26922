/**
 * Pull-up sweep (timing-model.md section 5): for every standard pull-up RL of an E
 * series in a range, the collector current, the LED current needed for saturation
 * with the derated CTR and the chosen overdrive, the standard LED resistor that still
 * delivers it, the ratings, the predicted switching times, and the link's margin at
 * the target baud and its maximum baud. Recommends the row that meets the target with
 * the least LED current (longest LED life) and flags the faster alternatives.
 */
import type { Link, PhototransistorStage } from '../../shared/schemas/link'
import { analyzeLink, type Verdict } from './analyze'
import { analyzeChain } from './chain'
import { EngineInputError } from './errors'
import { nearestNotAbove, seriesValues, type SeriesName } from './eseries'
import { ctrDeratingOf, phototransistorModel, type PhototransistorOperating } from './phototransistor'
import type { StageEdgeModel, Warning } from './types'
import { fixedClockCases, frameLayout, marginAndMaxBaud, type ClockErrors, type Distortion, type MarginAndMaxBaud } from './uart'

export interface PullupSweepOptions {
  /** E series for both RL and the LED resistor */
  series: 'E12' | 'E24' | 'E96'
  /** pull-up range, ohms (inclusive) */
  rlMin: number
  rlMax: number
  /** IC available / IC needed that the LED current must give (default 1: the derating factors carry the margin) */
  overdrive?: number
  /** baud at which each row's margin is computed (default: the link's baud) */
  targetBaud?: number
}

export interface PullupSweepRow {
  /** pull-up (load) resistor, ohms */
  rl: number
  /** collector current for saturation, (VCC - VCE(sat)) / RL, amperes */
  ic: number
  /** LED current giving ic x overdrive with the derated minimum CTR, amperes */
  ledCurrentRequired: number
  /** largest standard LED resistor that still gives ledCurrentRequired, ohms; null when the drive cannot */
  rLed: number | null
  /** LED current with that resistor, amperes; null when the drive cannot light the LED */
  ledCurrent: number | null
  /** overdrive actually reached with rLed */
  overdrive: number
  /** static on-state coupler dissipation, watts */
  power: number
  /** predicted typical switching times at this RL, seconds */
  tplh: number
  tphl: number
  tr: number
  tf: number
  /** no absolute maximum exceeded, output saturates */
  withinRatings: boolean
  /** the link's worst margin at the target baud meets its required margin */
  meetsTarget: boolean
  /** withinRatings and meetsTarget */
  feasible: boolean
  /** why the row is not feasible (empty when it is) */
  reasons: string[]
  /** other warnings for this row (extrapolation, single-point fit ...) */
  notes: string[]
  /** the link's worst margin at the target baud (worst uart direction), UI; null when not computed (the LED cannot light) */
  marginUi: number | null
  /** the link's highest baud meeting the required margin (lowest over its directions); null when none (or not computed) */
  maxBaud: number | null
  /** the analysis verdict at the target baud */
  verdict: 'pass' | 'marginal' | 'fail' | null
  /** feasible and faster (higher maxBaud) than the recommended row */
  fasterAlternative: boolean
}

export interface PullupSweepResult {
  channelId: string
  stageIndex: number
  series: 'E12' | 'E24' | 'E96'
  targetBaud: number
  overdrive: number
  requiredMarginUi: number
  rows: PullupSweepRow[]
  /** index of the recommended row, null when no row is feasible */
  recommended: number | null
  /** indices of the faster feasible alternatives, fastest first */
  alternatives: number[]
  assumptions: string[]
}

/** Most rows a sweep computes (E96 over ten decades is 960). */
export const SWEEP_MAX_ROWS = 1000

/**
 * Sweep the pull-up of the phototransistor stage `stageIndex` of channel `channelId`
 * over the standard values of `options.series` in [rlMin, rlMax].
 */
export function sweepPullup(link: Link, channelId: string, stageIndex: number, options: PullupSweepOptions): PullupSweepResult {
  const ci = link.channels.findIndex((c) => c.id === channelId)
  if (ci < 0) throw new EngineInputError(['channelId'], `no channel '${channelId}' in the link`)
  const channel = link.channels[ci]!
  const base = channel.stages[stageIndex]
  if (!base || base.kind !== 'phototransistor')
    throw new EngineInputError(['channels', ci, 'stages', stageIndex], `stage ${stageIndex} of channel '${channelId}' is not a phototransistor stage`)
  if (link.protocol !== 'uart' || !link.uart)
    throw new EngineInputError(['protocol'], 'the pull-up sweep computes UART margins: the link must be a UART link')
  const series = options.series
  if (series !== 'E12' && series !== 'E24' && series !== 'E96')
    throw new EngineInputError(['series'], 'series must be E12, E24 or E96')
  const { rlMin, rlMax } = options
  if (!(rlMin > 0) || !(rlMax > 0) || !Number.isFinite(rlMin) || !Number.isFinite(rlMax))
    throw new EngineInputError(['rlMin'], 'rlMin and rlMax must be positive resistances')
  if (rlMin > rlMax) throw new EngineInputError(['rlMin'], 'rlMin must not exceed rlMax')
  const overdrive = options.overdrive ?? 1
  if (!(overdrive > 0) || !Number.isFinite(overdrive)) throw new EngineInputError(['overdrive'], 'overdrive must be a positive number')
  const targetBaud = options.targetBaud ?? link.uart.baud
  if (!(targetBaud > 0) || !Number.isFinite(targetBaud)) throw new EngineInputError(['targetBaud'], 'targetBaud must be a positive baud rate')
  const rls = seriesValues(series as SeriesName, rlMin, rlMax)
  if (rls.length > SWEEP_MAX_ROWS)
    throw new EngineInputError(['rlMax'], `the range holds ${rls.length} values; at most ${SWEEP_MAX_ROWS} per sweep`)

  const requiredMarginUi = link.uart.requiredMarginUi ?? 0.1
  const ctr = base.ctrMin * ctrDeratingOf(base)
  const vceSat = base.vceSat ?? 0.4
  const headroom = base.driveVoltage - base.vf
  const uart = { ...link.uart, baud: targetBaud }

  // One full analysis at the target baud gives everything a row does not change: the
  // swept direction's sampler, clock error bounds and search cap, and the other
  // direction's result. Each row then re-runs only the swept channel's chain and the
  // closed-form margin and maximum-baud of its direction (the same functions
  // analyzeLink uses), which keeps a 300-row sweep to milliseconds.
  const baseAnalysis = analyzeLink({ ...link, uart })
  const uartIdx = link.channels.map((c, i) => (c.role === 'uart' ? i : -1)).filter((i) => i >= 0)
  const direction = uartIdx.indexOf(ci)
  const byChannel = baseAnalysis.uart?.byChannel ?? []
  const swept = byChannel[direction]
  if (direction < 0 || !swept) throw new EngineInputError(['channelId'], `channel '${channelId}' is not a uart channel`)
  const others = byChannel.filter((_, k) => k !== direction)
  const layout = frameLayout(swept.frame.dataBits, swept.frame.parity, swept.frame.stopBits, swept.frame.backToBack)
  const errors: ClockErrors = { tx: swept.clocks.tx, rx: swept.clocks.rx }
  // the sampler and the clocks are fixed over the sweep: each case's clock part once
  const cases = fixedClockCases(layout, swept.sampler, errors)
  const own: MarginAndMaxBaud = { worstUi: 0, maxBaud: null }
  const receiverInvert = channel.receiver.invert ?? false

  /** The link's margin, maximum baud and verdict with the swept channel's stages replaced. */
  const evaluate = (stages: Link['channels'][number]['stages']) => {
    const chain = analyzeChain({ ...channel, stages }, { path: ['channels', ci] })
    const inverted = (chain.polarity === 'inverted') !== receiverInvert
    const unsaturated = chain.stages.some((s) => s.operating && !s.operating.saturated)
    const functional = chain.reachable && !inverted && !unsaturated
    const pwd = receiverInvert ? { min: -chain.pwd.max, max: -chain.pwd.min } : chain.pwd
    const d: Distortion = { pwd, jitterPeak: chain.jitterPeak, jitterRms: chain.jitterRms }
    marginAndMaxBaud(cases, d, targetBaud, requiredMarginUi, swept.maxBaudCap, own)
    let margin = own.worstUi
    let max: number | null = own.maxBaud
    const verdicts: Verdict[] = [!functional ? 'fail' : own.worstUi >= requiredMarginUi ? 'pass' : own.worstUi >= 0 ? 'marginal' : 'fail']
    for (const o of others) {
      margin = Math.min(margin, o.worstMarginUi)
      max = max === null || o.maxBaud === null ? null : Math.min(max, o.maxBaud)
      verdicts.push(o.verdict)
    }
    const verdict: Verdict = verdicts.includes('fail') ? 'fail' : verdicts.includes('marginal') ? 'marginal' : 'pass'
    return { marginUi: margin, maxBaud: max, verdict, chain }
  }

  const rows: PullupSweepRow[] = rls.map((rl) => {
    const ic = Math.max(0, base.vcc - vceSat) / rl
    const ledCurrentRequired = (ic * overdrive) / ctr
    const reasons: string[] = []
    const notes: string[] = []
    let rLed: number | null = null
    let ledCurrent: number | null = null
    let stage: PhototransistorStage
    if (headroom > 0 && ledCurrentRequired > 0) {
      // the largest standard resistor not above headroom / IF still gives at least IF
      rLed = nearestNotAbove(headroom / ledCurrentRequired, series)
      ledCurrent = headroom / rLed
      stage = { ...base, rl, rLed, ledCurrent: undefined }
    } else {
      reasons.push(
        headroom > 0
          ? 'The output supply gives no swing above VCE(sat).'
          : `Drive voltage ${base.driveVoltage} V does not exceed the LED forward voltage ${base.vf} V.`,
      )
      stage = { ...base, rl, rLed: undefined, ledCurrent: ledCurrentRequired }
    }
    let marginUi: number | null = null
    let maxBaud: number | null = null
    let verdict: PullupSweepRow['verdict'] = null
    let model: StageEdgeModel
    let operating: PhototransistorOperating
    let warnings: Warning[]
    if (ledCurrent !== null) {
      const stages = channel.stages.slice()
      stages[stageIndex] = stage
      const e = evaluate(stages)
      ;({ marginUi, maxBaud, verdict } = e)
      // the chain already reduced the stage: take its model and warnings
      const c = e.chain.stages[stageIndex]!
      model = c.model
      operating = c.operating!
      warnings = e.chain.warnings.filter((w) => w.stage === stageIndex)
    } else {
      ;({ model, operating, warnings } = phototransistorModel(stage))
    }
    for (const w of warnings) {
      if (w.code === 'absolute-maximum' || w.code === 'unsaturated') reasons.push(w.message)
      else notes.push(w.message)
    }
    const withinRatings = reasons.length === 0
    const meetsTarget = marginUi !== null && marginUi >= requiredMarginUi
    if (ledCurrent !== null && !meetsTarget)
      reasons.push(
        marginUi === null
          ? `No margin at ${targetBaud} Bd.`
          : `Margin ${marginUi.toFixed(3)} UI at ${targetBaud} Bd is below the required ${requiredMarginUi} UI.`,
      )
    return {
      rl,
      ic,
      ledCurrentRequired,
      rLed,
      ledCurrent,
      overdrive: operating.overdrive,
      power: operating.power,
      tplh: model.tplh.typ,
      tphl: model.tphl.typ,
      tr: model.tr.typ,
      tf: model.tf.typ,
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
  })

  // least LED current among feasible rows; ties go to the larger margin
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

  return {
    channelId,
    stageIndex,
    series,
    targetBaud,
    overdrive,
    requiredMarginUi,
    rows,
    recommended,
    alternatives,
    assumptions: [
      `Pull-up sweep: the LED resistor is the largest ${series} value that still gives the LED current for saturation with CTR ${(ctr * 100).toPrecision(3)} % (minimum x derating) and overdrive ${overdrive}.`,
      'Pull-up sweep: switching times follow the stage characterisation at each RL; the LED current does not change them.',
      'Pull-up sweep: a row is feasible when no absolute maximum is exceeded, the output saturates, and the margin at the target baud meets the required margin.',
    ],
  }
}

/**
 * The timing engine's public entry points (issue 3). Pure TypeScript: relative
 * imports only, loadable by plain Node tooling.
 */
export { analyzeLink, analyzeParsedLink, parseLink } from './analyze'
export type { LinkAnalysis, ChannelResult, UartResult, Verdict } from './analyze'
export { analyzeChain } from './chain'
export type { ChainAnalysis, StageContribution } from './chain'
export { baudGenerator, rateErrorBounds, bitTimeBounds } from './clock'
export type { BaudGeneratorResult, RateErrorBounds } from './clock'
export { EngineInputError } from './errors'
export { thresholdOffset, thresholdFraction, LN2, LN9 } from './edges'
export { qFromBer, totalJitter, gaussianTail, normalQuantile, createRng } from './statistics'
export { spreadStudy } from './spread'
export type { SpreadStudyResult, SpreadStudyOptions } from './spread'
export { analyzeUartChannel, frameLayout, samplerModel, maxBaud as uartMaxBaud, clockTolerance, bitMargins, STANDARD_BAUD_RATES, MAX_BAUD_CAP } from './uart'
export type { UartChannelResult, UartBitResult } from './uart'
export { ENGINE_VERSION } from './version'
export type { ChainResult, StageEdgeModel, Warning, Corners } from './types'
export { analyzeSpi } from './spi'
export { sweepPullup } from './sweep'
export * from './eseries'

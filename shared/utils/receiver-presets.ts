/**
 * Receiver input thresholds by logic family (timing-model.md section 1; references.md
 * 8.4-8.5): 3.3 V LVCMOS VIH 2.0 V / VIL 0.8 V, 5 V CMOS 0.7 / 0.3 VDD, 1.8 V and below
 * 0.65 / 0.35 VDD; Schmitt inputs by their VT+ / VT-. Each plain input carries its family's
 * longest tolerated input transition, so a slow edge into it is always warned about. The
 * link form offers them; the demo links use them.
 */
export const RECEIVER_PRESETS = [
  // references.md 8.4 [S/M]; max input transition: 10 ns/V over the swing, 74LVC family (from memory)
  { family: 'LVCMOS 3.3 V', vdd: 3.3, vih: 2.0, vil: 0.8, schmitt: false, maxInputTransition: 33e-9 },
  // references.md 8.4: 0.7 / 0.3 VDD; max input transition 500 ns at 4.5 V, 74HC family (from memory)
  { family: 'CMOS 5 V', vdd: 5, vih: 3.5, vil: 1.5, schmitt: false, maxInputTransition: 500e-9 },
  // references.md 8.4: 0.65 / 0.35 VDD; 10 ns/V over the swing (from memory)
  { family: 'LVCMOS 1.8 V', vdd: 1.8, vih: 1.17, vil: 0.63, schmitt: false, maxInputTransition: 18e-9 },
  // references.md 8.5 [S]: CD74HCT14 at VCC 4.5 V, VT+ 1.2..1.9 V, VT- 0.5..1.2 V
  { family: 'Schmitt HCT 5 V', vdd: 5, vih: 2.0, vil: 0.8, schmitt: true, vtPlus: { min: 1.2, max: 1.9 }, vtMinus: { min: 0.5, max: 1.2 } },
  // common practice: a 3.3 V microcontroller Schmitt input, VT+ 0.5..0.7 VDD, VT- 0.3..0.5 VDD
  { family: 'Schmitt MCU 3.3 V', vdd: 3.3, vih: 2.31, vil: 0.99, schmitt: true, vtPlus: { min: 1.65, max: 2.31 }, vtMinus: { min: 0.99, max: 1.65 } },
] as const

export type ReceiverPreset = (typeof RECEIVER_PRESETS)[number]

/**
 * The longest transition a plain (non-Schmitt) CMOS input is taken to tolerate when its
 * receiver states none, seconds (common practice: plain CMOS inputs want edges well
 * under a microsecond; slower ones oscillate or draw shoot-through current).
 */
export const DEFAULT_MAX_INPUT_TRANSITION = 1e-6

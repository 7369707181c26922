/**
 * Receiver input thresholds by logic family (timing-model.md section 1; references.md
 * 8.4): 3.3 V LVCMOS VIH 2.0 V / VIL 0.8 V, 5 V CMOS 0.7 / 0.3 VDD, 1.8 V and below
 * 0.65 / 0.35 VDD. The link form offers them; the demo links use them.
 */
export const RECEIVER_PRESETS = [
  { family: 'LVCMOS 3.3 V', vdd: 3.3, vih: 2.0, vil: 0.8, schmitt: false },
  { family: 'CMOS 5 V', vdd: 5, vih: 3.5, vil: 1.5, schmitt: false },
  { family: 'LVCMOS 1.8 V', vdd: 1.8, vih: 1.17, vil: 0.63, schmitt: false },
] as const

export type ReceiverPreset = (typeof RECEIVER_PRESETS)[number]

/**
 * RS-485 half duplex behind isolators (timing-model.md section 4, "RS-485"): the driver-enable
 * line is a channel of its own, and the turnaround is checked at the bus, after both paths'
 * delays: the driver must be on before the start bit's edge arrives (enable path at its slowest
 * plus the driver's enable time, against the data path at its fastest) and stay on until the end
 * of the last stop bit has passed (enable path at its fastest plus the driver's disable time,
 * against the data path at its slowest).
 */
import type { Rs485TurnaroundInput, Rs485TurnaroundResult } from '../../shared/types/analysis'
import { EngineInputError } from './errors'

export type { Rs485TurnaroundInput, Rs485TurnaroundResult }

export function rs485Turnaround(i: Rs485TurnaroundInput): Rs485TurnaroundResult {
  if (!(i.baud > 0)) throw new EngineInputError(['baud'], 'baud must be positive')
  if (!(i.frameBits > 0)) throw new EngineInputError(['frameBits'], 'a frame has at least one bit')
  if (i.dataPath.min > i.dataPath.max) throw new EngineInputError(['dataPath'], 'the data path\'s minimum delay is above its maximum')
  if (i.enablePath.min > i.enablePath.max) throw new EngineInputError(['enablePath'], 'the enable path\'s minimum delay is above its maximum')
  // time 0: the start bit's edge leaves TX; DE was asserted leadTime before
  const driverOn = -i.leadTime + i.enablePath.max + i.driverEnable
  const startAtBus = i.dataPath.min
  // the last stop bit ends at TX frameBits / baud after the start edge; DE is released lagTime after that
  const frameEnd = i.frameBits / i.baud
  const driverOff = frameEnd + i.lagTime + i.enablePath.min + i.driverDisable
  const stopEndAtBus = frameEnd + i.dataPath.max
  const leadSlack = startAtBus - driverOn
  const lagSlack = driverOff - stopEndAtBus
  return { leadSlack, lagSlack, pass: leadSlack >= 0 && lagSlack >= 0 }
}

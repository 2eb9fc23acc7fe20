import type { PlannedTreatment } from '../../shared/types/domain'
import type { PlannedTreatment as EngineTreatment } from '../../shared/types/measurement'

/** The one mapping from the stored treatment codes (kebab-case) to the engine's spelling. */
const ENGINE_TREATMENT: Record<PlannedTreatment, EngineTreatment> = {
  none: 'none',
  decompression: 'decompression',
  'disc-replacement': 'disc replacement',
  'interbody-fusion': 'interbody fusion',
  'posterior-fusion': 'posterior fusion',
}

export function engineTreatment(treatment: PlannedTreatment): EngineTreatment {
  return ENGINE_TREATMENT[treatment]
}

export {
  synthesizeSession,
  resolveSynthOptions,
  type SynthOptions,
  type SynthSession,
  type SynthFile,
  type SynthTruth,
  type SynthLegTruth,
  type SynthArmLegTruth,
  type SynthPlacement,
  type ArmCouplingMode,
  type ResolvedSynthOptions,
} from "./synthesize-session";
export { synthesizeSessionText } from "./synthesize-session-text";
export { createPrng, type Prng } from "./prng";
export { sensorCsvText, type SensorCsvHeader } from "./sensor-csv-text";
export * from "./kinematic";
export { bidsMotionText, type BidsMotionSet, type BidsMotionTextOptions } from "./bids-motion-text";

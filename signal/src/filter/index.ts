export { butterworthSections, sectionsToTransferFunction, type Biquad, type ButterworthKind } from "./butterworth-sections";
export { butterworthBandSections } from "./butterworth-band-sections";
export { sosFiltFilt, lowPassZeroPhase, lowPassZeroPhaseSegments } from "./zero-phase-butterworth";

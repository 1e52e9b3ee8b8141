export { sagittalAxis, projectOnAxis, MIN_AXIS_SAMPLES, type SagittalAxis } from "./sagittal-axis";
export { detectInvertedShank, detectInvertedFoot, type InversionCheck } from "./detect-inverted-segment";
export { quantileOfMasked, quantilesOfMasked } from "./quantile";
export { wristOrientation, type WristOrientation, type WristSignInput } from "./wrist-sign";

// The metric catalogue is the one description of each metric (key, unit, labels, chart, direction,
// rounding, export precision, FHIR code) shared from the analysis to the screen; see metric-catalog.ts.
export * from "./metric-catalog";

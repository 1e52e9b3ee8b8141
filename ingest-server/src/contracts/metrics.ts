// The metric catalogue is the one description of each metric (key, unit, rounding) shared from the
// analysis to the screen. It is pure data over signal's types, so the portal may read it here
// instead of reaching into the server's sources.
export { METRICS, METRIC_KEYS, metricDefinition, type CountNoun, type MetricDefinition } from "../metrics/metric-catalog";

export { METRIC_KEYS, METRICS, isMetricKey, displayPrecision, type MetricKey, type MetricDef, type UnitDef } from './registry'
export {
  toCanonical,
  fromCanonical,
  formatValue,
  supportedUnits,
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  type ConversionContext,
  type ConversionResult,
} from './units'
export * from './constants'

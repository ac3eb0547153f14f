import { kindOf } from '@shared/rules/kinds'
import type { WatchRuleSpec } from '@shared/rules/schema'

// The words are each kind's advice in shared/rules/advice.ts (`common practice`); a new kind brings its own.

/** First things a keeper should look at. */
export const whatToCheck = (spec: WatchRuleSpec, metric: string): string[] => kindOf(spec).advice.checks(spec, metric)

/** Alerts about heaters and water level carry the electrical caution. */
export const needsElectricalCaution = (spec: WatchRuleSpec, metric: string) =>
  kindOf(spec).advice.electricalCaution || metric === 'temperature' || metric === 'water_level'

/** The one thing to do first, for the first line of an alert mail. */
export const firstStep = (spec: WatchRuleSpec, metric: string, value: number | null): string => kindOf(spec).advice.firstStep(spec, metric, value)

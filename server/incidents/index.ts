// What other features may use of incidents/; everything else in the folder is its own.
export { incidentsOf } from './incidents'
export { ruleContextFor, scheduleFn, snoozeCovers } from './tank-context'
export { rulesService } from './watch-rules'

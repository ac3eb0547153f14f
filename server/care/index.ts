// What other features may use of care/; everything else in the folder is its own.
export { instantNotAhead, writeCareLog } from './care-log'
export { nitrogenReadings } from './care-readings'
export { careDueCounts, careTasksService, markTasksOfKindDone } from './care-tasks'
export { groupTests, livestockService } from './livestock'

// What other features may use of care/; everything else in the folder is its own.
export { instantNotAhead, writeCareLog } from './care-log'
export { nitrogenReadings, tankPh, tankTemperature } from './care-readings'
export { careDueCounts, careTasksService, createProbeCareTasks, dueItems, markDeviceTasksDone, markTasksOfKindDone } from './care-tasks'
export { tanksToWatch } from './tanks-to-watch'
export { groupTests, livestockService } from './livestock'
export { runningCourses, treatmentCoursesService } from './treatment-courses'

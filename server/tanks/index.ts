// What other features may use of tanks/; everything else in the folder is its own.
export { tankStatuses } from './tank-status'
export { tanksService } from './tanks'

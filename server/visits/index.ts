// What other features may use of visits/; everything else in the folder is its own.
export { visitsLeftOpen, visitsService, visitScope } from './visits'
export { closeVisit } from './close'

// What other features may use of visits/; everything else in the folder is its own.
export { visitsService, visitScope } from './visits'

// What other features may use of builds/; everything else in the folder is its own.
export { buildDaysFor, buildsService } from './builds'

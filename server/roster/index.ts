// What other features may use of roster/; everything else in the folder is its own.
export { dutyRecipients, whoIsOnDuty } from './roster'

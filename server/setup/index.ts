// What other features may use of setup/; everything else in the folder is its own.
export { checklistService } from './checklist'

// What other features may use of reports/; everything else in the folder is its own.
export { COLOURS, openDocument, section, write } from './pdf'
export type { Doc } from './pdf'

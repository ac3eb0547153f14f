// What other features may use of readings/; everything else in the folder is its own.
export { insertReadings } from './batch-writer'
export type { ReadingRow } from './batch-writer'
export { MalformedMessageError } from './ingest'
export type { FileReading } from './ingest'
export { retentionService } from './retention'
export { seriesService } from './series'
export { checkReading } from './validate-readings'

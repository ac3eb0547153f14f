// What other features may use of calibration/; everything else in the folder is its own.
export { currentCorrections } from './corrections'
export { calibrationsService } from './calibrations'

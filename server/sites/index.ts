// What other features may use of sites/; everything else in the folder is its own.
export { sitesService } from './sites'
export { wallFromToken, wallStillValid } from './wall-tokens'

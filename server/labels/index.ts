// What other features may use of labels/; everything else in the folder is its own.
export { labelsService } from './labels'

// What other features may use of livestock/; everything else in the folder is its own.
export { batchesService } from './batches'
export { batchMovesService } from './batch-moves'
export { stockService } from './stock'

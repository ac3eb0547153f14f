// What other features may use of clients/; everything else in the folder is its own.
export { clientsService } from './clients'

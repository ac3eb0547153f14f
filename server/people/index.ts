// What other features may use of people/; everything else in the folder is its own.
export { authService } from './auth'
export { clockStyleOf } from './organization'

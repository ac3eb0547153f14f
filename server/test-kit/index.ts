// What other features may use of test-kit/; everything else in the folder is its own.
export { testKitService } from './test-kit'

// Property-based fuzzing of the API's JSON bodies (see tests/helpers/fuzz-routes.ts).
import { accountsRoutes, fuzzSuite } from '../helpers/fuzz-routes'

fuzzSuite('accounts', accountsRoutes)

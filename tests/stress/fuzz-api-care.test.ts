// Property-based fuzzing of the API's JSON bodies (see tests/helpers/fuzz-routes.ts).
import { careRoutes, fuzzSuite } from '../helpers/fuzz-routes'

fuzzSuite('care', careRoutes)

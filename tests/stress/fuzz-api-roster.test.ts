// Property-based fuzzing of the API's JSON bodies (see tests/helpers/fuzz-routes.ts).
import { rosterRoutes, fuzzSuite } from '../helpers/fuzz-routes'

fuzzSuite('roster', rosterRoutes)

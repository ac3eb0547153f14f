// Property-based fuzzing of the API's JSON bodies (see tests/helpers/fuzz-routes.ts).
import { tanksRoutes, fuzzSuite } from '../helpers/fuzz-routes'

fuzzSuite('tanks', tanksRoutes)

// Property-based fuzzing of the API's JSON bodies (see tests/helpers/fuzz-routes.ts).
import { alertsRoutes, fuzzSuite } from '../helpers/fuzz-routes'

fuzzSuite('alerts', alertsRoutes)

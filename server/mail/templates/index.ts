export {
  deviceBack,
  incidentEscalated,
  incidentOpened,
  incidentRaised,
  incidentReopened,
  incidentReopenedToResolver,
  incidentRepeat,
  incidentResolved,
  TREND_CID,
  type IncidentMailInput,
} from './incident'
export { invitation, passwordReset, type InvitationInput, type PasswordResetInput } from './account'
export { ELECTRICAL_SAFETY_CAUTION, READINGS_ARE_AIDS } from './safety'
export { button, escapeHtml, factsTable, layout, oneLine } from './html'
export { formatInZone } from '@shared/time'
export { SITE_FIRST_STEPS, siteIncidentMail } from './site-incident'

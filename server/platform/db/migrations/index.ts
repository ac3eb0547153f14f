import type { Migration } from './migration'
import createFoundation from './202612020200-create-foundation'
import createReadings from './202612020230-create-readings'
import createTestKitEntries from './202612020300-create-test-kit-entries'
import createMailOutbox from './202612020330-create-mail-outbox'
import createDutyRoster from './202612020340-create-duty-roster'
import createWatchRulesIncidents from './202612020350-create-watch-rules-incidents'
import createWallCredentials from './202612020400-create-wall-credentials'
import createCare from './202612020410-create-care'
import createPasswordResets from './202612020420-create-password-resets'
import addTankStageChangedAt from './202612021000-add-tank-stage-changed-at'
import allowCancelledWaterChanges from './202612021010-allow-cancelled-water-changes'
import createImports from './202612021100-create-imports'
import createPhotos from './202612021300-create-photos'
import createReportSchedules from './202612021400-create-report-schedules'
import addIncidentFlapsSitesMaintenance from './202612050200-add-incident-flaps-sites-maintenance'
import createBuilds from './202612051000-create-builds'
import addDailyRollups from './202612051200-add-daily-rollups'
import addChecklistDismissed from './202612051300-add-checklist-dismissed'
import addCalibrations from './202612060100-add-calibrations'
import createTreatmentCourses from './202612060200-create-treatment-courses'
import addClientIds from './202612060300-add-client-ids'
import createPush from './202612060400-create-push'
import createClientsVisits from './202612060500-create-clients-visits'
import addLivestockBatches from './202612060600-add-livestock-batches'
import createEquipment from './202612060610-create-equipment'
import addOrganizationClockStyle from './202612060700-add-organization-clock-style'
import addSiteWorkdayEnd from './202612060710-add-site-workday-end'

/** Every migration in order. Add new files here; never edit one that has shipped. */
export const migrations: Migration[] = [
  createFoundation,
  createReadings,
  createTestKitEntries,
  createMailOutbox,
  createDutyRoster,
  createWatchRulesIncidents,
  createWallCredentials,
  createCare,
  createPasswordResets,
  addTankStageChangedAt,
  allowCancelledWaterChanges,
  createImports,
  createPhotos,
  createReportSchedules,
  addIncidentFlapsSitesMaintenance,
  createBuilds,
  addDailyRollups,
  addChecklistDismissed,
  addCalibrations,
  createTreatmentCourses,
  addClientIds,
  createPush,
  createClientsVisits,
  addLivestockBatches,
  createEquipment,
  addOrganizationClockStyle,
  addSiteWorkdayEnd,
]

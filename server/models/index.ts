import type { Sequelize } from 'sequelize'
import { Organization } from './organization'
import { User } from './user'
import { UserSite } from './user-site'
import { Session } from './session'
import { Invitation } from './invitation'
import { Site } from './site'
import { Tank } from './tank'
import { Device } from './device'
import { TestKitEntry, TestKitEntryRevision } from './test-kit-entry'
import { FakeMailboxMessage, OutboxMessage } from './outbox-message'
import { WallCredential } from './wall-credential'
import { DutyShift, DutyOverride } from './duty'
import { WatchRule, Incident, IncidentEvent, Snooze, IncidentAckLink } from './alerts'
import { SiteIncident, MaintenanceWindow } from './incident-groups'
import { CareTask, CareLogEntry, LivestockEntry, WaterChange } from './care'
import { Photo } from './photo'
import { ReportSchedule } from './report-schedule'
import { ImportJob, ImportSource } from './import-job'
import { BuildStep, TankBuild } from './build'

export { Organization, User, UserSite, Session, Invitation, Site, Tank, Device, TestKitEntry, TestKitEntryRevision, OutboxMessage, FakeMailboxMessage, WallCredential, DutyShift, DutyOverride, WatchRule, Incident, IncidentEvent, Snooze, IncidentAckLink, CareTask, CareLogEntry, LivestockEntry, WaterChange, Photo, ReportSchedule, ImportJob, ImportSource, TankBuild, BuildStep, SiteIncident, MaintenanceWindow }

/** Binds every model to this Sequelize instance and declares the associations, in one place. */
export function initModels(sequelize: Sequelize) {
  for (const model of [Organization, User, UserSite, Session, Invitation, Site, Tank, Device, TestKitEntry, TestKitEntryRevision, OutboxMessage, FakeMailboxMessage, WallCredential, DutyShift, DutyOverride, WatchRule, Incident, IncidentEvent, Snooze, IncidentAckLink, CareTask, CareLogEntry, LivestockEntry, WaterChange, Photo, ReportSchedule, ImportJob, ImportSource, TankBuild, BuildStep, SiteIncident, MaintenanceWindow]) model.initModel(sequelize)
  User.belongsToMany(Site, { through: UserSite, as: 'sites', foreignKey: 'userId', otherKey: 'siteId' })
  Tank.belongsTo(Site, { as: 'site', foreignKey: 'siteId' })
  Site.hasMany(Tank, { as: 'tanks', foreignKey: 'siteId' })
  Device.belongsTo(Tank, { as: 'tank', foreignKey: 'tankId' })
  Tank.hasMany(Device, { as: 'devices', foreignKey: 'tankId' })
  TestKitEntry.belongsTo(User, { as: 'author', foreignKey: 'enteredBy' })
  TestKitEntry.hasMany(TestKitEntryRevision, { as: 'revisions', foreignKey: 'entryId' })
  Incident.belongsTo(Tank, { as: 'tank', foreignKey: 'tankId' })
  Incident.belongsTo(Site, { as: 'site', foreignKey: 'siteId' })
  ImportJob.belongsTo(ImportSource, { as: 'source', foreignKey: 'sourceId' })
  return { Organization, User, UserSite, Session, Invitation, Site, Tank, Device, TestKitEntry, TestKitEntryRevision, OutboxMessage, FakeMailboxMessage, WallCredential, DutyShift, DutyOverride, WatchRule, Incident, IncidentEvent, Snooze, IncidentAckLink, CareTask, CareLogEntry, LivestockEntry, WaterChange, Photo, ReportSchedule, ImportJob, ImportSource, TankBuild, BuildStep, SiteIncident, MaintenanceWindow }
}
export type Models = ReturnType<typeof initModels>

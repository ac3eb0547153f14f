import type { Sequelize } from 'sequelize'
import { Organization } from './people/organization-model'
import { User } from './people/user-model'
import { UserSite } from './people/user-site-model'
import { Session } from './people/session-model'
import { Invitation } from './people/invitation-model'
import { Site } from './sites/site-model'
import { Tank } from './tanks/tank-model'
import { Device } from './devices/device-model'
import { TestKitEntry, TestKitEntryRevision } from './test-kit/test-kit-entry-model'
import { FakeMailboxMessage, OutboxMessage } from './mail/outbox-model'
import { WallCredential } from './sites/wall-credential-model'
import { DutyShift, DutyOverride } from './roster/models'
import { WatchRule, Incident, IncidentEvent, Snooze, IncidentAckLink } from './incidents/models'
import { SiteIncident, MaintenanceWindow } from './incidents/group-models'
import { CareTask, CareLogEntry, LivestockEntry, WaterChange } from './care/models'
import { TreatmentCourse } from './care/treatment-model'
import { Photo } from './photos/model'
import { ReportSchedule } from './reports/schedule-model'
import { ImportJob, ImportSource } from './imports/models'
import { BuildStep, TankBuild } from './builds/models'
import { Client } from './clients/client-model'
import { Visit } from './visits/visit-model'
import { LivestockEvent } from './livestock/models'
import { Consumable, Equipment } from './equipment/models'
import { AlertChannelChoice, PushSubscription } from './push/models'
import { Calibration } from './calibration/models'

export {
  Organization,
  User,
  UserSite,
  Session,
  Invitation,
  Site,
  Tank,
  Device,
  TestKitEntry,
  TestKitEntryRevision,
  OutboxMessage,
  FakeMailboxMessage,
  WallCredential,
  DutyShift,
  DutyOverride,
  WatchRule,
  Incident,
  IncidentEvent,
  Snooze,
  IncidentAckLink,
  CareTask,
  CareLogEntry,
  LivestockEntry,
  WaterChange,
  TreatmentCourse,
  Photo,
  ReportSchedule,
  ImportJob,
  ImportSource,
  TankBuild,
  BuildStep,
  SiteIncident,
  MaintenanceWindow,
  Client,
  Visit,
  LivestockEvent,
  Equipment,
  Consumable,
  PushSubscription,
  AlertChannelChoice,
  Calibration,
}

/** Every model, in the order they are bound. */
const ALL_MODELS = {
  Organization,
  User,
  UserSite,
  Session,
  Invitation,
  Site,
  Tank,
  Device,
  TestKitEntry,
  TestKitEntryRevision,
  OutboxMessage,
  FakeMailboxMessage,
  WallCredential,
  DutyShift,
  DutyOverride,
  WatchRule,
  Incident,
  IncidentEvent,
  Snooze,
  IncidentAckLink,
  CareTask,
  CareLogEntry,
  LivestockEntry,
  WaterChange,
  TreatmentCourse,
  Photo,
  ReportSchedule,
  ImportJob,
  ImportSource,
  TankBuild,
  BuildStep,
  SiteIncident,
  MaintenanceWindow,
  Client,
  Visit,
  LivestockEvent,
  Equipment,
  Consumable,
  PushSubscription,
  AlertChannelChoice,
  Calibration,
}

/** Binds every model to this Sequelize instance and declares the associations, in one place. */
export function initModels(sequelize: Sequelize) {
  for (const model of Object.values(ALL_MODELS)) model.initModel(sequelize)
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
  Tank.belongsTo(Client, { as: 'client', foreignKey: 'clientId' })
  Visit.belongsTo(Client, { as: 'client', foreignKey: 'clientId' })
  Visit.belongsTo(Site, { as: 'site', foreignKey: 'siteId' })
  Visit.belongsTo(User, { as: 'technician', foreignKey: 'technicianId' })
  Calibration.belongsTo(User, { as: 'performer', foreignKey: 'performedBy' })
  TreatmentCourse.belongsTo(User, { as: 'author', foreignKey: 'createdBy' })
  return ALL_MODELS
}
export type Models = ReturnType<typeof initModels>

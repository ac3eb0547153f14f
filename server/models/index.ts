import type { Sequelize } from 'sequelize'
import { Organization } from './organization'
import { User } from './user'
import { UserSite } from './user-site'
import { Session } from './session'
import { Invitation } from './invitation'
import { Site } from './site'
import { Tank } from './tank'

export { Organization, User, UserSite, Session, Invitation, Site, Tank }

/** Binds every model to this Sequelize instance and declares the associations, in one place. */
export function initModels(sequelize: Sequelize) {
  for (const model of [Organization, User, UserSite, Session, Invitation, Site, Tank]) model.initModel(sequelize)
  User.belongsToMany(Site, { through: UserSite, as: 'sites', foreignKey: 'userId', otherKey: 'siteId' })
  Tank.belongsTo(Site, { as: 'site', foreignKey: 'siteId' })
  Site.hasMany(Tank, { as: 'tanks', foreignKey: 'siteId' })
  return { Organization, User, UserSite, Session, Invitation, Site, Tank }
}
export type Models = ReturnType<typeof initModels>

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** The sites a viewer is limited to; no rows means every site of the organization. */
export class UserSite extends Model<InferAttributes<UserSite>, InferCreationAttributes<UserSite>> {
  declare userId: number
  declare siteId: number

  static initModel(sequelize: Sequelize) {
    UserSite.init(
      {
        userId: { type: DataTypes.INTEGER, primaryKey: true },
        siteId: { type: DataTypes.INTEGER, primaryKey: true },
      },
      { sequelize, tableName: 'user_sites', timestamps: false },
    )
  }
}

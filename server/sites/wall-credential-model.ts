import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A read-only credential for one site's wall screen; the secret is stored only as a hash. */
export class WallCredential extends Model<InferAttributes<WallCredential>, InferCreationAttributes<WallCredential>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare name: string
  declare tokenHash: string
  declare createdBy: number | null
  declare lastUsedAt: CreationOptional<Date | null>
  declare revokedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    WallCredential.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        tokenHash: { type: DataTypes.TEXT, allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'wall_credentials' },
    )
  }
}

import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export type PhotoFormat = 'jpeg' | 'png' | 'webp'

export class Photo extends Model<InferAttributes<Photo>, InferCreationAttributes<Photo>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare careLogEntryId: number | null
  declare caption: CreationOptional<string>
  declare takenAt: Date
  declare uploadedBy: number | null
  declare contentType: 'image/jpeg'
  declare displayKey: string
  declare displayWidth: number
  declare displayHeight: number
  declare displayBytes: number
  declare thumbnailKey: string
  declare thumbnailWidth: number
  declare thumbnailHeight: number
  declare originalFormat: PhotoFormat
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    // Every definition is written out fresh: Sequelize writes the column name into the object it is given.
    Photo.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        careLogEntryId: { type: DataTypes.INTEGER, allowNull: true },
        caption: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        takenAt: { type: DataTypes.DATE, allowNull: false },
        uploadedBy: { type: DataTypes.INTEGER, allowNull: true },
        contentType: { type: DataTypes.TEXT, allowNull: false },
        displayKey: { type: DataTypes.TEXT, allowNull: false },
        displayWidth: { type: DataTypes.INTEGER, allowNull: false },
        displayHeight: { type: DataTypes.INTEGER, allowNull: false },
        displayBytes: { type: DataTypes.INTEGER, allowNull: false },
        thumbnailKey: { type: DataTypes.TEXT, allowNull: false },
        thumbnailWidth: { type: DataTypes.INTEGER, allowNull: false },
        thumbnailHeight: { type: DataTypes.INTEGER, allowNull: false },
        originalFormat: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'photos', updatedAt: false },
    )
  }
}

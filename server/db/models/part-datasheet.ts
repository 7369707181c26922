import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Membership } from './membership'
import type { User } from './user'

/** A datasheet PDF attached to a team part; the bytes are in object storage under objectKey. */
export class PartDatasheet extends Model<InferAttributes<PartDatasheet>, InferCreationAttributes<PartDatasheet>> {
  declare id: CreationOptional<number>
  declare partId: ForeignKey<number>
  declare teamId: ForeignKey<number>
  declare ownerId: number | null
  declare objectKey: string
  declare fileName: string
  declare size: number | string
  declare contentType: string
  declare sha256: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare access?: NonAttribute<Membership>
  declare owner?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    PartDatasheet.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        partId: { type: DataTypes.INTEGER, allowNull: false },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: true },
        objectKey: { type: DataTypes.STRING(200), allowNull: false },
        fileName: { type: DataTypes.STRING(255), allowNull: false },
        size: { type: DataTypes.BIGINT, allowNull: false },
        contentType: { type: DataTypes.STRING(100), allowNull: false },
        sha256: { type: DataTypes.STRING(64), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'part_datasheets' },
    )
  }
}

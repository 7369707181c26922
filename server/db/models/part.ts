import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { StageSpec } from '../../../shared/schemas/link'
import type { PartCategory } from '../../../shared/schemas/part'
import type { Membership } from './membership'

/** A part library entry; teamId null marks a built-in (read-only) part. */
export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<number>
  declare teamId: number | null
  declare name: string
  declare category: PartCategory
  declare description: CreationOptional<string>
  declare stage: StageSpec
  declare version: CreationOptional<number>
  declare createdBy: number | null
  declare updatedBy: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare access?: NonAttribute<Membership | null>

  static initModel(sequelize: Sequelize) {
    Part.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        teamId: { type: DataTypes.INTEGER, allowNull: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        category: { type: DataTypes.STRING(40), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        stage: { type: DataTypes.JSONB, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        updatedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'parts' },
    )
  }
}

import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Link as LinkSpec, Protocol } from '../../../shared/schemas/link'
import type { LinkSummaryFields } from '../../../shared/types/workspace'
import type { Membership } from './membership'
import type { User } from './user'

/** A link: its whole definition is `spec` (shared/schemas/link.ts), stored as JSONB. */
export class Link extends Model<InferAttributes<Link>, InferCreationAttributes<Link>> {
  declare id: CreationOptional<number>
  declare projectId: ForeignKey<number>
  declare teamId: ForeignKey<number>
  /** copy of spec.name for listings */
  declare name: string
  /** copy of spec.protocol for listings */
  declare protocol: Protocol
  declare spec: LinkSpec
  /** the analysis condensed at save time */
  declare summary: LinkSummaryFields
  /** optimistic-locking counter, bumped by every update */
  declare version: CreationOptional<number>
  declare createdBy: number | null
  declare updatedBy: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare access?: NonAttribute<Membership>
  declare updater?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    Link.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        projectId: { type: DataTypes.INTEGER, allowNull: false },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        protocol: { type: DataTypes.STRING(16), allowNull: false },
        spec: { type: DataTypes.JSONB, allowNull: false },
        summary: { type: DataTypes.JSONB, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        updatedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'links' },
    )
  }
}

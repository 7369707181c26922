import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { CaptureOptions, CaptureStatus } from '../../../shared/schemas/capture'
import type { CaptureResult, CaptureResultSummary } from '../../../shared/types/capture'
import type { CaptureWaveform } from '../../captures/downsample'
import type { Membership } from './membership'
import type { User } from './user'

/** An oscilloscope capture attached to a link; the bytes are in object storage under objectKey. */
export class Capture extends Model<InferAttributes<Capture>, InferCreationAttributes<Capture>> {
  declare id: CreationOptional<number>
  declare linkId: ForeignKey<number>
  declare teamId: ForeignKey<number>
  declare ownerId: number | null
  declare label: CreationOptional<string>
  declare objectKey: string
  declare fileName: string
  /** bytes (BIGINT comes back from pg as a string; the presenter converts) */
  declare size: number | string
  declare contentType: string
  declare sha256: string
  declare options: CaptureOptions
  declare status: CreationOptional<CaptureStatus>
  /** 0..1 */
  declare progress: CreationOptional<number>
  declare error: CreationOptional<string | null>
  declare result: CreationOptional<CaptureResult | null>
  /** the result without its edge and pair lists, for lists (shared/utils/capture-summary.ts) */
  declare summary: CreationOptional<CaptureResultSummary | null>
  declare waveform: CreationOptional<CaptureWaveform | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare access?: NonAttribute<Membership>
  declare owner?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    Capture.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        linkId: { type: DataTypes.INTEGER, allowNull: false },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: true },
        label: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        objectKey: { type: DataTypes.STRING(200), allowNull: false },
        fileName: { type: DataTypes.STRING(255), allowNull: false },
        size: { type: DataTypes.BIGINT, allowNull: false },
        contentType: { type: DataTypes.STRING(100), allowNull: false },
        sha256: { type: DataTypes.STRING(64), allowNull: false },
        options: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
        progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
        error: { type: DataTypes.TEXT, allowNull: true },
        result: { type: DataTypes.JSONB, allowNull: true },
        summary: { type: DataTypes.JSONB, allowNull: true },
        waveform: { type: DataTypes.JSONB, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'captures' },
    )
  }
}

import type { ReadingThresholds } from '../../../shared/report/vocabulary'
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Link as LinkSpec, Protocol } from '../../../shared/schemas/link'
import type { ReportState } from '../../../shared/schemas/report'
import type { FrozenCapture, PullupChoice } from '../../../shared/types/report'
import type { LinkAnalysis } from '../../timing/analyze'
import type { Membership } from './membership'
import type { ReportComment } from './report-comment'
import type { ReportEvent } from './report-event'
import type { User } from './user'

/**
 * One margin report revision: the frozen input and result of a link (immutable, a
 * database trigger refuses changes to them) and its review state, which moves under the
 * optimistic `version` counter.
 */
export class ReportRevision extends Model<InferAttributes<ReportRevision>, InferCreationAttributes<ReportRevision>> {
  declare id: CreationOptional<number>
  declare teamId: number
  declare projectId: number | null
  declare linkId: number | null
  /** 1 for r1 */
  declare number: number
  declare linkVersion: number
  declare linkName: string
  declare projectName: string
  declare protocol: Protocol
  declare input: LinkSpec
  declare result: LinkAnalysis
  declare verdict: 'pass' | 'marginal' | 'fail'
  declare engineVersion: string
  declare assumptions: string[]
  declare pullup: PullupChoice | null
  /** the team's reading thresholds at freeze (guard band, thin slack); null on revisions frozen before they existed */
  declare thresholds: CreationOptional<ReadingThresholds | null>
  /** the scope captures of the link whose extraction was done at freeze (frozen, like input and result) */
  declare captures: CreationOptional<FrozenCapture[]>
  declare state: CreationOptional<ReportState>
  declare authorId: number | null
  declare reviewerId: CreationOptional<number | null>
  declare decidedBy: CreationOptional<number | null>
  declare decisionNote: CreationOptional<string | null>
  declare submittedAt: CreationOptional<Date | null>
  declare decidedAt: CreationOptional<Date | null>
  declare version: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare access?: NonAttribute<Membership>
  declare author?: NonAttribute<User | null>
  declare reviewer?: NonAttribute<User | null>
  declare decider?: NonAttribute<User | null>
  declare events?: NonAttribute<ReportEvent[]>
  declare comments?: NonAttribute<ReportComment[]>
  /** ids of the frozen captures that still exist (set by loadRevision; their files can be downloaded) */
  declare liveCaptureIds?: NonAttribute<number[]>

  static initModel(sequelize: Sequelize) {
    ReportRevision.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        projectId: { type: DataTypes.INTEGER, allowNull: true },
        linkId: { type: DataTypes.INTEGER, allowNull: true },
        number: { type: DataTypes.INTEGER, allowNull: false },
        linkVersion: { type: DataTypes.INTEGER, allowNull: false },
        linkName: { type: DataTypes.STRING(200), allowNull: false },
        projectName: { type: DataTypes.STRING(200), allowNull: false },
        protocol: { type: DataTypes.STRING(16), allowNull: false },
        input: { type: DataTypes.JSONB, allowNull: false },
        result: { type: DataTypes.JSONB, allowNull: false },
        verdict: { type: DataTypes.STRING(16), allowNull: false },
        engineVersion: { type: DataTypes.STRING(32), allowNull: false },
        assumptions: { type: DataTypes.JSONB, allowNull: false },
        pullup: { type: DataTypes.JSONB, allowNull: true },
        thresholds: { type: DataTypes.JSONB, allowNull: true },
        captures: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft' },
        authorId: { type: DataTypes.INTEGER, allowNull: true },
        reviewerId: { type: DataTypes.INTEGER, allowNull: true },
        decidedBy: { type: DataTypes.INTEGER, allowNull: true },
        decisionNote: { type: DataTypes.TEXT, allowNull: true },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_revisions' },
    )
  }
}

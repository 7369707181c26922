import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** One throttled event (a sign-up, a reset request, an invitation accept), counted per bucket and key. */
export class RateEvent extends Model<InferAttributes<RateEvent>, InferCreationAttributes<RateEvent>> {
  declare id: CreationOptional<number>
  declare bucket: string
  declare key: string
  declare at: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    RateEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        bucket: { type: DataTypes.STRING(40), allowNull: false },
        key: { type: DataTypes.STRING(300), allowNull: false },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'rate_events', timestamps: false },
    )
  }
}

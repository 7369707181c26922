import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * Uploaded files: oscilloscope captures attached to a link and datasheet PDFs attached to
 * a part. The bytes live in object storage under `object_key` (chosen by the server);
 * these rows hold the metadata. A capture's edge extraction runs as a background job
 * (server/jobs): `status` queued -> running -> done | failed, `progress` 0..1, the
 * measured `result` and the display `waveform` as JSONB (kept apart so listings do not
 * load the waveform).
 */
export const up: Migration = async ({ context: qi }) => {
  const stamps = {
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  }
  const file = {
    object_key: { type: DataTypes.STRING(200), allowNull: false, unique: true },
    /** the client's file name, for display only */
    file_name: { type: DataTypes.STRING(255), allowNull: false },
    size: { type: DataTypes.BIGINT, allowNull: false },
    content_type: { type: DataTypes.STRING(100), allowNull: false },
    /** hex SHA-256 of the stored bytes */
    sha256: { type: DataTypes.STRING(64), allowNull: false },
  }
  await qi.createTable('captures', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    link_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'links', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    owner_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    label: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
    ...file,
    /** extraction options: input/output channel, inversion, pull-up RL of the measurement */
    options: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
    error: { type: DataTypes.TEXT, allowNull: true },
    result: { type: DataTypes.JSONB, allowNull: true },
    waveform: { type: DataTypes.JSONB, allowNull: true },
    ...stamps,
  })
  await qi.addIndex('captures', ['link_id'])
  await qi.addIndex('captures', ['team_id'])
  await qi.sequelize.query("ALTER TABLE captures ADD CONSTRAINT captures_status CHECK (status IN ('queued', 'running', 'done', 'failed'))")

  await qi.createTable('part_datasheets', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    part_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'parts', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    owner_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    ...file,
    ...stamps,
  })
  await qi.addIndex('part_datasheets', ['part_id'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('part_datasheets')
  await qi.dropTable('captures')
}

import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * Margin reports (issue 6). `report_revisions` holds each frozen revision r1, r2 ... of a
 * link: the full input, the full result, the engine version and the assumptions, which a
 * trigger refuses to change once written (a revision is immutable; only its review state
 * moves, under the optimistic `version` counter). `report_events` records each review step
 * (freeze, submit, sign-off, return) and `report_comments` the comments, on the report as a
 * whole or on one bit, check or stage. A deleted link or project keeps its reports (the
 * foreign keys become NULL; the link's name and the team stay on the row).
 */
export const up: Migration = async ({ context: qi }) => {
  const user = (allowNull = true) => ({ type: DataTypes.INTEGER, allowNull, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' })
  await qi.createTable('report_revisions', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    project_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'projects', key: 'id' }, onDelete: 'SET NULL' },
    link_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'links', key: 'id' }, onDelete: 'SET NULL' },
    /** 1 for r1, counted per link */
    number: { type: DataTypes.INTEGER, allowNull: false },
    link_version: { type: DataTypes.INTEGER, allowNull: false },
    link_name: { type: DataTypes.STRING(200), allowNull: false },
    project_name: { type: DataTypes.STRING(200), allowNull: false },
    protocol: { type: DataTypes.STRING(16), allowNull: false },
    input: { type: DataTypes.JSONB, allowNull: false },
    result: { type: DataTypes.JSONB, allowNull: false },
    verdict: { type: DataTypes.STRING(16), allowNull: false },
    engine_version: { type: DataTypes.STRING(32), allowNull: false },
    assumptions: { type: DataTypes.JSONB, allowNull: false },
    pullup: { type: DataTypes.JSONB, allowNull: true },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft' },
    author_id: user(),
    reviewer_id: user(),
    decided_by: user(),
    decision_note: { type: DataTypes.TEXT, allowNull: true },
    submitted_at: { type: DataTypes.DATE, allowNull: true },
    decided_at: { type: DataTypes.DATE, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('report_revisions', ['team_id', 'state'])
  await qi.addIndex('report_revisions', ['reviewer_id', 'state'])
  await qi.addIndex('report_revisions', ['link_id', 'number'], { unique: true, name: 'report_revisions_link_number' })
  await qi.sequelize.query(
    `ALTER TABLE report_revisions ADD CONSTRAINT report_revisions_state CHECK (state IN ('draft', 'submitted', 'signed-off', 'returned'))`,
  )
  // A revision never changes: its frozen columns are refused in any UPDATE.
  await qi.sequelize.query(`
    CREATE FUNCTION report_revisions_frozen() RETURNS trigger AS $$
    BEGIN
      IF NEW.input IS DISTINCT FROM OLD.input OR NEW.result IS DISTINCT FROM OLD.result
         OR NEW.engine_version IS DISTINCT FROM OLD.engine_version OR NEW.assumptions IS DISTINCT FROM OLD.assumptions
         OR NEW.pullup IS DISTINCT FROM OLD.pullup OR NEW.number IS DISTINCT FROM OLD.number
         OR NEW.link_version IS DISTINCT FROM OLD.link_version OR NEW.author_id IS DISTINCT FROM OLD.author_id AND NEW.author_id IS NOT NULL
         OR NEW.created_at IS DISTINCT FROM OLD.created_at THEN
        RAISE EXCEPTION 'a margin report revision is immutable';
      END IF;
      RETURN NEW;
    END $$ LANGUAGE plpgsql`)
  await qi.sequelize.query(
    'CREATE TRIGGER report_revisions_frozen BEFORE UPDATE ON report_revisions FOR EACH ROW EXECUTE FUNCTION report_revisions_frozen()',
  )

  await qi.createTable('report_events', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    revision_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'report_revisions', key: 'id' }, onDelete: 'CASCADE' },
    action: { type: DataTypes.STRING(16), allowNull: false },
    actor_id: user(),
    reviewer_id: user(),
    note: { type: DataTypes.TEXT, allowNull: true },
    at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('report_events', ['revision_id'])

  await qi.createTable('report_comments', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    revision_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'report_revisions', key: 'id' }, onDelete: 'CASCADE' },
    author_id: user(),
    /** { kind: 'report' } | { kind: 'bit', channelId, index } | { kind: 'check', id } | { kind: 'stage', channelId, index } */
    target: { type: DataTypes.JSONB, allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('report_comments', ['revision_id'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('report_comments')
  await qi.dropTable('report_events')
  await qi.dropTable('report_revisions')
  await qi.sequelize.query('DROP FUNCTION IF EXISTS report_revisions_frozen()')
}

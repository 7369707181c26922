import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * The team's reading thresholds frozen with a margin report revision (issue 12): the guard
 * band and the thin slack fraction the report reads its margins by, so a later change of the
 * team's policy does not recolour a signed-off report. Older revisions hold NULL and read by
 * their own requirement. The column is frozen like the rest of the revision.
 */
const FROZEN_BEFORE = `
    NEW.input IS DISTINCT FROM OLD.input OR NEW.result IS DISTINCT FROM OLD.result
         OR NEW.engine_version IS DISTINCT FROM OLD.engine_version OR NEW.assumptions IS DISTINCT FROM OLD.assumptions
         OR NEW.pullup IS DISTINCT FROM OLD.pullup OR NEW.number IS DISTINCT FROM OLD.number
         OR NEW.link_version IS DISTINCT FROM OLD.link_version OR NEW.author_id IS DISTINCT FROM OLD.author_id AND NEW.author_id IS NOT NULL
         OR NEW.created_at IS DISTINCT FROM OLD.created_at
         OR NEW.captures IS DISTINCT FROM OLD.captures`

function frozenFunction(condition: string) {
  return `
    CREATE OR REPLACE FUNCTION report_revisions_frozen() RETURNS trigger AS $$
    BEGIN
      IF ${condition} THEN
        RAISE EXCEPTION 'a margin report revision is immutable';
      END IF;
      RETURN NEW;
    END $$ LANGUAGE plpgsql`
}

export const up: Migration = async ({ context: qi }) => {
  await qi.addColumn('report_revisions', 'thresholds', { type: DataTypes.JSONB, allowNull: true })
  await qi.sequelize.query(frozenFunction(`${FROZEN_BEFORE}\n         OR NEW.thresholds IS DISTINCT FROM OLD.thresholds`))
}

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(frozenFunction(FROZEN_BEFORE))
  await qi.removeColumn('report_revisions', 'thresholds')
}

import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * The scope captures that back a margin report revision (issues 6 and 7): at freeze, a
 * snapshot of every capture of the link whose extraction is done (file, checksum,
 * channels, measured tPLH / tPHL / tr / tf statistics). The column is frozen like the
 * rest of the revision, so the immutability trigger is recreated with it; deleting a
 * capture later leaves the snapshot as it was.
 */
const FROZEN_BEFORE = `
    NEW.input IS DISTINCT FROM OLD.input OR NEW.result IS DISTINCT FROM OLD.result
         OR NEW.engine_version IS DISTINCT FROM OLD.engine_version OR NEW.assumptions IS DISTINCT FROM OLD.assumptions
         OR NEW.pullup IS DISTINCT FROM OLD.pullup OR NEW.number IS DISTINCT FROM OLD.number
         OR NEW.link_version IS DISTINCT FROM OLD.link_version OR NEW.author_id IS DISTINCT FROM OLD.author_id AND NEW.author_id IS NOT NULL
         OR NEW.created_at IS DISTINCT FROM OLD.created_at`

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
  await qi.addColumn('report_revisions', 'captures', { type: DataTypes.JSONB, allowNull: false, defaultValue: qi.sequelize.literal("'[]'::jsonb") })
  await qi.sequelize.query(frozenFunction(`${FROZEN_BEFORE}\n         OR NEW.captures IS DISTINCT FROM OLD.captures`))
}

export const down: Migration = async ({ context: qi }) => {
  // the previous function first: it no longer names the column dropped next
  await qi.sequelize.query(frozenFunction(FROZEN_BEFORE))
  await qi.removeColumn('report_revisions', 'captures')
}

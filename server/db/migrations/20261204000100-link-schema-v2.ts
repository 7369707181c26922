import type { Migration } from '../migrator'

/**
 * Link documents, version 2 (the I2C, CAN and RS-485 link types): a version 1 document is a
 * version 2 document without them, so stored links only change their version number. Frozen
 * report revisions keep the document they were frozen with (the schema still reads version 1).
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`UPDATE links SET spec = jsonb_set(spec, '{schemaVersion}', '2'::jsonb) WHERE spec->>'schemaVersion' = '1'`)
}

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(
    `UPDATE links SET spec = jsonb_set(spec, '{schemaVersion}', '1'::jsonb) WHERE spec->>'schemaVersion' = '2' AND spec->>'protocol' IN ('uart', 'spi')`,
  )
}

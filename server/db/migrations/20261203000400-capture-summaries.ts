import { DataTypes, QueryTypes } from 'sequelize'
import { summariseCaptureResult } from '../../../shared/utils/capture-summary'
import type { CaptureResult } from '../../../shared/types/capture'
import type { Migration } from '../migrator'

/**
 * Bounded capture lists: each capture keeps the summary of its measurement beside the full
 * result (no edge or pair lists), so a link's capture list reads a few kB per capture instead
 * of the whole result. Existing results are summarised here, one row at a time.
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.addColumn('captures', 'summary', { type: DataTypes.JSONB, allowNull: true })
  const ids = await qi.sequelize.query<{ id: number }>('SELECT id FROM captures WHERE result IS NOT NULL ORDER BY id', { type: QueryTypes.SELECT })
  for (const { id } of ids) {
    const [row] = await qi.sequelize.query<{ result: CaptureResult }>('SELECT result FROM captures WHERE id = :id', { replacements: { id }, type: QueryTypes.SELECT })
    if (!row) continue
    await qi.sequelize.query('UPDATE captures SET summary = :summary::jsonb WHERE id = :id', { replacements: { id, summary: JSON.stringify(summariseCaptureResult(row.result)) } })
  }
  await qi.addIndex('captures', ['link_id', 'id'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.removeIndex('captures', ['link_id', 'id'])
  await qi.removeColumn('captures', 'summary')
}

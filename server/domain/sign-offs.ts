/**
 * A sign-off never silently outlives its link: for each link, its latest signed-off revision
 * and whether the link was saved after the version that revision froze. The project list, the
 * link page and the report page show it; the revision itself stays as it was signed.
 */
import { QueryTypes } from 'sequelize'
import { revisionLabel } from '../../shared/schemas/report'
import type { SignOffRef } from '../../shared/types/workspace'
import { useDb } from '../utils/db'

/** The latest signed-off revision of each link, against the link's version now. */
export async function signOffsOf(links: { id: number; version: number }[]): Promise<Map<number, SignOffRef>> {
  const out = new Map<number, SignOffRef>()
  if (!links.length) return out
  const rows = await useDb().query<{ id: number; link_id: number; number: number; link_version: number; decided_at: Date | null }>(
    `SELECT DISTINCT ON (link_id) id, link_id, number, link_version, decided_at
       FROM report_revisions WHERE state = 'signed-off' AND link_id IN (:ids)
      ORDER BY link_id, number DESC`,
    { replacements: { ids: links.map((l) => l.id) }, type: QueryTypes.SELECT },
  )
  const version = new Map(links.map((l) => [l.id, l.version]))
  for (const r of rows) {
    out.set(r.link_id, {
      reportId: r.id,
      label: revisionLabel(r.number),
      linkVersion: r.link_version,
      decidedAt: r.decided_at ? new Date(r.decided_at).toISOString() : null,
      changedSince: (version.get(r.link_id) ?? 0) > r.link_version,
    })
  }
  return out
}

/** One link's sign-off status (null when no revision of it is signed off). */
export async function signOffOf(link: { id: number; version: number }): Promise<SignOffRef | null> {
  return (await signOffsOf([link])).get(link.id) ?? null
}

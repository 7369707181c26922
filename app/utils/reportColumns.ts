import { cellText, columnsFor, type ReportColumn } from '#shared/report/tables'
import type { TableColumn } from '~/types/table'

/** A shared report table (shared/report/tables.ts) as TableSortable columns: the screen's columns, coloured by state. */
export function screenColumns<R>(columns: ReportColumn<R>[], emphasise: string[] = ['margin', 'slack']): TableColumn<R>[] {
  return columnsFor(columns, 'screen').map((c) => ({
    key: c.key,
    label: c.label,
    numeric: c.numeric,
    csvLabel: c.csvLabel,
    value: c.value,
    format: (r: R) => cellText(c, r),
    cellClass: c.state ? (r: R) => `${STATE_TEXT[c.state!(r)]}${emphasise.includes(c.key) ? ' font-medium' : ''}` : undefined,
    detail: c.detail,
  }))
}

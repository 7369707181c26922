/** A column of TableSortable. */
export interface TableColumn<R> {
  key: string
  label: string
  /** right-aligned monospaced numbers */
  numeric?: boolean
  /** the value sorted on and exported to CSV */
  value: (row: R) => unknown
  /** the cell text (default: the value) */
  format?: (row: R) => string
  /** CSV header (default: label); put the unit here, e.g. "margin (UI)" */
  csvLabel?: string
  /** extra classes for the cell */
  cellClass?: (row: R) => string | undefined
  /** shown in the row's expandable details instead of as a column (still exported to CSV) */
  detail?: boolean
}

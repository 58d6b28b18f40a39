/** Plain table data for the DataTable component: every cell already formatted, with a sort key for later scripts. */

export interface TableColumn {
  /** Stable key (used in data attributes and, later, in sort state). */
  readonly key: string;
  /** Header text without the unit. */
  readonly label: string;
  /** Unit shown in the header, e.g. "kg"; omitted when cells carry their own units. */
  readonly unit?: string;
  /** Right-aligned, tabular figures. */
  readonly numeric: boolean;
}

export interface TableCell {
  readonly text: string;
  /** Second line in smaller type (an explanation of the value). */
  readonly note?: string;
  /** Makes the cell a site-internal link (already joined with the base path). */
  readonly href?: string;
  /** Raw value for sorting: a number in the column's unit, or a string. */
  readonly sortValue?: number | string;
  /** Sorted by this first (`data-sort-group`), e.g. the currency of a price: amounts are never converted. */
  readonly sortGroup?: string;
}

export interface TableRow {
  readonly key: string;
  /** Name of the row in words, for controls that act on it ("Corvell Tern 7"). */
  readonly label?: string;
  /** Raw figures written as `data-<name>` attributes on the row, for scripts (names in kebab-case). */
  readonly data?: Readonly<Record<string, string>>;
  /** Cells in column order. */
  readonly cells: readonly TableCell[];
}

export interface TableModel {
  readonly id: string;
  readonly caption: string;
  /** A sentence printed under the table. */
  readonly footnote?: string;
  readonly columns: readonly TableColumn[];
  readonly rows: readonly TableRow[];
  /** The first cell of each row is a row header (th scope="row"). */
  readonly rowHeaders: boolean;
}

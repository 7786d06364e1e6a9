/**
 * Element Plus types a column slot's `row` as a loose record, whatever the table holds. Each table
 * names its row type once with this, and the template reads `study(row).name` with full types.
 */
export function typedRow<T>(): (row: Record<PropertyKey, unknown>) => T {
  return (row) => row as unknown as T;
}

/** The header row of a data table: one column heading per name, in order. */
export function ColumnHeads(p: { names: string[] }) {
  return (
    <thead>
      <tr>
        {p.names.map((n) => (
          <th key={n} scope="col">
            {n}
          </th>
        ))}
      </tr>
    </thead>
  );
}

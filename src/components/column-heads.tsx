/**
 * A table's head row. Numbers align as the table does (right); the columns named in `left` hold
 * words and align left: `<ColumnHeads names={['Side', 'Gap min']} left={['Side']} />`.
 */
export function ColumnHeads({ names, left = [] }: { names: string[]; left?: string[] }) {
  return (
    <thead>
      <tr>
        {names.map((name) => (
          <th key={name} scope="col" className={left.includes(name) ? 'border border-rule p-2 text-left' : 'border border-rule p-2'}>
            {name}
          </th>
        ))}
      </tr>
    </thead>
  );
}

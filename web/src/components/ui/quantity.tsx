/** A number right-aligned in tabular figures with its unit in a lighter weight. */
export function Quantity({
  value,
  unit,
  className = '',
  struck = false,
}: {
  value: string;
  unit?: string;
  className?: string;
  struck?: boolean;
}) {
  return (
    <span className={`whitespace-nowrap tabular-nums ${struck ? 'text-offline-ink line-through' : ''} ${className}`}>
      <span className="font-semibold">{value}</span>
      {unit && <span className="ml-0.5 font-normal text-ink-muted"> {unit}</span>}
    </span>
  );
}

/**
 * A list filter over a fixed set of values: the first option ("All roles", "Any owner"…) clears the
 * filter, the others show each value's label. `value` and `onChange` are the list's URL filter.
 */
export function FilterSelect<V extends string>({
  label,
  value,
  onChange,
  all,
  options,
  labels,
  className,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  all: string;
  options: readonly V[];
  labels: Record<V, string>;
  className?: string;
}) {
  return (
    <select aria-label={label} className={className ?? "rounded-md border border-paper-line px-2 py-1.5"} value={value} onChange={(e) => onChange(e.target.value)}>
      <option value="">{all}</option>
      {options.map((o) => (
        <option key={o} value={o}>
          {labels[o]}
        </option>
      ))}
    </select>
  );
}

import { useEffect, useState } from "react";
import { usePeople, type Person } from "../../users/api/users";
import { TextField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";

/**
 * Finds the person a tool goes to by name, e-mail, or the badge code scanned
 * from their card (scan + Enter picks the badge's owner, or the only match).
 */
export function PersonPicker({ value, onChange }: { value: Person | null; onChange: (p: Person | null) => void }) {
  const [q, setQ] = useState("");
  const [enterPending, setEnterPending] = useState(false);
  const people = usePeople(q);
  const matches = people.data?.items ?? [];

  // A scanner is faster than the search: resolve Enter once the answer is in.
  useEffect(() => {
    if (!enterPending || people.isFetching || !people.data) return;
    const exact = matches.find((p) => p.badgeCode?.toLowerCase() === q.trim().toLowerCase() || p.email.toLowerCase() === q.trim().toLowerCase());
    const pick = exact ?? (matches.length === 1 ? matches[0] : null);
    setEnterPending(false);
    if (pick) {
      onChange(pick);
      setQ("");
    }
  }, [enterPending, people.isFetching, people.data, matches, q, onChange]);

  if (value) {
    return (
      <div className="flex flex-wrap items-center gap-3 rounded-md border border-go/40 bg-go-light px-3 py-2" aria-live="polite">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Issuing to</p>
          <p className="text-lg font-bold">{value.name}</p>
          <p className="text-sm text-ink-soft">
            {value.email}
            {value.badgeCode ? ` · badge ${value.badgeCode}` : ""}
          </p>
        </div>
        <Button variant="secondary" className="ml-auto" onClick={() => onChange(null)}>
          Change person
        </Button>
      </div>
    );
  }
  return (
    <div>
      <TextField
        label="Person (name, e-mail or badge)"
        hint="Scan their badge, or type and pick from the list."
        value={q}
        autoComplete="off"
        onChange={(e) => setQ(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === "Enter") {
            e.preventDefault();
            if (q.trim()) setEnterPending(true);
          }
        }}
      />
      {q.trim() && (
        <ul className="mt-2 divide-y divide-paper-line rounded-md border border-paper-line bg-paper-raised" aria-label="Matching people">
          {matches.map((p) => (
            <li key={p.id}>
              <button type="button" className="w-full px-3 py-2 text-left hover:bg-paper-sunk" onClick={() => (onChange(p), setQ(""))}>
                <span className="font-semibold">{p.name}</span> <span className="text-sm text-ink-soft">{p.email}</span>
              </button>
            </li>
          ))}
          {people.data && matches.length === 0 && <li className="px-3 py-2 text-ink-faint">Nobody matches "{q}".</li>}
        </ul>
      )}
    </div>
  );
}

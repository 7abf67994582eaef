import { useState } from "react";
import { Button } from "../../../components/ui/button";
import { TextAreaField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";

/**
 * A button for an action the trade wants a reason for (quarantine, release,
 * retire, reject a leaf…): it opens a small form, sends the reason, and shows
 * a refusal in the server's own words.
 */
export function ReasonAction({
  label,
  prompt,
  variant = "secondary",
  confirmLabel,
  run,
}: {
  label: string;
  prompt: string;
  variant?: "primary" | "secondary" | "danger" | "ghost";
  confirmLabel?: string;
  run: (reason: string) => Promise<unknown>;
}) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (!open) {
    return (
      <Button variant={variant} onClick={() => setOpen(true)}>
        {label}
      </Button>
    );
  }
  return (
    <form
      className="flex w-full flex-col gap-2 rounded-md border border-paper-line bg-paper p-3"
      onSubmit={async (e) => {
        e.preventDefault();
        if (!reason.trim()) {
          setError("Give a reason; it goes into the record.");
          return;
        }
        setBusy(true);
        setError(null);
        try {
          await run(reason.trim());
          setOpen(false);
          setReason("");
        } catch (err) {
          setError(errorMessage(err));
        } finally {
          setBusy(false);
        }
      }}
    >
      <TextAreaField label={prompt} value={reason} onChange={(e) => setReason(e.target.value)} autoFocus />
      {error && <ErrorNote>{error}</ErrorNote>}
      <div className="flex gap-2">
        <Button type="submit" variant={variant === "ghost" ? "primary" : variant} disabled={busy}>
          {confirmLabel ?? label}
        </Button>
        <Button variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

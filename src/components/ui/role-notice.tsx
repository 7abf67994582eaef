import type { ReactNode } from "react";

/**
 * Says plainly what the signed-in role may not do on a page opened by link or URL, in place of forms
 * the server would refuse ("Your role (Auditor) can read this page but not change settings").
 */
export function RoleNotice({ roleName, children }: { roleName: string; children: ReactNode }) {
  return (
    <p role="note" className="mb-4 rounded-md border border-paper-line bg-paper-sunk px-3 py-2 text-base text-ink">
      <strong>Your role ({roleName})</strong> {children}
    </p>
  );
}

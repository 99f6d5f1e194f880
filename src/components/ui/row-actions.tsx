import type { ReactNode } from "react";

/** A full-width row under a table row, holding what one of its buttons opened: a confirmation or a short form. */
export function OpenedRow({ colSpan, children }: { colSpan: number; children: ReactNode }) {
  return (
    <tr>
      <td colSpan={colSpan} className="border-b border-rule bg-paper-sunk/50 px-2 py-2">
        {children}
      </td>
    </tr>
  );
}

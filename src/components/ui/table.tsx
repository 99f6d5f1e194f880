import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "@/lib/cn";

/** Dense table with hairline rules; `caption` names it for screen readers. */
export function Table({ caption, children, className }: { caption: string; children: ReactNode; className?: string }) {
  return (
    <div className="overflow-x-auto">
      <table className={cn("w-full border-collapse text-sm", className)}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ numeric, className, ...rest }: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th
      scope="col"
      className={cn(
        "border-b border-rule-strong px-2 py-1.5 text-2xs font-semibold tracking-wide text-ink-muted uppercase",
        numeric ? "text-right" : "text-left",
        className,
      )}
      {...rest}
    />
  );
}

/** A column of a table's head: its name, or `{ numeric: name }` for a column of figures (right-aligned). */
export type Column = string | { numeric: ReactNode };

/** A table's head: one row naming each column, in order. */
export function TableHead({ columns }: { columns: readonly Column[] }) {
  return (
    <thead>
      <tr>
        {columns.map((column, i) =>
          typeof column === "string" ? (
            <Th key={i}>{column}</Th>
          ) : (
            <Th key={i} numeric>
              {column.numeric}
            </Th>
          ),
        )}
      </tr>
    </thead>
  );
}

export function Td({ numeric, className, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <td
      className={cn("border-b border-rule px-2 py-1.5 align-top", numeric && "figures text-right", className)}
      {...rest}
    />
  );
}

export function Tr({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cn("hover:bg-paper-sunk/60", className)} {...rest} />;
}

/** A row that opens its record when clicked anywhere but on a link inside it; the open one is marked. */
export function SelectableTr({
  selected,
  onOpen,
  className,
  ...rest
}: HTMLAttributes<HTMLTableRowElement> & { selected: boolean; onOpen: () => void }) {
  return (
    <Tr
      aria-current={selected ? "true" : undefined}
      onClick={(e) => {
        if ((e.target as HTMLElement).closest("a")) return;
        onOpen();
      }}
      className={cn("cursor-pointer", selected && "bg-accent-soft/70 hover:bg-accent-soft", className)}
      {...rest}
    />
  );
}

/** Shown where a table would be empty: says what the reader can do next. */
export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="border-y border-rule px-2 py-6">
      <p className="text-sm font-medium text-ink">{title}</p>
      {children && <div className="mt-1 text-sm text-ink-muted">{children}</div>}
    </div>
  );
}

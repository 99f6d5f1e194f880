import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { useNavigate } from "react-router-dom";
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

/**
 * A column of a table's head: its name, `{ numeric: name }` for a column of figures (right-aligned), or
 * `{ actions: name }` for the last column, where each row's buttons stand (named for screen readers only).
 */
export type Column = string | { numeric: ReactNode } | { actions: string };

function ColumnTh({ column }: { column: Column }) {
  if (typeof column === "string") return <Th>{column}</Th>;
  if ("numeric" in column) return <Th numeric>{column.numeric}</Th>;
  return (
    <Th>
      <span className="sr-only">{column.actions}</span>
    </Th>
  );
}

/** A table's head: one row naming each column, in order. */
export function TableHead({ columns }: { columns: readonly Column[] }) {
  return (
    <thead>
      <tr>
        {columns.map((column, i) => (
          <ColumnTh key={i} column={column} />
        ))}
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

/** A cell listing short texts one a line, such as the e-mail addresses a message went to. */
export function ListCell({ items }: { items: readonly string[] }) {
  return (
    <Td className="text-xs">
      <ul>
        {items.map((item) => (
          <li key={item}>{item}</li>
        ))}
      </ul>
    </Td>
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

/** Which row of a list is open, where each row's link leads and what a click on a row does. */
export type RowOpening<Id> = { selectedId?: Id; hrefOf: (id: Id) => string; onOpen: (id: Id) => void };

/** The opening of a list whose records have addresses: a click on a row goes there, and the page keeps its scroll. */
export function useRowOpening<Id>(hrefOf: (id: Id) => string, selectedId: Id | undefined): RowOpening<Id> {
  const navigate = useNavigate();
  return { selectedId, hrefOf, onOpen: (id) => navigate(hrefOf(id), { preventScrollReset: true }) };
}

/**
 * A list of records, one a row, each opening its record below the table when clicked (the open one is
 * marked); `empty` stands instead of a table without rows and says what the reader can do next.
 */
export function RecordTable<Id extends string | number, T extends { id: Id }>({
  caption,
  columns,
  records,
  selectedId,
  onOpen,
  empty,
  children: cells,
}: Omit<RowOpening<Id>, "hrefOf"> & {
  caption: string;
  columns: readonly Column[];
  records: readonly T[];
  empty: { title: string; next?: ReactNode };
  /** The cells of one record's row. */
  children: (record: T) => ReactNode;
}) {
  if (records.length === 0) return <EmptyState title={empty.title}>{empty.next}</EmptyState>;
  return (
    <Table caption={caption}>
      <TableHead columns={columns} />
      <tbody>
        {records.map((record) => (
          <SelectableTr key={record.id} selected={record.id === selectedId} onOpen={() => onOpen(record.id)}>
            {cells(record)}
          </SelectableTr>
        ))}
      </tbody>
    </Table>
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

import type { SignedOffQuarter, UploadPreview } from "@shared/schemas/upload";
import { quarterLabel } from "@shared/backtest/quarters";
import { Table, Td, Th, Tr } from "@/components/ui/table";
import { formatBusinessDate, formatCount, formatDecimal, plural } from "@/lib/format";
import { Subsection } from "@/components/ui/page-title";

const signedOffWords: Record<SignedOffQuarter["status"], string> = { approved: "approved", filed: "filed" };

/** "LKS-EU Q3 2026 (approved)". */
export function quarterWords(q: SignedOffQuarter): string {
  return `${q.entity} ${quarterLabel(q.quarterEnd)} (${signedOffWords[q.status]})`;
}

const cell = (v: number | null) => (v === null ? "empty" : formatDecimal(v));

/**
 * The days a file restates: each changed cell as stored → as in the file, and a mark on a day whose quarter is
 * signed off. The list is the preview's first days (RESTATED_DAYS_SHOWN); the count above says how many there are.
 */
export function RestatedDays({ preview }: { preview: UploadPreview }) {
  const days = preview.restatedDays;
  if (preview.restatements === 0 || days.length === 0) return null;
  return (
    <Subsection titleId="restated-title" title="Restated days" className="flex flex-col gap-2">
      <p className="text-sm text-ink-muted">
        {plural(preview.restatements, "day already stored changes", "days already stored change")}: the earlier version
        is kept and the new one counts from the commit.
        {days.length < preview.restatements &&
          ` The first ${formatCount(days.length)} are listed; the rows below show every day.`}
      </p>
      <Table caption={`Restated days of upload #${preview.id}`}>
        <thead>
          <tr>
            <Th>Portfolio</Th>
            <Th>Date</Th>
            <Th>Changed cells (stored → in the file)</Th>
            <Th>Signed-off quarter</Th>
          </tr>
        </thead>
        <tbody>
          {days.map((d) => (
            <Tr key={`${d.portfolio}|${d.date}`}>
              <Td className="whitespace-nowrap">{d.portfolio}</Td>
              <Td className="figures whitespace-nowrap">{formatBusinessDate(d.date)}</Td>
              <Td>
                <ul className="flex flex-col gap-0.5">
                  {d.changes.map((c) => (
                    <li key={c.column}>
                      <code className="text-xs">{c.column}</code>{" "}
                      <span className="figures">
                        {cell(c.from)} → {cell(c.to)}
                      </span>
                    </li>
                  ))}
                </ul>
              </Td>
              <Td className={d.signedOff ? "font-medium text-danger" : "text-ink-muted"}>
                {d.signedOff ? (
                  <>
                    <span aria-hidden="true">▲ </span>
                    {quarterWords(d.signedOff)}
                  </>
                ) : (
                  "—"
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Subsection>
  );
}

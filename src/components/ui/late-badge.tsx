/**
 * "Late": an overshooting notice not sent by its due day, or sent after it. Said in words with the
 * danger tone (never a zone colour), wherever a notice appears.
 */
export function LateBadge({ title }: { title?: string }) {
  return (
    <span
      title={title}
      className="inline-flex items-center rounded-sm border border-danger bg-danger-soft px-1.5 text-xs font-semibold text-danger"
    >
      Late
    </span>
  );
}

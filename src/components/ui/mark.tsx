/** Quartermark's own mark: a quarter arc with a check, drawn in the page's ink and accent. */
export function QuartermarkMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="6" className="fill-ink" />
      <path d="M8 24V8a16 16 0 0 1 16 16z" fill="none" className="stroke-paper" strokeWidth="2.5" />
      <path
        d="M13 19l3 3 6-8"
        fill="none"
        stroke="#5fb3ba"
        strokeWidth="2.5"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </svg>
  );
}

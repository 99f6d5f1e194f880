import { Button } from "@/components/ui/button";

// Stable, so the focus moves once, when the confirmation appears.
const focusWhenShown = (el: HTMLElement | null) => {
  el?.focus();
};

/** Asks before a change that cannot simply be taken back, and says what it will do. */
export function Confirmation({
  label,
  text,
  confirm,
  busy,
  danger = false,
  onConfirm,
  onCancel,
}: {
  label: string;
  text: string;
  confirm: string;
  busy: boolean;
  danger?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <div role="group" aria-label={label} className="flex flex-col gap-2 border-l-2 border-accent pl-3">
      <p className="text-sm">{text}</p>
      <div className="flex items-center gap-3">
        <Button
          variant={danger ? "danger" : "primary"}
          size="sm"
          ref={focusWhenShown}
          disabled={busy}
          onClick={onConfirm}
        >
          {confirm}
        </Button>
        <Button variant="quiet" size="sm" disabled={busy} onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

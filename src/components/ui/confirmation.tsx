import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { cancelOnEscape, focusWhenShown, useFocusReturn } from "@/lib/focus";

/**
 * Whether a Confirmation stands in place of the button that opened it. `opener` goes on that button:
 * `cancel()` closes the confirmation and gives the focus back to it.
 */
export function useConfirmStep() {
  const [confirming, setConfirming] = useState(false);
  const opener = useFocusReturn<HTMLButtonElement>();
  function cancel() {
    opener.returnFocus();
    setConfirming(false);
  }
  return { confirming, setConfirming, opener, cancel };
}

/**
 * Asks before a change that cannot simply be taken back, and says what it will do. The confirming
 * button takes the focus when it appears; Cancel or Escape closes it (the screen gives the focus
 * back to the control that opened it).
 */
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
  text: ReactNode;
  confirm: string;
  busy: boolean;
  danger?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <div
      role="group"
      aria-label={label}
      onKeyDown={cancelOnEscape(() => !busy && onCancel())}
      className="flex flex-col gap-2 border-l-2 border-accent pl-3"
    >
      <div className="text-sm">{text}</div>
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

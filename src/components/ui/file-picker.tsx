import type { ReactNode, Ref } from "react";
import { cn } from "@/lib/cn";

const looks = {
  primary: "h-8.5 border-accent bg-accent px-3.5 text-paper-raised hover:bg-accent-hover",
  secondary: "h-7 border-rule-strong bg-paper-raised px-2.5 text-ink hover:border-ink-muted",
};

/**
 * A file chooser drawn as a button: the input stays hidden but takes the focus, and its label
 * (`children`) is what one presses. Every choice reaches `onFile`, the same file chosen again too
 * (after fixing it, or to check it again).
 */
export function FilePicker({
  id,
  accept,
  disabled,
  describedBy,
  onFile,
  inputRef,
  look,
  children,
}: {
  id: string;
  accept: string;
  disabled: boolean;
  describedBy: string;
  onFile: (file: File) => void;
  inputRef?: Ref<HTMLInputElement>;
  look: keyof typeof looks;
  children: ReactNode;
}) {
  return (
    <>
      <input
        ref={inputRef}
        id={id}
        type="file"
        accept={accept}
        className="peer sr-only"
        disabled={disabled}
        aria-describedby={describedBy}
        onChange={(e) => {
          const file = e.target.files?.[0];
          e.target.value = "";
          if (file) onFile(file);
        }}
      />
      <label
        htmlFor={id}
        className={cn(
          "inline-flex cursor-pointer items-center rounded-sm border text-sm font-medium",
          looks[look],
          "peer-focus-visible:outline-2 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-accent",
          "peer-disabled:cursor-not-allowed peer-disabled:opacity-55",
        )}
      >
        {children}
      </label>
    </>
  );
}

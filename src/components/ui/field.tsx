import {
  useId,
  type InputHTMLAttributes,
  type Ref,
  type ReactNode,
  type SelectHTMLAttributes,
  type TextareaHTMLAttributes,
} from "react";
import { cn } from "@/lib/cn";

const control =
  "block w-full h-8.5 rounded-sm border bg-paper-raised px-2.5 text-sm text-ink placeholder:text-ink-faint " +
  "focus:outline-2 focus:outline-offset-0 focus:outline-accent";

// No fixed height: a textarea is as tall as its rows.
const textareaControl =
  "block w-full max-w-2xl rounded-sm border bg-paper-raised px-2.5 py-1.5 text-sm focus:outline-2 focus:outline-accent";

type Common = { label: string; error?: string; hint?: ReactNode; className?: string };

function describedBy(hintId: string | undefined, errorId: string | undefined) {
  const ids = [hintId, errorId].filter(Boolean).join(" ");
  return ids || undefined;
}

function FieldShell({
  id,
  label,
  error,
  hint,
  hintId,
  errorId,
  className,
  hintClassName = "text-2xs",
  children,
}: Common & { id: string; hintId?: string; errorId?: string; hintClassName?: string; children: ReactNode }) {
  return (
    <div className={cn("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-xs font-medium text-ink-soft">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={hintId} className={cn(hintClassName, "text-ink-muted")}>
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="text-xs text-danger">
          {error}
        </p>
      )}
    </div>
  );
}

/** The ids that tie a control to its hint and error text, and the control's own props that use them. */
function useFieldIds(givenId: string | undefined, error: unknown, hint: unknown) {
  const autoId = useId();
  const id = givenId ?? autoId;
  const errorId = error ? `${id}-error` : undefined;
  const hintId = hint && !error ? `${id}-hint` : undefined;
  const controlProps = {
    id,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": describedBy(hintId, errorId),
  };
  return { id, errorId, hintId, controlProps };
}

export function TextField({
  label,
  error,
  hint,
  className,
  id: givenId,
  ...input
}: Common & InputHTMLAttributes<HTMLInputElement>) {
  const { id, errorId, hintId, controlProps } = useFieldIds(givenId, error, hint);
  return (
    <FieldShell {...{ id, label, error, hint, hintId, errorId, className }}>
      <input
        {...controlProps}
        className={cn(
          control,
          error ? "border-danger" : "border-rule-control",
          input.type === "number" && "figures text-right",
        )}
        {...input}
      />
    </FieldShell>
  );
}

export function SelectField({
  label,
  error,
  hint,
  className,
  id: givenId,
  children,
  ...select
}: Common & SelectHTMLAttributes<HTMLSelectElement>) {
  const { id, errorId, hintId, controlProps } = useFieldIds(givenId, error, hint);
  return (
    <FieldShell {...{ id, label, error, hint, hintId, errorId, className }}>
      <select
        {...controlProps}
        className={cn(control, "pr-7", error ? "border-danger" : "border-rule-control")}
        {...select}
      >
        {children}
      </select>
    </FieldShell>
  );
}

/** A comment or note of a few sentences; its hint is a sentence too, so it reads at the size of the error. */
export function TextareaField({
  label,
  error,
  hint,
  className,
  id: givenId,
  ...textarea
}: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const { id, errorId, hintId, controlProps } = useFieldIds(givenId, error, hint);
  return (
    <FieldShell {...{ id, label, error, hint, hintId, errorId, className }} hintClassName="text-xs">
      <textarea
        {...controlProps}
        className={cn(textareaControl, error ? "border-danger" : "border-rule-control")}
        {...textarea}
      />
    </FieldShell>
  );
}

/**
 * A form-level message (the server's answer, or what blocks the form). With a `ref` it can take the
 * focus (tabIndex -1), so a screen may move the reader to an error that replaced what they acted on.
 */
export function FormMessage({
  children,
  tone = "error",
  ref,
}: {
  children?: ReactNode;
  tone?: "error" | "done";
  ref?: Ref<HTMLParagraphElement>;
}) {
  if (!children) return null;
  return (
    <p
      ref={ref}
      tabIndex={ref ? -1 : undefined}
      role={tone === "error" ? "alert" : "status"}
      className={cn(
        "border-l-2 px-3 py-1.5 text-sm",
        tone === "error" ? "border-danger bg-danger-soft text-danger" : "border-accent bg-accent-soft text-ink",
      )}
    >
      {children}
    </p>
  );
}

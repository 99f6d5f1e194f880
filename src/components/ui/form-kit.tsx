import { useRef, useState, type FormEvent, type ReactNode, type RefObject } from "react";
import type { UseMutationResult } from "@tanstack/react-query";
import type { z } from "zod";
import { Button, type ButtonProps } from "@/components/ui/button";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, validate, type FieldErrors } from "@/lib/form";

type Values = Record<string, string>;

/**
 * What every form of the office keeps: the typed values, the errors shown beside the fields and the
 * form element, so a refusal moves the keyboard to the first field that carries an error.
 * `clearOnEdit`: typing into a field takes its error away (and the last "done" message with it).
 */
export function useFormKit<V extends Values>(initial: V, { clearOnEdit = false } = {}) {
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState<V>(initial);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState<string>();

  /** Shows the errors and moves the focus to the first field that has one. */
  function fail(next: FieldErrors) {
    setErrors(next);
    focusFirstInvalid(formRef.current);
  }

  /** Parses the input with the server's own schema; when it does not pass, shows why (worded by `reword`). */
  function check<S extends z.ZodType>(schema: S, input: unknown, reword?: (errors: FieldErrors) => FieldErrors) {
    const r = validate(schema, input);
    if (r.ok) return r.data;
    fail(reword ? reword(r.errors) : r.errors);
    return undefined;
  }

  /** Sends checked data; the server's refusals of single fields stand beside those fields. */
  function send<TData, TVariables>(
    mutation: UseMutationResult<TData, Error, TVariables>,
    data: TVariables,
    onSuccess: (result: TData) => void,
  ) {
    setErrors({});
    mutation.mutate(data, { onSuccess, onError: (err) => fail(fieldErrorsOf(err)) });
  }

  function set<K extends keyof V>(k: K, value: string) {
    setValues((v) => ({ ...v, [k]: value }));
    if (!clearOnEdit) return;
    setErrors((x) => ({ ...x, [k]: undefined }));
    setDone(undefined);
  }

  /** The props that tie a TextField or SelectField to one value: its name, value, change and error. */
  function field<K extends keyof V & string>(k: K) {
    return {
      name: k,
      value: values[k],
      onChange: (e: { target: { value: string } }) => set(k, e.target.value),
      error: errors[k],
    };
  }

  return { formRef, values, setValues, errors, setErrors, done, setDone, fail, check, send, field };
}

/**
 * A form headed by its own title, which names it for screen readers (`titleId`). The browser's own
 * checks stay off (`noValidate`): the server's schema judges, and its messages stand beside the fields.
 */
export function HeadedForm({
  formRef,
  onSubmit,
  titleId,
  title,
  level = 2,
  className = "flex flex-col gap-3",
  children,
}: {
  formRef: RefObject<HTMLFormElement | null>;
  onSubmit: (e: FormEvent) => void;
  titleId: string;
  title: string;
  /** 3 for a form inside a panel that has its own heading: a small heading of the third level. */
  level?: 2 | 3;
  className?: string;
  children: ReactNode;
}) {
  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-labelledby={titleId} className={className}>
      {level === 2 ? (
        <h2 id={titleId}>{title}</h2>
      ) : (
        <h3 id={titleId} className="text-sm font-semibold">
          {title}
        </h3>
      )}
      {children}
    </form>
  );
}

/** A form's submit button: it says what is happening while the request runs and cannot be pressed twice. */
export function SubmitButton({
  pending,
  busyLabel,
  children,
  disabled,
  ...rest
}: ButtonProps & { pending: boolean; busyLabel: string; children: ReactNode }) {
  return (
    <Button type="submit" disabled={pending || disabled} {...rest}>
      {pending ? busyLabel : children}
    </Button>
  );
}

import type { ReactNode } from "react";
import { TextField } from "@/components/ui/field";

/** Each password box of the sign-in and password forms: its label, its name and what the browser may fill in. */
const kinds = {
  "sign-in": { label: "Password", name: "password", autoComplete: "current-password" },
  current: { label: "Current password", name: "current-password", autoComplete: "current-password" },
  new: { label: "New password", name: "new-password", autoComplete: "new-password" },
  repeat: { label: "Repeat the new password", name: "repeat-password", autoComplete: "new-password" },
} as const;

/** A password box of one of the kinds above; `onValue` receives what was typed. */
export function PasswordField({
  kind,
  onValue,
  ...rest
}: {
  kind: keyof typeof kinds;
  id?: string;
  value: string;
  onValue: (value: string) => void;
  error?: string;
  hint?: ReactNode;
}) {
  return <TextField {...kinds[kind]} type="password" onChange={(e) => onValue(e.target.value)} {...rest} />;
}

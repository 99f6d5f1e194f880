import type { ReactNode } from "react";
import { PageTitle } from "@/components/ui/page-title";
import { cn } from "@/lib/cn";
import { CAUTION } from "./caution";

/** The standing caution at the foot of every screen; `wide` lines it up with the signed-in screens' column. */
export function CautionFooter({ wide = false }: { wide?: boolean }) {
  return (
    <footer className="border-t border-rule">
      <p className={cn(wide && "mx-auto max-w-screen-2xl", "px-6 py-2 text-2xs text-ink-muted")}>{CAUTION}</p>
    </footer>
  );
}

/** A screen for someone not signed in (sign-in, setting a password): one narrow column, the caution below. */
export function PublicPage({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 items-start justify-center px-6 pt-[12vh]">
        <PageTitle>{title}</PageTitle>
        <div className="w-full max-w-sm">{children}</div>
      </main>
      <CautionFooter />
    </div>
  );
}

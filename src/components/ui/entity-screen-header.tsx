import type { ReactNode } from "react";
import { useNavigate } from "react-router-dom";
import { cn } from "@/lib/cn";
import { EntitySelect } from "./entity-select";
import { PageTitle } from "./page-title";

/**
 * The head of a screen about one entity at a time: the tab's title (`screen.label`), the heading
 * `titleId` names the screen by (`title`, by default the label, then the entity's name unless
 * `plain`), what the screen
 * is for (`children`), and the select that opens the screen on another of `entities`.
 */
export function EntityScreenHeader({
  screen,
  titleId,
  title = screen.label,
  plain = false,
  entities,
  entity,
  introClassName,
  children,
}: {
  screen: { label: string; href: (q: { entity: string }) => string };
  titleId: string;
  title?: string;
  plain?: boolean;
  entities: readonly { code: string; name: string }[];
  entity: string;
  introClassName?: string;
  children: ReactNode;
}) {
  const navigate = useNavigate();
  const current = entities.find((e) => e.code === entity);
  return (
    <>
      <PageTitle>{screen.label}</PageTitle>
      <header className="flex flex-wrap items-end justify-between gap-4 border-b border-rule pb-3">
        <div className="flex flex-col gap-1">
          <h1 id={titleId}>
            {title}
            {current && !plain ? `: ${current.name}` : ""}
          </h1>
          <p className={cn(introClassName, "text-sm text-ink-muted")}>{children}</p>
        </div>
        <EntitySelect entities={entities} value={entity} onChoose={(code) => navigate(screen.href({ entity: code }))} />
      </header>
    </>
  );
}

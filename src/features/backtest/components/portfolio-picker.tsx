import { useId } from "react";

type Option = { code: string; name: string };

/** Entity, then portfolio: choosing either opens that portfolio's backtest. */
export function PortfolioPicker({
  entities,
  entity,
  portfolios,
  portfolio,
  onEntity,
  onPortfolio,
}: {
  entities: Option[];
  entity: string;
  portfolios: (Option & { level: "top" | "desk" })[] | undefined;
  portfolio: string | null;
  onEntity: (code: string) => void;
  onPortfolio: (code: string) => void;
}) {
  const entityId = useId();
  const portfolioId = useId();
  const control =
    "h-8 rounded-sm border border-rule-control bg-paper-raised px-2 text-sm focus:outline-2 focus:outline-accent";
  return (
    <div className="flex flex-wrap items-end gap-3">
      <div className="flex flex-col gap-1">
        <label htmlFor={entityId} className="text-xs font-medium text-ink-soft">
          Entity
        </label>
        <select id={entityId} value={entity} onChange={(e) => onEntity(e.target.value)} className={control}>
          {entities.map((e) => (
            <option key={e.code} value={e.code}>
              {e.code} · {e.name}
            </option>
          ))}
        </select>
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor={portfolioId} className="text-xs font-medium text-ink-soft">
          Portfolio
        </label>
        <select
          id={portfolioId}
          value={portfolio ?? ""}
          onChange={(e) => onPortfolio(e.target.value)}
          disabled={!portfolios || portfolios.length === 0}
          className={control}
        >
          {portfolio === null && <option value="">{portfolios ? "No portfolio" : "Loading…"}</option>}
          {portfolios?.map((p) => (
            <option key={p.code} value={p.code}>
              {p.level === "top" ? "Top of house" : "Desk"}: {p.name}
            </option>
          ))}
        </select>
      </div>
    </div>
  );
}

import type { FrtbFigures, FrtbStatusPoint, DeskStatusDto } from "@shared/schemas/frtb";
import { Table, TableHead, Td, Th, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatAmount, formatBusinessDate, formatDecimal, formatFactor } from "@/lib/format";
import { quarterLabel } from "@shared/backtest/quarters";

export const deskStatusLabels: Record<DeskStatusDto, string> = {
  "in-model": "In the model",
  amber: "In the model, amber (surcharge)",
  "out-of-model": "Out of the model (standardised)",
};

const sourceWords = { top: "top of house", desks: "desks added up", none: "not supplied" } as const;

/**
 * FRTB capital as MAR33.41–33.45 aggregate it, every intermediate figure in a row with its rule and
 * where it came from; then each desk's status now and at each determination (the timeline).
 */
export function FrtbAggregation({
  figures,
  note,
  timeline,
  currency,
  date,
}: {
  figures: FrtbFigures | null | undefined;
  note: string | null | undefined;
  timeline: readonly FrtbStatusPoint[];
  currency: string;
  date: string;
}) {
  const amount = (v: number) => formatAmount(v, currency);
  const out = figures?.desks.filter((d) => d.status === "out-of-model") ?? [];
  const amber = figures?.desks.filter((d) => d.status === "amber") ?? [];
  return (
    <section aria-labelledby="frtb-title" className="flex flex-col gap-3">
      <h2 id="frtb-title">FRTB aggregate capital requirement</h2>
      {!figures ? (
        <p className="text-sm text-ink-soft">{note ?? "No aggregate capital requirement for this date."}</p>
      ) : (
        <>
          <p className="text-sm" data-testid="frtb-summary">
            On {formatBusinessDate(date)} the aggregate capital requirement is{" "}
            <strong className="figures">{amount(figures.acrTotal)}</strong>
            {figures.acrTotal < figures.imaGA + figures.surcharge + figures.cU
              ? ", capped by the standardised charge of all desks"
              : ""}
            .{" "}
            {out.length === 0 ? "Every desk is in the model" : `${out.map((d) => d.code).join(", ")} out of the model`}
            {amber.length ? `; ${amber.map((d) => d.code).join(", ")} amber on P&L attribution` : ""}
            {figures.statusQuarterEnd
              ? ` (statuses of the ${quarterLabel(figures.statusQuarterEnd)} determination).`
              : " (no determination yet: every desk is taken as in the model)."}
          </p>
          <Table caption="The aggregation step by step (Basel Framework MAR33.41–33.45)">
            <TableHead columns={["Figure", "Rule", "From", { numeric: "Amount" }]} />
            <tbody>
              <Tr>
                <Td>
                  C<sub>A</sub>
                </Td>
                <Td>
                  max(IMCC<sub>t−1</sub> + SES<sub>t−1</sub>, m<sub>c</sub> · IMCC<sub>avg</sub> + SES<sub>avg</sub>) ={" "}
                  max({amount(figures.imccPrev)} + {amount(figures.sesPrev)}, {formatFactor(figures.multiplier)} ·{" "}
                  {amount(figures.imccAvg)} + {amount(figures.sesAvg)}) · MAR33.41
                </Td>
                <Td>{sourceWords[figures.sources.imcc]}</Td>
                <Td numeric data-testid="frtb-ca">
                  {amount(figures.ca)}
                </Td>
              </Tr>
              <Tr>
                <Td>DRC</Td>
                <Td>Default risk charge of the desks in the model · MAR33.43</Td>
                <Td>{sourceWords[figures.sources.drc]}</Td>
                <Td numeric>{amount(figures.drc)}</Td>
              </Tr>
              <Tr>
                <Td>
                  IMA<sub>G,A</sub>
                </Td>
                <Td>
                  C<sub>A</sub> + DRC · MAR33.43
                </Td>
                <Td />
                <Td numeric data-testid="frtb-ima">
                  {amount(figures.imaGA)}
                </Td>
              </Tr>
              <Tr>
                <Td>
                  C<sub>U</sub>
                </Td>
                <Td>Standardised charge of the desks out of the model · MAR33.43</Td>
                <Td>{out.length ? sourceWords.desks : "no desk out"}</Td>
                <Td numeric data-testid="frtb-cu">
                  {amount(figures.cU)}
                </Td>
              </Tr>
              <Tr>
                <Td>
                  SA<sub>all desks</sub>
                </Td>
                <Td>Standardised charge (SBM + RRAO + DRC) of all desks · MAR33.43</Td>
                <Td>{sourceWords[figures.sources.saAll]}</Td>
                <Td numeric>{amount(figures.saAll)}</Td>
              </Tr>
              <Tr>
                <Td>
                  SA<sub>G,A</sub>
                </Td>
                <Td>Standardised charge of the desks in the model · MAR33.43</Td>
                <Td>{sourceWords[figures.sources.saGA]}</Td>
                <Td numeric>{amount(figures.saGA)}</Td>
              </Tr>
              <Tr>
                <Td>k</Td>
                <Td>
                  0.5 · ΣSA(amber desks) / SA<sub>G,A</sub> = 0.5 · {amount(figures.saAmber)} / {amount(figures.saGA)} ·
                  MAR33.45
                </Td>
                <Td />
                <Td numeric>{formatDecimal(figures.k, 4)}</Td>
              </Tr>
              <Tr>
                <Td>Capital surcharge</Td>
                <Td>
                  k · max(0, SA<sub>G,A</sub> − IMA<sub>G,A</sub>) · MAR33.45
                </Td>
                <Td />
                <Td numeric data-testid="frtb-surcharge">
                  {amount(figures.surcharge)}
                </Td>
              </Tr>
              <Tr>
                <Td>
                  <strong>
                    ACR<sub>total</sub>
                  </strong>
                </Td>
                <Td>
                  min(IMA<sub>G,A</sub> + surcharge + C<sub>U</sub>, SA<sub>all desks</sub>) + max(0, IMA<sub>G,A</sub>{" "}
                  − SA<sub>G,A</sub>) · MAR33.43
                </Td>
                <Td />
                <Td numeric data-testid="frtb-acr">
                  <strong>{amount(figures.acrTotal)}</strong>
                </Td>
              </Tr>
            </tbody>
          </Table>
          {figures.notes.length > 0 && (
            <div className="text-sm">
              <h3 className="text-sm font-semibold">Figures not supplied, and the rule used instead</h3>
              <ul className="list-disc pl-5 text-ink-muted" data-testid="frtb-notes">
                {figures.notes.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </div>
          )}
          <Table caption="Desks on this date: status, desk backtesting and P&L attribution">
            <TableHead
              columns={[
                "Desk",
                "Status",
                { numeric: "Exceptions at 99% (limit 12)" },
                { numeric: "Exceptions at 97.5% (limit 30)" },
                "PLA zone",
                { numeric: "Standardised charge" },
                "Why",
              ]}
            />
            <tbody>
              {figures.desks.map((d) => (
                <Tr key={d.code}>
                  <Td>{d.code}</Td>
                  <Td>{deskStatusLabels[d.status]}</Td>
                  <Td numeric>{d.backtest99}</Td>
                  <Td numeric>{d.backtest975}</Td>
                  <Td>
                    {d.plaZone ? (
                      <ZoneBadge zone={d.plaZone} regime="frtb" />
                    ) : (
                      `Provisional (${d.plaObservations} of 250 days)`
                    )}
                  </Td>
                  <Td numeric>{d.sa === null ? "not supplied" : amount(d.sa)}</Td>
                  <Td className="text-ink-muted">{d.reason}</Td>
                </Tr>
              ))}
            </tbody>
          </Table>
        </>
      )}
      {timeline.length > 0 && <DeskTimeline timeline={timeline} />}
    </section>
  );
}

/** Each desk's status at each determination, oldest first, as a table (status in words, never by colour alone). */
function DeskTimeline({ timeline }: { timeline: readonly FrtbStatusPoint[] }) {
  const codes = [...new Set(timeline.flatMap((p) => p.desks.map((d) => d.code)))].sort();
  const short: Record<DeskStatusDto, string> = { "in-model": "In", amber: "Amber", "out-of-model": "Out" };
  return (
    <div className="overflow-x-auto">
      <Table caption="Desk status at each determination, oldest first (in force from the next business day)">
        <thead>
          <tr>
            <Th>Desk</Th>
            {timeline.map((p) => (
              <Th key={p.quarterEnd}>{quarterLabel(p.quarterEnd)}</Th>
            ))}
          </tr>
        </thead>
        <tbody>
          {codes.map((code) => (
            <Tr key={code}>
              <Td>{code}</Td>
              {timeline.map((p) => {
                const d = p.desks.find((x) => x.code === code);
                return (
                  <Td key={p.quarterEnd} title={d?.reason}>
                    {d ? short[d.status] : "—"}
                  </Td>
                );
              })}
            </Tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}

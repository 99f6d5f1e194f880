import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { renderSnapshotPack } from "../../server/pdf/snapshot-pack";
import { snapshotSchema, type Snapshot } from "../../shared/schemas/snapshot";
import { returnData, returnInputsFor } from "../../shared/backtest/return-data";
import { fileText, flat, pdfFile, pdfText } from "./pdf-helpers";

// An invented snapshot, as the API would give it, with letters beyond ASCII in its names.
const snapshot: Snapshot = snapshotSchema.parse({
  id: 7,
  entity: "LKS-CH",
  entityName: "Lärkspur Bänk Zürich AG — Genève",
  quarterEnd: "2026-06-30",
  status: "approved",
  zone: "green",
  counted: 3,
  plusFactor: 0,
  multiplier: 3,
  capital: 1234567.89,
  addOn: 0,
  figures: {
    portfolio: "LKS-CH-TOTAL",
    regime: "basel",
    pnlBasis: "hypothetical",
    currency: "CHF",
    asOf: "2026-06-30",
    window: { start: "2025-07-02", end: "2026-06-30", observations: 250, complete: true },
    exceptions: { actual: 4, hypothetical: 3, counted: 3, excluded: 0 },
    exceptionDates: ["2025-09-03", "2026-01-14", "2026-05-20"],
    zone: "green",
    zoneLabel: "green",
    plusFactor: 0,
    qualitativeAddend: 0,
    multiplier: 3,
    expected: 2.5,
    cumulativeProbability: 0.759,
    capital: 1234567.89,
    addOn: 0,
    capitalNote: null,
    desks: [],
  },
  inputsSha256: "a".repeat(64),
  engineVersion: "1.0.0",
  preparedBy: "analyste@larkspur.test",
  preparedAt: "2026-07-03T09:00:00.000Z",
  submittedBy: "analyste@larkspur.test",
  submittedAt: "2026-07-03T10:00:00.000Z",
  approvedBy: "cro@larkspur.test",
  approvedAt: "2026-07-04T08:30:00.000Z",
  history: [
    {
      at: "2026-07-04T08:30:00.000Z",
      by: "cro@larkspur.test",
      action: "approved",
      comment: "Freigegeben — für das Quartal",
    },
  ],
  prevHash: null,
  hash: "b".repeat(64),
  restatedAfterSignOff: null,
  amends: null,
  amendedBy: null,
  amendment: null,
  openFindings: 0,
  version: 3,
});

describe("a snapshot's pack as a PDF", () => {
  it("when rendered, then IBM Plex is embedded and letters beyond ASCII read back as written (pdfkit reads .woff, not .woff2, with these letters)", async () => {
    const file = pdfFile(await renderSnapshotPack(snapshot));
    expect(execFileSync("pdffonts", [file]).toString()).toMatch(/IBMPlexSans\s.*yes yes yes/);
    const text = flat(fileText(file));
    expect(text).toContain("Lärkspur Bänk Zürich AG — Genève (LKS-CH)");
    expect(text).toContain("Freigegeben — für das Quartal");
    expect(text).toContain("The probability of 3 or fewer under the binomial distribution is 75.90%");
    expect(text).toMatch(/Capital requirement 1,234,568 CHF/);
    expect(text).toMatch(/Page 1 of 3/);
    // A snapshot from before the pack kept the exceptions' amounts says so rather than leaving them out silently.
    expect(text).toContain("prepared before the pack kept each exception's amounts");
  });

  it("when the same snapshot is rendered twice, then the bytes are the same (its dates are the snapshot's own)", async () => {
    const [a, b] = [await renderSnapshotPack(snapshot), await renderSnapshotPack(snapshot)];
    expect(a.equals(b)).toBe(true);
  });
});

describe("an FRTB snapshot's pack and return data", () => {
  // Display figures, as the engine froze them: what the pack and the return must print unchanged.
  const frtb = snapshotSchema.parse({
    ...snapshot,
    figures: {
      ...snapshot.figures,
      regime: "frtb",
      desks: [
        { portfolio: "LKS-CH-RATES", exceptions99: 3, exceptions975: 8, passes: true, plaZone: "green" },
        { portfolio: "LKS-CH-CREDIT", exceptions99: 14, exceptions975: 33, passes: false, plaZone: "amber" },
      ],
      frtb: {
        statusQuarterEnd: "2026-06-30",
        multiplier: 1.5,
        imccPrev: 100,
        imccAvg: 90,
        sesPrev: 20,
        sesAvg: 18,
        binding: "average",
        ca: 153,
        drc: 40,
        imaGA: 193,
        cU: 70,
        saAll: 400,
        saGA: 250,
        saAmber: 0,
        k: 0,
        surcharge: 0,
        acrTotal: 263,
        sources: { imcc: "top", drc: "top", saAll: "top", saGA: "top" },
        desks: [],
        notes: [],
      },
    },
  });

  it("when rendered, then each desk's backtesting and P&L attribution show with what follows, and the MAR33.45 aggregation with its numbers", async () => {
    const text = flat(pdfText(await renderSnapshotPack(frtb)));
    // MAR32.19 / CRR Art. 325bf(3) (docs/rules.md#frtb-desks): 14 at 99% fails; the desk leaves the model.
    expect(text).toMatch(/LKS-CH-RATES 3 8 Passes Green Internal model/);
    expect(text).toMatch(/LKS-CH-CREDIT 14 33 Fails Amber Capital on the standardised approach/);
    // MAR33.45 (docs/rules.md#frtb-aggregation): min(193 + 0 + 70, 400) + max(0, 193 − 250) = 263.
    expect(text).toContain("min(193 + 0 + 70, 400) + max(0, 193 − 250) = 263 CHF");
  });

  it("when its return data is read, then the aggregation's figures are listed and no FRTB value is asked of the analyst", () => {
    const ret = returnData(frtb.figures, frtb.quarterEnd);
    const value = (key: string) => ret.fields.find((f) => f.key === key)?.value;
    expect(value("drc")).toBe(40);
    expect(value("cU")).toBe(70);
    expect(value("aggregateCapital")).toBe(263);
    expect(value("desksOut")).toBe(1);
    expect(ret.fields.some((f) => f.analystInput)).toBe(false);
    expect(returnInputsFor(frtb.figures)).toEqual([]);
  });
});

import { filingSchema, type Filing } from "@shared/schemas/filing";
import { snapshotSchema, type Snapshot, type SnapshotFigures } from "@shared/schemas/snapshot";

// Display fixtures of Quarter close and Filings: the screens must show what the server froze or sent, unchanged.
// Q4 2025 of LKS-EU follows BCBS 1996 Table 2 for six exceptions (yellow zone, plus factor 0.50, P(X ≤ 6) 98.63%).

/** The seal of the approved Q4 2025 and the one it links to. */
export const HASH = "ab12cd34ef5678901234567890abcdef1234567890abcdef1234567890abcdef";
export const PREV_HASH = "0f1e2d3c4b5a69788796a5b4c3d2e1f00f1e2d3c4b5a69788796a5b4c3d2e1f0";

/** Q4 2025's frozen figures for LKS-EU, changed by `over`. */
export function figures(over: Partial<SnapshotFigures> = {}): SnapshotFigures {
  return {
    portfolio: "LKS-EU-TOTAL",
    regime: "eu",
    pnlBasis: "max",
    currency: "EUR",
    asOf: "2025-12-31",
    window: { start: "2025-01-02", end: "2025-12-31", observations: 250, complete: true },
    exceptions: { actual: 5, hypothetical: 4, counted: 6, excluded: 1 },
    exceptionDates: ["2025-03-10", "2025-04-07", "2025-06-13", "2025-08-05", "2025-10-22", "2025-11-14"],
    zone: "yellow",
    zoneLabel: "Yellow",
    plusFactor: 0.5,
    qualitativeAddend: 0,
    multiplier: 3.5,
    expected: 2.5,
    cumulativeProbability: 0.9863,
    capital: 412_500_000,
    addOn: 58_928_571,
    capitalNote: null,
    desks: [],
    ...over,
  };
}

/** A snapshot as the server sends it; parsed with the shared schema so a change of contract fails here. */
export function snapshot(over: Partial<Snapshot> = {}): Snapshot {
  const f = over.figures ?? figures();
  return snapshotSchema.parse({
    id: 12,
    entity: "LKS-EU",
    entityName: "Larkspur Markets SA",
    quarterEnd: "2025-12-31",
    status: "draft",
    zone: f.zone,
    counted: f.exceptions.counted,
    plusFactor: f.plusFactor,
    multiplier: f.multiplier,
    capital: f.capital,
    addOn: f.addOn,
    figures: f,
    inputsSha256: "9c1f0a7e55d2b8e4c3a1f6d0b9e8c7a6f5e4d3c2b1a09f8e7d6c5b4a39281706",
    engineVersion: "1.4.0",
    preparedBy: "analyst@larkspur.test",
    preparedAt: "2026-01-08T10:15:00.000Z",
    submittedBy: null,
    submittedAt: null,
    approvedBy: null,
    approvedAt: null,
    history: [{ at: "2026-01-08T10:15:00.000Z", by: "analyst@larkspur.test", action: "prepared", comment: null }],
    prevHash: null,
    hash: null,
    restatedAfterSignOff: null,
    amends: null,
    amendedBy: null,
    amendment: null,
    openFindings: 0,
    version: 1,
    ...over,
  });
}

export const submitted = (over: Partial<Snapshot> = {}) =>
  snapshot({
    status: "submitted",
    submittedBy: "analyst@larkspur.test",
    submittedAt: "2026-01-09T16:40:00.000Z",
    history: [
      { at: "2026-01-08T10:15:00.000Z", by: "analyst@larkspur.test", action: "prepared", comment: null },
      {
        at: "2026-01-09T16:40:00.000Z",
        by: "analyst@larkspur.test",
        action: "submitted",
        comment: "All six exceptions explained; one exclusion approved.",
      },
    ],
    version: 5,
    ...over,
  });

export const approved = (over: Partial<Snapshot> = {}) =>
  submitted({
    status: "approved",
    approvedBy: "cro2@larkspur.test",
    approvedAt: "2026-01-12T09:05:00.000Z",
    hash: HASH,
    prevHash: PREV_HASH,
    version: 6,
    ...over,
  });

/**
 * A filing of LKS-EU's Q3 2026 pack as the server sends it, sent to two supervisor addresses; parsed with the shared
 * schema so a change of contract fails here. Each recipient's delivery and the summary follow the filing's delivery
 * unless the test gives them.
 */
export function filingFixture(over: Partial<Filing> = {}): Filing {
  const recipients = over.recipients ?? ["backtesting@supervisor.test", "desk-officer@supervisor.test"];
  const sent = (over.delivery ?? "sent") === "sent";
  const sentAt = over.sentAt ?? "2026-10-08T14:30:00.000Z";
  const deliveries = recipients.map((recipient) => ({
    recipient,
    status: sent ? ("accepted" as const) : ("pending" as const),
    detail: sent ? "250 OK: message queued" : (over.lastError ?? null),
    attempts: 1,
    acceptedAt: sent ? sentAt : null,
  }));
  const summary = sent
    ? `Sent to ${recipients.join(", ")}.`
    : `Waiting for the mail server for ${recipients.join(", ")}${over.lastError ? ` (${over.lastError})` : ""}.`;
  return filingSchema.parse({
    id: 31,
    snapshotId: 12,
    entity: "LKS-EU",
    entityName: "Larkspur Markets SA",
    quarterEnd: "2026-09-30",
    zone: "yellow",
    counted: 6,
    multiplier: 3.5,
    fileName: "LKS-EU-2026-09-30-pack.pdf",
    sha256: "5e884898da28047151d0e56f8dc6292773603d0d6aabbdd62a11ef721d1542d8",
    recipients: ["backtesting@supervisor.test", "desk-officer@supervisor.test"],
    delivery: "sent",
    messageId: "<31.pack@quartermark.test>",
    lastError: null,
    sentBy: "cro@larkspur.test",
    sentAt,
    acknowledgedBy: null,
    acknowledgedAt: null,
    snapshotHash: "4e1d0c9b8a7f6e5d4c3b2a1908f7e6d5c4b3a29180f7e6d5c4b3a2918f7e6d5c",
    amends: null,
    amendedBy: null,
    deliveries,
    summary,
    ...over,
  });
}

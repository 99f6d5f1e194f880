import { createHash } from "node:crypto";
import { screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { vi } from "vitest";
import { filingVerifySchema, type Filing } from "@shared/schemas/filing";
import { fakeApi, signedInAs, type Call, type Reply } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurUK } from "./support/entities";
import { filingFixture } from "./support/snapshots";

// Display fixtures: the screen must show what the server sent, unchanged. The SHA-256 of a held
// file is computed by the browser's Web Crypto and checked here against Node's own hash of the same bytes.

const entities = [larkspurEU, larkspurUK];

/** The bytes of the pack as the bank sent it (a stand-in: only its hash matters to the check). */
const SENT_PACK = "%PDF-1.7\nLarkspur Markets SA, Q3 2026 backtesting pack\n%%EOF\n";
const sha256Hex = (text: string) => createHash("sha256").update(text).digest("hex");

/** A filing as the server sends it (Q3 2026 of LKS-EU unless `over` says otherwise), its hash that of SENT_PACK. */
const filing = (over: Partial<Filing> = {}): Filing => filingFixture({ sha256: sha256Hex(SENT_PACK), ...over });

const older = () =>
  filing({
    id: 27,
    snapshotId: 9,
    entity: "LKS-UK",
    entityName: "Larkspur Bank plc",
    quarterEnd: "2026-06-30",
    zone: "yellow",
    counted: 7,
    multiplier: 3.65,
    fileName: "LKS-UK-2026-06-30-pack.pdf",
    sha256: "7d3f9a0b1c2e4d5f60718293a4b5c6d7e8f90a1b2c3d4e5f60718293a4b5c6d7",
    recipients: ["frtb-models@supervisor.test"],
    sentAt: "2026-07-09T09:00:00.000Z",
    acknowledgedBy: "regulator@larkspur.test",
    acknowledgedAt: "2026-07-10T08:15:00.000Z",
  });

function filingRoutes(
  role: "analyst" | "cro" | "regulator",
  store: Filing[],
  extra: Record<string, Reply | ((c: Call) => Reply)> = {},
) {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/filings": () => ({ status: 200, body: store }),
    ...extra,
  };
}

describe("Filings › the regulator", () => {
  it("when a regulator opens Filings, then their packs are listed with where they stand, and acknowledging one records who and when", async () => {
    const store = [filing(), older()];
    const api = fakeApi(
      filingRoutes("regulator", store, {
        "POST /api/filings/31/acknowledge": (c) => {
          expect(c.body).toEqual({});
          store[0] = filing({ acknowledgedBy: "regulator@larkspur.test", acknowledgedAt: "2026-10-09T07:45:00.000Z" });
          return { status: 200, body: store[0] };
        },
      }),
    );
    const user = userEvent.setup();
    renderApp("/");

    await user.click(
      within(await screen.findByRole("navigation", { name: "Main" })).getByRole("link", { name: "Filings" }),
    );

    expect(await screen.findByLabelText("Where the filings stand")).toBeInTheDocument();
    expect(screen.getByTestId("filings-count")).toHaveTextContent("2 packs");
    expect(screen.getByTestId("filings-waiting")).toHaveTextContent("1 pack");

    const table = screen.getByRole("table", { name: "Filed packs, newest first" });
    const eu = within(table).getByRole("link", { name: "Open LKS-EU Q3 2026" }).closest("tr")!;
    for (const text of [
      "LKS-EU",
      "Larkspur Markets SA",
      "2026-09-30",
      "Yellow",
      "6",
      "3.50",
      "08 Oct 2026, 14:30 UTC",
      "cro@larkspur.test",
      "backtesting@supervisor.test",
      "desk-officer@supervisor.test",
      "Waiting",
    ]) {
      expect(within(eu).getByText(text)).toBeInTheDocument();
    }
    const uk = within(table).getByRole("link", { name: "Open LKS-UK Q2 2026" }).closest("tr")!;
    expect(within(uk).getByText("Amber")).toBeInTheDocument();
    expect(within(uk).getByText("10 Jul 2026, 08:15 UTC")).toBeInTheDocument();
    expect(within(uk).getByText("regulator@larkspur.test")).toBeInTheDocument();

    const detail = screen.getByRole("region", { name: "LKS-EU Q3 2026 · Larkspur Markets SA" });
    expect(within(detail).getByRole("button", { name: "Download the pack (PDF)" })).toBeInTheDocument();
    expect(within(within(detail).getByTestId("filing-sha256")).getByText(sha256Hex(SENT_PACK))).toBeInTheDocument();

    await user.click(within(detail).getByRole("button", { name: "Acknowledge receipt" }));

    expect(api.callsTo("POST", "/api/filings/31/acknowledge")).toHaveLength(1);
    expect(
      await within(detail).findByText("You acknowledged receipt of LKS-EU's pack for Q3 2026."),
    ).toBeInTheDocument();
    expect(within(detail).getByTestId("filing-acknowledged")).toHaveTextContent(
      "Acknowledged by regulator@larkspur.test on 09 Oct 2026, 07:45 UTC.",
    );
    expect(within(detail).queryByRole("button", { name: "Acknowledge receipt" })).not.toBeInTheDocument();
    expect(screen.getByTestId("filings-waiting")).toHaveTextContent("None");
    expect(within(eu).getByText("09 Oct 2026, 07:45 UTC")).toBeInTheDocument();
  });

  it("when the regulator checks a file they hold, then the browser hashes it and says match or no match, and nothing is uploaded", async () => {
    const api = fakeApi(filingRoutes("regulator", [filing()]));
    const user = userEvent.setup();
    renderApp("/filings");

    const input = await screen.findByLabelText("Check a file you hold");
    await user.upload(input, new File([SENT_PACK], "pack-as-received.pdf", { type: "application/pdf" }));

    const match = await screen.findByRole("status", { name: "File check" });
    expect(match).toHaveTextContent("Match: pack-as-received.pdf is the pack as it was sent.");
    expect(within(match).getByText(`${sha256Hex(SENT_PACK).slice(0, 12)}…`)).toHaveAttribute(
      "title",
      sha256Hex(SENT_PACK),
    );

    const altered = SENT_PACK.replace("Q3 2026", "Q3 2O26");
    await user.upload(input, new File([altered], "pack-from-a-forward.pdf", { type: "application/pdf" }));

    const noMatch = await screen.findByText("No match: pack-from-a-forward.pdf is not the pack as it was sent.");
    const check = noMatch.closest("[role='status']")!;
    expect(within(check as HTMLElement).getByText(`${sha256Hex(altered).slice(0, 12)}…`)).toHaveAttribute(
      "title",
      sha256Hex(altered),
    );
    expect(check).toHaveTextContent("ask the bank for the file again");
    expect(api.calls.filter((c) => c.method !== "GET")).toHaveLength(0);
  });

  it("when the reader checks the server's copy, then its answer shows valid or invalid with the detail, asked afresh each time", async () => {
    const checks = [
      filingVerifySchema.parse({
        valid: true,
        sha256: filing().sha256,
        snapshotHash: "ab12cd34ef5678901234567890abcdef1234567890abcdef1234567890abcdef",
        detail: "The pack is the file that was sent, and its snapshot verifies: the hash matches the stored figures.",
      }),
      filingVerifySchema.parse({
        valid: false,
        sha256: filing().sha256,
        snapshotHash: "ab12cd34ef5678901234567890abcdef1234567890abcdef1234567890abcdef",
        detail: "The kept pack no longer has the sha256 that was sent (it gives 0123456789ab…).",
      }),
    ];
    const api = fakeApi(
      filingRoutes("regulator", [filing()], {
        "GET /api/filings/31/verify": () => ({ status: 200, body: checks.shift() }),
      }),
    );
    const user = userEvent.setup();
    renderApp("/filings?filing=31");

    await user.click(await screen.findByRole("button", { name: "Check the server's copy" }));
    const result = await screen.findByRole("status", { name: "Server copy check" });
    expect(result).toHaveTextContent("Valid: the kept pack is the file that was sent.");
    expect(result).toHaveTextContent("its snapshot verifies");

    await user.click(screen.getByRole("button", { name: "Check again" }));
    expect(await screen.findByText("Invalid: the kept pack or its quarter does not check out.")).toBeInTheDocument();
    expect(screen.getByRole("status", { name: "Server copy check" })).toHaveTextContent(
      "no longer has the sha256 that was sent",
    );
    expect(api.callsTo("GET", "/api/filings/31/verify")).toHaveLength(2);
  });

  it("when the regulator copies the pack's SHA-256, then all 64 characters are written out, go to the clipboard, and the button says Copied", async () => {
    fakeApi(filingRoutes("regulator", [filing()]));
    const user = userEvent.setup();
    renderApp("/filings?filing=31");

    const sha = await screen.findByTestId("filing-sha256");
    const written = within(sha).getByText(sha256Hex(SENT_PACK));
    expect(written.tagName).toBe("CODE");
    expect(written.textContent).toHaveLength(64);
    await user.click(within(sha).getByRole("button", { name: "Copy" }));

    expect(await navigator.clipboard.readText()).toBe(sha256Hex(SENT_PACK));
    expect(within(sha).getByRole("button", { name: "Copied" })).toBeInTheDocument();
  });

  it("when a second check of the server's copy fails, then its error shows and the earlier Valid is no longer on screen", async () => {
    const checks: Reply[] = [
      {
        status: 200,
        body: filingVerifySchema.parse({
          valid: true,
          sha256: filing().sha256,
          snapshotHash: null,
          detail: "The pack is the file that was sent.",
        }),
      },
      // The entity's assignment was withdrawn between the two checks.
      { status: 404, body: { error: { code: "not_found", message: "No filing #31 among the filings you can read." } } },
    ];
    fakeApi(filingRoutes("regulator", [filing()], { "GET /api/filings/31/verify": () => checks.shift()! }));
    const user = userEvent.setup();
    renderApp("/filings?filing=31");

    await user.click(await screen.findByRole("button", { name: "Check the server's copy" }));
    expect(await screen.findByRole("status", { name: "Server copy check" })).toHaveTextContent(
      "Valid: the kept pack is the file that was sent.",
    );

    await user.click(screen.getByRole("button", { name: "Check again" }));
    expect(await screen.findByText("No filing #31 among the filings you can read.")).toBeInTheDocument();
    expect(screen.queryByRole("status", { name: "Server copy check" })).not.toBeInTheDocument();
    expect(screen.queryByText(/Valid: the kept pack/)).not.toBeInTheDocument();
  });

  it("when the page is served without HTTPS, then no file is asked for and the screen says how to compare by hand with the full SHA-256", async () => {
    // An insecure context: random values but no Web Crypto digest.
    const real = globalThis.crypto;
    vi.stubGlobal("crypto", { getRandomValues: real.getRandomValues.bind(real) });
    fakeApi(filingRoutes("regulator", [filing()]));
    renderApp("/filings?filing=31");

    const byHand = await screen.findByTestId("held-file-by-hand");
    expect(byHand).toHaveTextContent(
      "This browser computes no SHA-256 on a page served without HTTPS, so compare the file by hand",
    );
    expect(byHand).toHaveTextContent("sha256sum LKS-EU-2026-09-30-pack.pdf");
    expect(byHand).toHaveTextContent("certutil -hashfile LKS-EU-2026-09-30-pack.pdf SHA256");
    expect(byHand).toHaveTextContent("Compare all 64 characters with the pack SHA-256 written out in full above");
    expect(within(screen.getByTestId("filing-sha256")).getByText(sha256Hex(SENT_PACK))).toBeInTheDocument();
    expect(screen.queryByLabelText("Check a file you hold")).not.toBeInTheDocument();
  });

  it("when a regulator has no filings yet, then the screen says what will appear", async () => {
    fakeApi(filingRoutes("regulator", []));
    renderApp("/filings");
    expect(await screen.findByText("No packs have been filed with you yet")).toBeInTheDocument();
    expect(screen.getByTestId("filings-count")).toHaveTextContent("0 packs");
  });
});

describe("Filings › the reporting office reads", () => {
  it.each(["analyst", "cro"] as const)(
    "when the %s opens Filings, then the list, download and checks show, but no acknowledgement is offered",
    async (role) => {
      fakeApi(filingRoutes(role, [filing(), older()]));
      const user = userEvent.setup();
      const { router } = renderApp("/filings");

      const table = await screen.findByRole("table", { name: "Filed packs, newest first" });
      expect(screen.getByTestId("filing-acknowledged")).toHaveTextContent("Not acknowledged yet");
      expect(screen.queryByRole("button", { name: "Acknowledge receipt" })).not.toBeInTheDocument();
      expect(screen.queryByRole("button", { name: /File with the supervisor/ })).not.toBeInTheDocument();
      expect(screen.getByRole("button", { name: "Check the server's copy" })).toBeInTheDocument();
      expect(screen.getByLabelText("Check a file you hold")).toBeInTheDocument();

      await user.click(within(table).getByRole("link", { name: "Open LKS-UK Q2 2026" }));
      expect(router.state.location.search).toBe("?filing=27");
      const detail = await screen.findByRole("region", { name: "LKS-UK Q2 2026 · Larkspur Bank plc" });
      expect(within(detail).getByTestId("filing-acknowledged")).toHaveTextContent(
        "Acknowledged by regulator@larkspur.test on 10 Jul 2026, 08:15 UTC.",
      );
      expect(within(detail).getByRole("button", { name: "Download the pack (PDF)" })).toBeInTheDocument();
    },
  );

  it("when a pack waits for the mail server, then it is counted apart, not as waiting for acknowledgement nor as the latest sent", async () => {
    const waitingForMail = filing({
      id: 33,
      snapshotId: 14,
      quarterEnd: "2026-12-31",
      fileName: "LKS-EU-2026-12-31-pack.pdf",
      delivery: "pending",
      messageId: null,
      sentAt: null,
      lastError: "connect ECONNREFUSED 127.0.0.1:2525",
    });
    fakeApi(filingRoutes("cro", [waitingForMail, filing(), older()]));
    renderApp("/filings");

    expect(await screen.findByTestId("filings-count")).toHaveTextContent("3 packs");
    expect(screen.getByTestId("filings-waiting")).toHaveTextContent("1 pack");
    expect(screen.getByTestId("filings-latest-sent")).toHaveTextContent("LKS-EU Q3 2026 · 08 Oct 2026, 14:30 UTC");
    expect(screen.getByTestId("filings-pending")).toHaveTextContent("1 waiting for the mail server");
  });

  it("when a pack reached one recipient and was refused by another, then the CRO reads each answer and sends it to the refused one only", async () => {
    const partial = filing({
      delivery: "partial",
      deliveries: [
        {
          recipient: "backtesting@supervisor.test",
          status: "accepted",
          detail: "250 OK: message queued",
          attempts: 1,
          acceptedAt: "2026-10-08T14:30:00.000Z",
        },
        {
          recipient: "desk-officer@supervisor.test",
          status: "refused",
          detail: "550 No such mailbox: desk-officer@supervisor.test",
          attempts: 1,
          acceptedAt: null,
        },
      ],
      summary:
        "Sent to backtesting@supervisor.test; refused by desk-officer@supervisor.test: 550 No such mailbox: desk-officer@supervisor.test.",
    });
    const finished = {
      ...partial,
      delivery: "sent" as const,
      deliveries: partial.deliveries.map((d) => ({ ...d, status: "accepted" as const, detail: "250 OK" })),
      summary: "Sent to backtesting@supervisor.test, desk-officer@supervisor.test.",
    };
    const api = fakeApi(
      filingRoutes("cro", [partial], { "POST /api/filings/31/deliver": { status: 200, body: finished } }),
    );
    const user = userEvent.setup();
    renderApp("/filings");

    expect(await screen.findByTestId("filing-partial")).toHaveTextContent(
      "Partly delivered: Sent to backtesting@supervisor.test; refused by desk-officer@supervisor.test: 550 No such mailbox",
    );
    expect(screen.getByTestId("filings-partial")).toHaveTextContent("1 pack not yet with every recipient");
    const rows = screen.getAllByTestId("filing-delivery-row");
    expect(rows[0]).toHaveTextContent("Received by their mail server");
    expect(rows[1]).toHaveTextContent("Refused550 No such mailbox");

    await user.click(screen.getByRole("button", { name: "Send to desk-officer@supervisor.test" }));
    expect(await screen.findByText(finished.summary)).toBeInTheDocument();
    expect(api.calls.filter((c) => c.method === "POST" && c.path === "/api/filings/31/deliver")).toHaveLength(1);
  });

  it("when an analyst reads a partly delivered pack, then the answers show but sending is left to the CRO", async () => {
    const partial = filing({
      delivery: "partial",
      deliveries: [
        {
          recipient: "backtesting@supervisor.test",
          status: "accepted",
          detail: "250 OK",
          attempts: 1,
          acceptedAt: "2026-10-08T14:30:00.000Z",
        },
        {
          recipient: "desk-officer@supervisor.test",
          status: "refused",
          detail: "550 No such mailbox",
          attempts: 1,
          acceptedAt: null,
        },
      ],
      summary: "Sent to backtesting@supervisor.test; refused by desk-officer@supervisor.test: 550 No such mailbox.",
    });
    fakeApi(filingRoutes("analyst", [partial]));
    renderApp("/filings");

    expect(await screen.findByTestId("filing-partial")).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: /^Send to/ })).not.toBeInTheDocument();
  });

  it("when no pack waits for the mail server, then the standing says nothing about it", async () => {
    fakeApi(filingRoutes("analyst", [filing(), older()]));
    renderApp("/filings");

    await waitFor(() => expect(screen.getByTestId("filings-waiting")).toHaveTextContent("1 pack"));
    expect(screen.queryByTestId("filings-pending")).not.toBeInTheDocument();
    expect(screen.queryByText(/waiting for the mail server/)).not.toBeInTheDocument();
  });

  it.each([
    ["an administrator", "admin"],
    ["treasury", "treasury"],
  ] as const)(
    "when %s opens Filings, then it is refused, not linked, and no filing is asked for",
    async (_who, role) => {
      const api = fakeApi({
        "GET /api/auth/session": signedInAs(role),
        "GET /api/entities": { status: 200, body: entities },
      });
      renderApp("/filings");

      expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
      expect(
        within(screen.getByRole("navigation", { name: "Main" })).queryByRole("link", { name: "Filings" }),
      ).not.toBeInTheDocument();
      expect(api.calls.filter((c) => c.path.startsWith("/api/filings"))).toHaveLength(0);
    },
  );
});

describe("Filings › the pack download", () => {
  it("when the pack is downloaded, then the PDF the server sent is saved under its file name", async () => {
    const api = fakeApi(
      filingRoutes("regulator", [filing()], {
        "GET /api/filings/31/pack.pdf": {
          status: 200,
          raw: SENT_PACK,
          headers: {
            "Content-Type": "application/pdf",
            "Content-Disposition": 'attachment; filename="LKS-EU-2026-09-30-pack.pdf"',
          },
        },
      }),
    );
    const blobs: Blob[] = [];
    const names: string[] = [];
    const realCreate = URL.createObjectURL;
    const realRevoke = URL.revokeObjectURL;
    URL.createObjectURL = vi.fn((b: Blob) => (blobs.push(b), "blob:quartermark.test/pack"));
    URL.revokeObjectURL = vi.fn();
    const click = vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
      names.push(this.download);
    });
    try {
      const user = userEvent.setup();
      renderApp("/filings");

      const detail = await screen.findByRole("region", { name: "LKS-EU Q3 2026 · Larkspur Markets SA" });
      await user.click(within(detail).getByRole("button", { name: "Download the pack (PDF)" }));

      await waitFor(() => expect(names).toEqual(["LKS-EU-2026-09-30-pack.pdf"]));
      expect(await blobs[0]!.text()).toBe(SENT_PACK);
      expect(api.callsTo("GET", "/api/filings/31/pack.pdf")).toHaveLength(1);
      expect(within(detail).queryByRole("alert")).not.toBeInTheDocument();
    } finally {
      click.mockRestore();
      URL.createObjectURL = realCreate;
      URL.revokeObjectURL = realRevoke;
    }
  });

  it("when the server no longer has the filing (404), then its message shows beside the download", async () => {
    fakeApi(
      filingRoutes("regulator", [filing()], {
        "GET /api/filings/31/pack.pdf": {
          status: 404,
          body: { error: { code: "not_found", message: "No filing 31." } },
        },
      }),
    );
    const user = userEvent.setup();
    renderApp("/filings");

    const detail = await screen.findByRole("region", { name: "LKS-EU Q3 2026 · Larkspur Markets SA" });
    await user.click(within(detail).getByRole("button", { name: "Download the pack (PDF)" }));

    expect(await within(detail).findByRole("alert")).toHaveTextContent("No filing 31.");
  });
});

describe("Filings › an amended quarter", () => {
  const ORIGINAL_HASH = "1a2b3c4d5e6f708192a3b4c5d6e7f8091a2b3c4d5e6f708192a3b4c5d6e7f809";
  const AMENDMENT_HASH = "9f8e7d6c5b4a39281706f5e4d3c2b1a09f8e7d6c5b4a39281706f5e4d3c2b1a0";
  const original = () => filing({ snapshotHash: ORIGINAL_HASH, amendedBy: 15 });
  const amendment = () =>
    filing({
      id: 34,
      snapshotId: 15,
      counted: 5,
      multiplier: 3.4,
      fileName: "quartermark-lks-eu-2026-09-30-amendment-15-pack.pdf",
      sentAt: "2026-11-20T09:30:00.000Z",
      snapshotHash: AMENDMENT_HASH,
      amends: 12,
    });

  it("when the supervisor opens an amendment's filing, then it names the original filing with a link, and both snapshots' hashes show", async () => {
    fakeApi(filingRoutes("regulator", [amendment(), original()]));
    const user = userEvent.setup();
    renderApp("/filings?filing=34");

    const table = await screen.findByRole("table", { name: "Filed packs, newest first" });
    expect(within(table).getByText("Amendment of snapshot #12")).toBeInTheDocument();
    expect(within(table).getByText("Amended by snapshot #15")).toBeInTheDocument();
    const link = screen.getByRole("region", { name: "Amendment of an earlier filing" });
    expect(link).toHaveTextContent(
      "This pack amends the filing of snapshot #12 (filing #31, sent 08 Oct 2026, 14:30 UTC)",
    );
    expect(within(link).getByText(AMENDMENT_HASH)).toBeInTheDocument();
    expect(within(link).getByText(ORIGINAL_HASH)).toBeInTheDocument();

    await user.click(within(link).getByRole("link", { name: "filing #31" }));
    const back = await screen.findByRole("region", { name: "Amended" });
    expect(back).toHaveTextContent("Snapshot #15 amends this filing: filing #34, sent 20 Nov 2026, 09:30 UTC.");
    expect(back).toHaveTextContent("This pack stands as it was sent.");
    expect(within(back).getByText(ORIGINAL_HASH)).toBeInTheDocument();
    expect(within(back).getByText(AMENDMENT_HASH)).toBeInTheDocument();
  });
});

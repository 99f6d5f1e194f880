import { act, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { vi } from "vitest";
import { snapshotVerifySchema, type Snapshot } from "@shared/schemas/snapshot";
import { type Filing } from "@shared/schemas/filing";
import { endedQuarterEnds } from "@/features/snapshots/quarter-ends";
import { fakeApi, signedInAs, type Call, type Reply, refusal } from "./support/fake-api";
import { renderApp } from "./support/render-app";
import { larkspurEU, larkspurEUInitialSettings, larkspurUK } from "./support/entities";
import { approved, filingFixture, figures, HASH, PREV_HASH, snapshot, submitted } from "./support/snapshots";

// The figures are display fixtures (support/snapshots.ts): the screen must show what the server froze, unchanged.

const entities = [larkspurEU, larkspurUK];

/** The traffic-light zone classes: kept for zones, never on a notice that is not one. */
const ZONE_CLASS = /\b(bg|text|border)-zone-/;

/** The server's snapshots held in one list: the list and each detail read from it, so a change shows everywhere. */
function snapshotRoutes(store: Snapshot[], extra: Record<string, Reply | ((c: Call) => Reply)> = {}) {
  const routes: Record<string, Reply | ((c: Call) => Reply)> = {
    "GET /api/entities": { status: 200, body: entities },
    "GET /api/snapshots": (c) => {
      const entity = new URLSearchParams(c.search).get("entity");
      return {
        status: 200,
        body: store.filter((s) => s.entity === entity).sort((a, b) => b.quarterEnd.localeCompare(a.quarterEnd)),
      };
    },
  };
  for (const id of [11, 12, 13, 14, 15]) {
    routes[`GET /api/snapshots/${id}`] = () => {
      const s = store.find((x) => x.id === id);
      return s ? { status: 200, body: s } : refusal(404, "not_found", `No snapshot #${id}.`);
    };
  }
  return { ...routes, ...extra };
}

/** `role` signs in to a server holding `store` (and the `extra` routes) and opens snapshot #`id` of LKS-EU. */
function openSnapshot(
  role: Parameters<typeof signedInAs>[0],
  store: Snapshot[],
  extra: Record<string, Reply | ((c: Call) => Reply)> = {},
  id = 12,
) {
  const api = fakeApi({ "GET /api/auth/session": signedInAs(role), ...snapshotRoutes(store, extra) });
  const user = userEvent.setup();
  renderApp(`/quarters?entity=LKS-EU&snapshot=${id}`);
  return { api, user };
}

/** Puts the server's answer in the store, as the server would have, and sends it. */
function answer(store: Snapshot[], s: Snapshot, status = 200): Reply {
  const at = store.findIndex((x) => x.id === s.id);
  if (at >= 0) store[at] = s;
  else store.push(s);
  return { status, body: s };
}

afterEach(() => {
  vi.useRealTimers();
});

/** Q4 2025's determination as the server lists it: six exceptions, yellow, 3.50, approved with its snapshot. */
const q4Determination = {
  quarterEnd: "2025-12-31",
  asOf: "2025-12-31",
  effectiveFrom: "2026-01-02",
  effectiveTo: null,
  counted: 6,
  actual: 6,
  hypothetical: 4,
  zone: "yellow",
  zoneLabel: "yellow",
  plusFactor: 0.5,
  multiplier: 3.5,
  multiplierSvar: 3.5,
  windowComplete: true,
  status: "approved",
  snapshotId: 12,
  settings: larkspurEUInitialSettings,
};

describe("Quarter close › the analyst prepares and submits", () => {
  it("when an analyst opens the screen, then the entity's quarters are listed with their figures and a new one is prepared for the latest ended quarter", async () => {
    vi.useFakeTimers({ toFake: ["Date"], now: new Date("2026-05-14T09:00:00Z") });
    const store = [approved()];
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("analyst"),
      ...snapshotRoutes(store, {
        "POST /api/snapshots": () =>
          answer(
            store,
            snapshot({
              id: 13,
              quarterEnd: "2026-03-31",
              figures: figures({ asOf: "2026-03-31" }),
              preparedAt: "2026-05-14T09:00:00.000Z",
            }),
            201,
          ),
      }),
    });
    const user = userEvent.setup();
    const { router } = renderApp("/quarters");

    const table = await screen.findByRole("table", { name: "Quarter snapshots, newest first" });
    const row = within(table).getByRole("link", { name: "Open Q4 2025, approved" }).closest("tr")!;
    for (const text of [
      "Approved",
      "Yellow",
      "6",
      "0.50",
      "3.50",
      "412,500,000 EUR",
      "58,928,571 EUR",
      "analyst@larkspur.test",
      "cro2@larkspur.test",
    ]) {
      expect(within(row).getByText(text)).toBeInTheDocument();
    }
    expect(new URLSearchParams(api.callsTo("GET", "/api/snapshots")[0].search).get("entity")).toBe("LKS-EU");

    const form = screen.getByRole("form", { name: "Prepare a snapshot" });
    const quarterEnd = within(form).getByLabelText("Quarter end");
    expect(quarterEnd).toHaveValue("2026-03-31");
    const options = within(quarterEnd)
      .getAllByRole("option")
      .map((o) => o.textContent);
    expect(options).toHaveLength(8);
    expect(options[0]).toBe("Q1 2026 · 2026-03-31");
    expect(options[1]).toBe("Q4 2025 · 2025-12-31 · Approved");
    expect(options[7]).toBe("Q2 2024 · 2024-06-30");

    await user.click(within(form).getByRole("button", { name: "Prepare the snapshot" }));

    expect(api.callsTo("POST", "/api/snapshots")[0].body).toEqual({ entity: "LKS-EU", quarterEnd: "2026-03-31" });
    expect(await within(form).findByText(/Q1 2026 for LKS-EU is prepared as a draft/)).toBeInTheDocument();
    expect(router.state.location.search).toBe("?entity=LKS-EU&snapshot=13");
    const detail = await screen.findByRole("region", { name: "Q1 2026 · Larkspur Markets SA" });
    expect(within(detail).getByTestId("snapshot-status")).toHaveTextContent("Draft");
    expect(within(detail).getByRole("button", { name: "Submit for sign-off" })).toBeInTheDocument();
  });

  it("when open data-quality findings block the submit (409), then the server's message shows beside the form with a link to those findings on Data", async () => {
    const store = [snapshot({ id: 14, quarterEnd: "2026-03-31", openFindings: 2, version: 4 })];
    const { api, user } = openSnapshot(
      "analyst",
      store,
      {
        "POST /api/snapshots/14/submit": refusal(
          409,
          "open_findings",
          "2 open data-quality findings inside Q1 2026 block sign-off: resolve or explain them on the Data screen.",
        ),
      },
      14,
    );

    const notice = await screen.findByRole("note", { name: "Open data-quality findings" });
    expect(notice).toHaveTextContent("2 open data-quality findings inside Q1 2026 hold up its sign-off");
    expect(notice).toHaveAttribute("data-tone", "notice");
    expect(notice.outerHTML).not.toMatch(ZONE_CLASS);

    const form = screen.getByRole("form", { name: "Submit for sign-off" });
    await user.click(within(form).getByRole("button", { name: "Submit for sign-off" }));

    const alert = await within(form).findByRole("alert");
    expect(alert).toHaveTextContent(
      "2 open data-quality findings inside Q1 2026 block sign-off: resolve or explain them on the Data screen.",
    );
    expect(within(alert).getByRole("link", { name: "Open the findings on the Data screen" })).toHaveAttribute(
      "href",
      "/data?entity=LKS-EU",
    );
    expect(api.callsTo("POST", "/api/snapshots/14/submit")[0].body).toEqual({ version: 4 });
  });

  it("when someone else changed the snapshot first (409 stale), then the message stays on screen and the snapshot is read again as it now stands", async () => {
    const store = [snapshot({ id: 14, quarterEnd: "2026-03-31", version: 4 })];
    const { api, user } = openSnapshot(
      "analyst",
      store,
      {
        "POST /api/snapshots/14/submit": (c) => {
          store[0] = snapshot({
            ...store[0],
            status: "submitted",
            submittedBy: "analyst2@larkspur.test",
            submittedAt: "2026-04-02T08:00:00.000Z",
            version: 5,
          });
          expect(c.body).toEqual({ comment: "Ready for the CRO.", version: 4 });
          return refusal(
            409,
            "stale",
            "Snapshot #14 changed since you opened it (now version 5). Look at it again before acting.",
          );
        },
      },
      14,
    );

    await user.type(await screen.findByLabelText("Comment for the sign-off (optional)"), "Ready for the CRO.");
    await user.click(screen.getByRole("button", { name: "Submit for sign-off" }));

    expect(
      await screen.findByText(
        /Snapshot #14 changed since you opened it \(now version 5\)\. Look at it again before acting\. The snapshot below is as it now stands\./,
      ),
    ).toBeInTheDocument();
    expect(await screen.findByTestId("snapshot-status")).toHaveTextContent("Submitted for sign-off");
    expect(screen.queryByRole("button", { name: "Submit for sign-off" })).not.toBeInTheDocument();
    expect(screen.getByText(/Submitted by analyst2@larkspur.test/)).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/snapshots/14/submit")).toHaveLength(1);
  });

  it("when a snapshot was returned, then the analyst reads why and prepares it again for the same quarter", async () => {
    const returned = submitted({
      status: "returned",
      history: [
        ...submitted().history,
        {
          at: "2026-01-10T11:00:00.000Z",
          by: "cro@larkspur.test",
          action: "returned",
          comment: "The 14 November exception needs the desk's explanation.",
        },
      ],
      version: 6,
    });
    const store = [returned];
    const { api, user } = openSnapshot("analyst", store, {
      "POST /api/snapshots": () => answer(store, snapshot({ status: "draft", version: 7 })),
    });

    expect(await screen.findByText(/“The 14 November exception needs the desk's explanation\.”/)).toBeInTheDocument();
    await user.click(screen.getByRole("button", { name: "Prepare again" }));

    expect(api.callsTo("POST", "/api/snapshots")[0].body).toEqual({ entity: "LKS-EU", quarterEnd: "2025-12-31" });
    expect(await screen.findByText(/Q4 2025 is computed again on today's data and is a draft/)).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Draft");
  });
});

describe("Quarter close › the return data", () => {
  it("when an analyst opens a draft, then the return's C 24.00 rows show with their sources, and the values the product does not hold are entered and sent with the version read", async () => {
    const store = [snapshot({ id: 14, version: 4 })];
    const { api, user } = openSnapshot(
      "analyst",
      store,
      {
        "PUT /api/snapshots/14/return-inputs": (c) =>
          answer(
            store,
            snapshot({
              id: 14,
              version: 5,
              figures: figures({ analystInputs: (c.body as { values: Record<string, number | null> }).values }),
            }),
          ),
      },
      14,
    );

    const table = await screen.findByRole("table", { name: /Return data of LKS-EU/ });
    // C 24.00 c150 and c140: the frozen multiplier and count (CRR Art. 366), as the server froze them.
    const c150 = within(table).getByText("C 24.00 r010 c150").closest("tr")!;
    expect(c150).toHaveTextContent("VaR multiplication factor (m_c)");
    expect(c150).toHaveTextContent("3.50");
    expect(within(table).getByText("C 24.00 r010 c140").closest("tr")!).toHaveTextContent("6");
    expect(screen.getByTestId("return-ircLatest")).toHaveTextContent("not entered");
    expect(screen.getByText(/5 values the product does not hold are not entered yet/)).toBeInTheDocument();

    await user.type(screen.getByLabelText(/Incremental default and migration risk: last measure/), "-3");
    await user.click(screen.getByRole("button", { name: "Save return values" }));
    expect(await screen.findByText("Enter an amount of 0 or more, or leave it empty")).toBeInTheDocument();
    expect(api.callsTo("PUT", "/api/snapshots/14/return-inputs")).toHaveLength(0);

    await user.clear(screen.getByLabelText(/Incremental default and migration risk: last measure/));
    await user.type(screen.getByLabelText(/Incremental default and migration risk: last measure/), "1200000");
    await user.type(screen.getByLabelText(/CTP: floor/), "0");
    await user.click(screen.getByRole("button", { name: "Save return values" }));
    await waitFor(() => expect(api.callsTo("PUT", "/api/snapshots/14/return-inputs")).toHaveLength(1));
    expect(api.callsTo("PUT", "/api/snapshots/14/return-inputs")[0].body).toEqual({
      values: { ircAverage: null, ircLatest: 1200000, ctpFloor: 0, ctpAverage: null, ctpLatest: null },
      version: 4,
    });
    expect(await screen.findByText("Return values saved.")).toBeInTheDocument();
    await waitFor(() => expect(screen.getByTestId("return-ircLatest")).toHaveTextContent("1,200,000"));
    expect(screen.getByText(/3 values the product does not hold are not entered yet/)).toBeInTheDocument();
  });

  it("when the chief risk officer reads a submitted snapshot, then the return data shows and nothing can be entered", async () => {
    openSnapshot("cro", [submitted()]);
    expect(await screen.findByRole("table", { name: /Return data of LKS-EU/ })).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Save return values" })).not.toBeInTheDocument();
  });
});

describe("Quarter close › the chief risk officer signs off", () => {
  it("when the chief risk officer prepared the snapshot, then Approve is not offered and the screen says why", async () => {
    openSnapshot("cro", [submitted({ preparedBy: "cro@larkspur.test" })]);

    const form = await screen.findByRole("form", { name: "Sign-off" });
    const fourEyes = within(form).getByRole("note");
    expect(fourEyes).toHaveTextContent(
      "Four eyes. You prepared this snapshot, so you cannot approve it: another chief risk officer signs it off.",
    );
    expect(fourEyes).toHaveAttribute("data-tone", "notice");
    expect(fourEyes.outerHTML).not.toMatch(ZONE_CLASS);
    // The zone itself keeps its zone colour.
    const zone = document.querySelector("[data-zone]")!;
    expect(zone.className).toMatch(ZONE_CLASS);
    expect(screen.queryByRole("button", { name: /Approve/ })).not.toBeInTheDocument();
    expect(within(form).getByRole("button", { name: "Return to the analysts" })).toBeInTheDocument();
  });

  it("when the chief risk officer approves another's submitted snapshot, then the comment and version read are sent and the seal's hash shows", async () => {
    const store = [submitted()];
    const { api, user } = openSnapshot("cro", store, {
      "POST /api/snapshots/12/approve": (c) => {
        const body = c.body as { comment?: string };
        return answer(
          store,
          approved({
            approvedBy: "cro@larkspur.test",
            history: [
              ...submitted().history,
              {
                at: "2026-01-12T09:05:00.000Z",
                by: "cro@larkspur.test",
                action: "approved",
                comment: body.comment ?? null,
              },
            ],
          }),
        );
      },
    });

    const form = await screen.findByRole("form", { name: "Sign-off" });
    expect(within(form).queryByRole("note")).not.toBeInTheDocument();
    await user.type(within(form).getByLabelText("Comment"), "Multiplier 3.50 agreed with model validation.");
    await user.click(within(form).getByRole("button", { name: "Approve and seal" }));
    // Nothing is sent until the confirmation, which says what sealing does, is accepted.
    const confirm = within(form).getByRole("group", { name: "Approve and seal Q4 2025" });
    expect(confirm).toHaveTextContent(/signed into the entity's chain and never change again\. This cannot be undone/);
    expect(api.callsTo("POST", "/api/snapshots/12/approve")).toHaveLength(0);
    await user.click(within(confirm).getByRole("button", { name: "Cancel" }));
    expect(within(form).queryByRole("group", { name: "Approve and seal Q4 2025" })).not.toBeInTheDocument();
    expect(within(form).getByRole("button", { name: "Approve and seal" })).toHaveFocus();
    expect(api.callsTo("POST", "/api/snapshots/12/approve")).toHaveLength(0);
    await user.click(within(form).getByRole("button", { name: "Approve and seal" }));
    await user.click(within(form).getByRole("button", { name: "Approve and seal Q4 2025" }));

    expect(api.callsTo("POST", "/api/snapshots/12/approve")[0].body).toEqual({
      comment: "Multiplier 3.50 agreed with model validation.",
      version: 5,
    });
    expect(
      await screen.findByText("Q4 2025 is approved and sealed with hash ab12cd34ef56…. Its figures no longer change."),
    ).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Approved");
    const hash = within(screen.getByTestId("snapshot-hash")).getByText("ab12cd34ef56…");
    expect(hash).toHaveAttribute("title", HASH);
    expect(screen.getByRole("table", { name: "History of the snapshot" })).toHaveTextContent(
      "Multiplier 3.50 agreed with model validation.",
    );
    expect(screen.queryByRole("form", { name: "Sign-off" })).not.toBeInTheDocument();
  });

  it("when the chief risk officer returns a snapshot without a comment, then the field says why one is needed and nothing is sent", async () => {
    const store = [submitted()];
    const { api, user } = openSnapshot("cro", store, {
      "POST /api/snapshots/12/return": () => answer(store, submitted({ status: "returned", version: 6 })),
    });

    const form = await screen.findByRole("form", { name: "Sign-off" });
    await user.click(within(form).getByRole("button", { name: "Return to the analysts" }));

    const comment = within(form).getByLabelText("Comment");
    expect(comment).toHaveAttribute("aria-invalid", "true");
    expect(comment).toHaveAccessibleDescription("Say why the snapshot goes back");
    expect(api.callsTo("POST", "/api/snapshots/12/return")).toHaveLength(0);

    await user.type(comment, "Explain the 14 November exception first.");
    await user.click(within(form).getByRole("button", { name: "Return to the analysts" }));
    expect(api.callsTo("POST", "/api/snapshots/12/return")[0].body).toEqual({
      comment: "Explain the 14 November exception first.",
      version: 5,
    });
    expect(await screen.findByText("Q4 2025 is returned to the analysts with your comment.")).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Returned");
  });

  it("when the daily data changed since submission (409 inputs_changed), then the server's message says so and suggests returning it", async () => {
    const { user } = openSnapshot("cro", [submitted()], {
      "POST /api/snapshots/12/approve": refusal(
        409,
        "inputs_changed",
        "The daily data inside Q4 2025 changed after it was submitted.",
      ),
    });

    const form = await screen.findByRole("form", { name: "Sign-off" });
    await user.click(within(form).getByRole("button", { name: "Approve and seal" }));
    await user.click(within(form).getByRole("button", { name: "Approve and seal Q4 2025" }));
    expect(await within(form).findByRole("alert")).toHaveTextContent(
      "The daily data inside Q4 2025 changed after it was submitted. Return it, so that the analyst prepares it again on the current data.",
    );
  });
});

describe("Quarter close › reading signed-off quarters", () => {
  it("when the chief risk officer opens the screen, then the multiplier in force today and the indicative one are named, zones included", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("cro"),
      ...snapshotRoutes([approved()]),
      "GET /api/entities/LKS-EU/determinations": { status: 200, body: [q4Determination] },
      "GET /api/entities/LKS-EU/capital": {
        status: 200,
        body: {
          entity: "LKS-EU",
          currency: "EUR",
          date: "2026-02-10",
          inForce: { ...q4Determination },
          // Two more exceptions since the quarter end: eight, still yellow, 3.75 if determined today.
          indicative: {
            asOf: "2026-02-10",
            counted: 8,
            zone: "yellow",
            zoneLabel: "yellow",
            plusFactor: 0.75,
            multiplier: 3.75,
            multiplierSvar: 3.75,
            windowComplete: true,
          },
          requirement: 412_500_000,
          addOn: 58_928_571,
          indicativeRequirement: 441_964_286,
          capitalNote: null,
          nextDetermination: { quarterEnd: "2026-03-31", asOf: "2026-03-31", effectiveFrom: "2026-04-01" },
          settings: q4Determination.settings,
        },
      },
    });
    renderApp("/quarters");
    const inForce = await screen.findByRole("region", { name: "Multiplier in force" });
    expect(within(inForce).getByTestId("quarters-multiplier-in-force")).toHaveTextContent("3.50");
    expect(within(inForce).getByText(/in force since 2026-01-02 \(Q4 2025, approved\)/)).toBeInTheDocument();
    expect(within(inForce).getByText("Indicative if determined today")).toBeInTheDocument();
    expect(within(inForce).getByTestId("quarters-multiplier-indicative")).toHaveTextContent("3.75");
    expect(within(inForce).getAllByText("Yellow")).toHaveLength(2);
  });

  it("when treasury opens an approved quarter, then the frozen figures show and no action but the hash check is offered", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("treasury"),
      ...snapshotRoutes([approved()]),
      "GET /api/entities/LKS-EU/determinations": { status: 200, body: [q4Determination] },
    });
    renderApp("/quarters");

    const detail = await screen.findByRole("region", { name: "Q4 2025 · Larkspur Markets SA" });
    expect(within(detail).getByTestId("snapshot-window")).toHaveTextContent("2025-01-02 to 2025-12-31");
    expect(within(detail).getByText(/250 observations/)).toBeInTheDocument();
    expect(within(detail).getByTestId("snapshot-counted")).toHaveTextContent("6");
    expect(within(detail).getByTestId("snapshot-plus-factor")).toHaveTextContent("0.50");
    expect(within(detail).getByTestId("snapshot-multiplier")).toHaveTextContent("3.50");
    expect(within(detail).getByTestId("snapshot-capital")).toHaveTextContent("412,500,000 EUR");
    expect(within(detail).getByTestId("snapshot-add-on")).toHaveTextContent("58,928,571 EUR");
    expect(within(detail).getByText("98.63%")).toBeInTheDocument();
    expect(within(detail).getByText(/Approved by cro2@larkspur.test/)).toBeInTheDocument();
    // Which multiplier it is: the quarter's determination, in force from the next business day.
    expect(await within(detail).findByTestId("snapshot-in-force")).toHaveTextContent(
      "This quarter's multiplier of 3.50 is in force from 2026-01-02 until the next determination (Q4 2025, approved).",
    );
    const inForce = screen.getByRole("region", { name: "Multiplier in force" });
    expect(within(inForce).getByTestId("quarters-multiplier-in-force")).toHaveTextContent("3.50");
    expect(within(inForce).getByText(/in force since 2026-01-02 \(Q4 2025, approved\)/)).toBeInTheDocument();
    // Treasury reads signed-off figures only: nothing indicative.
    expect(within(inForce).queryByText(/Indicative/)).not.toBeInTheDocument();

    expect(screen.queryByRole("form", { name: "Prepare a snapshot" })).not.toBeInTheDocument();
    for (const name of [
      "Submit for sign-off",
      "Approve and seal",
      "Return to the analysts",
      "Prepare again",
      "Prepare the snapshot",
    ]) {
      expect(screen.queryByRole("button", { name })).not.toBeInTheDocument();
    }
    expect(within(detail).getByRole("button", { name: "Verify the hash" })).toBeInTheDocument();
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).getByRole("link", { name: "Quarter close" }),
    ).toHaveAttribute("href", "/quarters");
  });

  it("when a day inside a signed-off window was restated, then a warning says the figures stay as approved, with the detail", async () => {
    openSnapshot("cro", [
      approved({
        restatedAfterSignOff: {
          at: "2026-02-03T14:20:00.000Z",
          detail: "LKS-EU-TOTAL 2025-11-14 was restated by upload #88.",
        },
      }),
    ]);

    const warning = await screen.findByRole("note", { name: "Restated after sign-off" });
    expect(warning).toHaveTextContent(
      "A day inside this quarter's window was restated after sign-off: figures stay as approved.",
    );
    expect(warning).toHaveTextContent("LKS-EU-TOTAL 2025-11-14 was restated by upload #88.");
    expect(warning).toHaveTextContent("03 Feb 2026, 14:20 UTC");
  });

  it("when the reader verifies the hash, then the server's check shows valid or invalid with its detail, asked afresh each time", async () => {
    const checks = [
      snapshotVerifySchema.parse({
        valid: true,
        hash: HASH,
        prevHash: PREV_HASH,
        detail: "The hash matches the stored figures and inputs, and links to the snapshot approved before it.",
      }),
      snapshotVerifySchema.parse({
        valid: false,
        hash: HASH,
        prevHash: PREV_HASH,
        detail: "The link to the previously approved snapshot does not match: the chain was altered.",
      }),
    ];
    const { api, user } = openSnapshot("treasury", [approved()], {
      "GET /api/snapshots/12/verify": () => ({ status: 200, body: checks.shift() }),
    });

    await user.click(await screen.findByRole("button", { name: "Verify the hash" }));
    const result = await screen.findByRole("status", { name: "Hash check" });
    expect(result).toHaveTextContent("Valid: the figures are as signed off.");
    expect(result).toHaveTextContent("links to the snapshot approved before it.");

    await user.click(screen.getByRole("button", { name: "Verify again" }));
    expect(await screen.findByText("Invalid: the stored snapshot does not match its hash.")).toBeInTheDocument();
    expect(screen.getByRole("status", { name: "Hash check" })).toHaveTextContent("the chain was altered.");
    expect(api.callsTo("GET", "/api/snapshots/12/verify")).toHaveLength(2);
  });

  it("when a second hash check fails, then its error shows and the earlier Valid is no longer on screen", async () => {
    const checks: Reply[] = [
      {
        status: 200,
        body: snapshotVerifySchema.parse({
          valid: true,
          hash: HASH,
          prevHash: PREV_HASH,
          detail: "The hash matches the stored figures and inputs.",
        }),
      },
      refusal(503, "database_unavailable", "The database did not answer; try again in a moment."),
      refusal(503, "database_unavailable", "The database did not answer; try again in a moment."),
    ];
    const { user } = openSnapshot("treasury", [approved()], { "GET /api/snapshots/12/verify": () => checks.shift()! });

    await user.click(await screen.findByRole("button", { name: "Verify the hash" }));
    expect(await screen.findByRole("status", { name: "Hash check" })).toHaveTextContent(
      "Valid: the figures are as signed off.",
    );

    await user.click(screen.getByRole("button", { name: "Verify again" }));
    expect(screen.queryByRole("status", { name: "Hash check" })).not.toBeInTheDocument();
    // A 5xx is tried once more before it counts as failed.
    expect(
      await screen.findByText("The database did not answer; try again in a moment.", undefined, { timeout: 4000 }),
    ).toBeInTheDocument();
    expect(screen.queryByRole("status", { name: "Hash check" })).not.toBeInTheDocument();
    expect(screen.queryByText(/Valid: the figures are as signed off/)).not.toBeInTheDocument();
  });

  it("when a quarter's window is short of 250 observations, then its zone in the snapshot list is marked provisional, and a full window's is not", async () => {
    const short = figures({ window: { start: "2025-04-01", end: "2025-12-31", observations: 190, complete: false } });
    fakeApi({
      "GET /api/auth/session": signedInAs("cro"),
      ...snapshotRoutes([approved(), approved({ id: 11, quarterEnd: "2025-09-30", figures: short })]),
    });
    renderApp("/quarters?entity=LKS-EU");

    const table = await screen.findByRole("table", { name: "Quarter snapshots, newest first" });
    const q3 = within(table).getByRole("link", { name: "Open Q3 2025, approved" }).closest("tr")!;
    expect(within(q3).getByText("Yellow").closest("[data-zone]")).toHaveTextContent("Yellow(provisional)");
    const q4 = within(table).getByRole("link", { name: "Open Q4 2025, approved" }).closest("tr")!;
    expect(within(q4).getByText("Yellow").closest("[data-zone]")).toHaveTextContent(/^Yellow$/);
  });

  it("when the address names one entity and another entity's snapshot, then the screen follows the snapshot's entity, in the address too", async () => {
    const uk = approved({
      id: 15,
      entity: "LKS-UK",
      entityName: "Larkspur Bank plc",
      figures: figures({ portfolio: "LKS-UK-TOTAL", regime: "frtb", currency: "GBP", zoneLabel: "Amber" }),
    });
    const api = fakeApi({ "GET /api/auth/session": signedInAs("cro"), ...snapshotRoutes([approved(), uk]) });
    const { router } = renderApp("/quarters?entity=LKS-EU&snapshot=15");

    expect(await screen.findByRole("region", { name: "Q4 2025 · Larkspur Bank plc" })).toBeInTheDocument();
    expect(router.state.location.search).toBe("?entity=LKS-UK&snapshot=15");
    expect(screen.getByLabelText("Entity")).toHaveValue("LKS-UK");
    expect(screen.getByRole("heading", { name: "Snapshots of LKS-UK" })).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-capital")).toHaveTextContent("GBP");
    expect(api.callsTo("GET", "/api/snapshots").map((c) => new URLSearchParams(c.search).get("entity"))).not.toContain(
      "LKS-EU",
    );
  });

  it("when an FRTB snapshot holds desks, then each desk's exceptions, backtesting result and P&L attribution zone show", async () => {
    const frtb = figures({
      portfolio: "LKS-UK-TOTAL",
      regime: "frtb",
      currency: "GBP",
      zone: "yellow",
      zoneLabel: "Amber",
      capitalNote: "Capital from the top-of-house VaR and sVaR of the last 60 days.",
      desks: [
        { portfolio: "LKS-UK-RATES", exceptions99: 3, exceptions975: 9, passes: true, plaZone: "green" },
        { portfolio: "LKS-UK-FX", exceptions99: 13, exceptions975: 31, passes: false, plaZone: "amber" },
        { portfolio: "LKS-UK-CREDIT", exceptions99: 2, exceptions975: 6, passes: true, plaZone: null },
      ],
    });
    fakeApi({
      "GET /api/auth/session": signedInAs("cro"),
      ...snapshotRoutes([approved({ entity: "LKS-UK", entityName: "Larkspur Bank plc", figures: frtb })]),
    });
    renderApp("/quarters?entity=LKS-UK");

    const desks = await screen.findByRole("table", { name: "Trading desks at the quarter end" });
    const fx = within(desks).getByText("LKS-UK-FX").closest("tr")!;
    expect(fx).toHaveTextContent("13");
    expect(fx).toHaveTextContent("31");
    expect(within(fx).getByText("Fails")).toBeInTheDocument();
    expect(within(fx).getByText("Amber")).toBeInTheDocument();
    expect(within(within(desks).getByText("LKS-UK-CREDIT").closest("tr")!).getByText("Not tested")).toBeInTheDocument();
    expect(screen.getByText("Capital from the top-of-house VaR and sVaR of the last 60 days.")).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-capital")).toHaveTextContent("412,500,000 GBP");
  });

  it("when a regulator opens the address, then the screen is refused and not linked", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("regulator"), "GET /api/entities": { status: 200, body: [] } });
    renderApp("/quarters");
    expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).queryByRole("link", { name: "Quarter close" }),
    ).not.toBeInTheDocument();
  });
});

const PACK_SHA256 = "5e884898da28047151d0e56f8dc6292773603d0d6aabbdd62a11ef721d1542d8";

const filed = (over: Partial<Snapshot> = {}) =>
  approved({
    status: "filed",
    history: [
      ...approved().history,
      { at: "2026-01-14T10:00:00.000Z", by: "cro@larkspur.test", action: "filed", comment: null },
    ],
    version: 7,
    ...over,
  });

/** The filing the server answers with for Q4 2025's pack. */
const filingOf = (over: Partial<Filing> = {}): Filing =>
  filingFixture({
    quarterEnd: "2025-12-31",
    fileName: "LKS-EU-2025-12-31-pack.pdf",
    sha256: PACK_SHA256,
    sentAt: "2026-01-14T10:00:00.000Z",
    ...over,
  });

/** The CRO opens the approved Q4 2025, the server refusing its filing with `refusal`, and asks to file it. */
async function fileRefusedBy(refusal: Reply) {
  const opened = openSnapshot("cro", [approved()], { "POST /api/snapshots/12/filings": refusal });
  const pack = await screen.findByRole("region", { name: "Pack and filing" });
  await opened.user.click(within(pack).getByRole("button", { name: "File with the supervisor" }));
  return { ...opened, pack };
}

const NO_CONTACTS = refusal(422, "no_supervisor_contacts", "LKS-EU has no supervisor e-mail address.");

describe("Quarter close › the pack and its filing", () => {
  it("when the chief risk officer files an approved quarter, then the pack is sent and the recipients, SHA-256 and a link to the filing show", async () => {
    const store = [approved()];
    const filings: Filing[] = [];
    const { api, user } = openSnapshot("cro", store, {
      "GET /api/entities": {
        status: 200,
        body: entities.map((e) =>
          e.code === "LKS-EU"
            ? { ...e, supervisorName: "Banking Supervisor", supervisorEmails: ["market-risk@supervisor.test"] }
            : e,
        ),
      },
      "GET /api/filings": () => ({ status: 200, body: filings }),
      "POST /api/snapshots/12/filings": () => {
        answer(store, filed());
        filings.unshift(filingOf());
        return { status: 201, body: filings[0] };
      },
    });

    const pack = await screen.findByRole("region", { name: "Pack and filing" });
    expect(within(pack).getByRole("button", { name: "Download the pack (PDF)" })).toBeInTheDocument();
    await user.click(within(pack).getByRole("button", { name: "File with the supervisor" }));
    expect(within(pack).getByTestId("filing-confirmation")).toHaveTextContent(
      // The recipients are named before anything is sent.
      "The pack goes by e-mail to Banking Supervisor: market-risk@supervisor.test and is kept as sent; Q4 2025 becomes filed. A filing cannot be taken back.",
    );
    expect(api.callsTo("POST", "/api/snapshots/12/filings")).toHaveLength(0);
    await user.click(within(pack).getByRole("button", { name: "Send the pack" }));

    expect(api.callsTo("POST", "/api/snapshots/12/filings").map((c) => c.body)).toEqual([{}]);
    expect(
      await within(pack).findByText(
        "Q4 2025 is filed with the supervisor: the pack went by e-mail to backtesting@supervisor.test, desk-officer@supervisor.test.",
      ),
    ).toBeInTheDocument();
    expect(within(pack).getByTestId("filing-recipients")).toHaveTextContent(
      "backtesting@supervisor.test, desk-officer@supervisor.test",
    );
    expect(within(pack).getByTestId("filing-sha256")).toHaveTextContent(PACK_SHA256);
    expect(within(pack).getByRole("link", { name: "Open the filing on the Filings screen" })).toHaveAttribute(
      "href",
      "/filings?filing=31",
    );
    expect(await screen.findByTestId("snapshot-status")).toHaveTextContent("Filed");
    expect(within(pack).queryByRole("button", { name: "File with the supervisor" })).not.toBeInTheDocument();
  });

  it("when the mail server refuses the message for good (502 mail_not_sent), then its message shows and the quarter stays approved, ready to file again", async () => {
    const { api, user, pack } = await fileRefusedBy(
      refusal(
        502,
        "mail_not_sent",
        "The mail server refused the message (550 5.1.1 <desk-officer@supervisor.test>: recipient unknown). Nothing was sent; check the supervisor contacts under Admin › Entities and file again.",
      ),
    );
    const readsBefore = api.calls.filter((c) => c.method === "GET").length;
    await user.click(within(pack).getByRole("button", { name: "Send the pack" }));

    expect(await within(pack).findByRole("alert")).toHaveTextContent(
      "The mail server refused the message (550 5.1.1 <desk-officer@supervisor.test>: recipient unknown). Nothing was sent; check the supervisor contacts under Admin › Entities and file again.",
    );
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Approved");
    expect(within(pack).queryByTestId("snapshot-filing")).not.toBeInTheDocument();
    expect(within(pack).getByRole("button", { name: "File with the supervisor" })).toBeEnabled();
    expect(api.calls.filter((c) => c.method === "GET")).toHaveLength(readsBefore);
  });

  it("when the mail server does not answer (202 pending), then the screen says the pack is kept and goes by itself, and it turns filed once the server has taken it", async () => {
    // Only the interval is faked: the screen looks again every 15 s while the pack waits.
    vi.useFakeTimers({ toFake: ["setInterval", "clearInterval"] });
    const store = [approved()];
    const filings: Filing[] = [];
    const waiting = filingOf({
      delivery: "pending",
      messageId: null,
      sentAt: null,
      lastError: "connect ECONNREFUSED 127.0.0.1:2525",
    });
    const { api, user } = openSnapshot("cro", store, {
      "GET /api/filings": () => ({ status: 200, body: filings }),
      "POST /api/snapshots/12/filings": () => {
        filings.unshift(waiting);
        return { status: 202, body: waiting };
      },
    });

    const pack = await screen.findByRole("region", { name: "Pack and filing" });
    await user.click(within(pack).getByRole("button", { name: "File with the supervisor" }));
    await user.click(within(pack).getByRole("button", { name: "Send the pack" }));

    const said = await within(pack).findByText(
      "Q4 2025's pack is kept; the mail server did not take it yet — it is sent automatically as soon as the server answers, and the quarter becomes filed then.",
    );
    expect(said).toHaveAttribute("role", "status");
    expect(within(pack).queryByText(/the pack went by e-mail/)).not.toBeInTheDocument();
    const pending = await within(pack).findByTestId("filing-pending");
    expect(pending).toHaveTextContent("(connect ECONNREFUSED 127.0.0.1:2525)");
    expect(pending).toHaveAttribute("data-tone", "notice");
    expect(pending.outerHTML).not.toMatch(ZONE_CLASS);
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Approved");
    expect(within(pack).queryByRole("button", { name: "File with the supervisor" })).not.toBeInTheDocument();

    // The mail server is back: the delivery loop sends the pack and the quarter becomes filed.
    filings[0] = filingOf();
    answer(store, filed());
    const readsWhilePending = api.callsTo("GET", "/api/filings").length;
    act(() => vi.advanceTimersByTime(14_000));
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(readsWhilePending);
    act(() => vi.advanceTimersByTime(1_000));
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(readsWhilePending + 1);

    await waitFor(() => expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Filed"));
    expect(within(pack).queryByTestId("filing-pending")).not.toBeInTheDocument();
    expect(within(pack).getByTestId("snapshot-filing")).toHaveTextContent(
      "14 Jan 2026, 10:00 UTC by cro@larkspur.test",
    );
    expect(
      within(pack).getByText(
        "Q4 2025 is filed with the supervisor: the pack went by e-mail to backtesting@supervisor.test, desk-officer@supervisor.test.",
      ),
    ).toBeInTheDocument();

    // Sent: nothing is waiting any more, so the screen stops looking.
    act(() => vi.advanceTimersByTime(30_000));
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(readsWhilePending + 1);
  });

  it("when the quarter was filed meanwhile (409 with the filing's id), then the message links to that filing and the File button gives way to the filing", async () => {
    const filings: Filing[] = [];
    const { api, user } = openSnapshot("cro", [approved()], {
      "GET /api/filings": () => ({ status: 200, body: filings }),
      "POST /api/snapshots/12/filings": () => {
        // Another chief risk officer filed it a moment ago; the pack still waits for the mail server.
        filings.unshift(
          filingOf({ id: 33, sentBy: "cro2@larkspur.test", delivery: "pending", messageId: null, sentAt: null }),
        );
        return refusal(409, "conflict", "Snapshot #12 is already filed (filing #33, waiting for the mail server).", {
          filingId: 33,
        });
      },
    });

    const pack = await screen.findByRole("region", { name: "Pack and filing" });
    await waitFor(() => expect(api.callsTo("GET", "/api/filings")).toHaveLength(1));
    await user.click(within(pack).getByRole("button", { name: "File with the supervisor" }));
    await user.click(within(pack).getByRole("button", { name: "Send the pack" }));

    const alert = await within(pack).findByRole("alert");
    expect(alert).toHaveTextContent("Snapshot #12 is already filed (filing #33, waiting for the mail server).");
    expect(within(alert).getByRole("link", { name: "Open filing #33 on the Filings screen" })).toHaveAttribute(
      "href",
      "/filings?filing=33",
    );
    expect(await within(pack).findByTestId("filing-pending")).toHaveTextContent("Filed by cro2@larkspur.test and kept");
    expect(within(pack).queryByRole("button", { name: "File with the supervisor" })).not.toBeInTheDocument();
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(2);
    expect(api.callsTo("POST", "/api/snapshots/12/filings")).toHaveLength(1);
  });

  it("when the confirmation opens, then focus is on Send the pack; Cancel gives it back to File with the supervisor; an error takes it to its message", async () => {
    const { user, pack } = await fileRefusedBy(NO_CONTACTS);
    expect(within(pack).getByRole("button", { name: "Send the pack" })).toHaveFocus();

    await user.click(within(pack).getByRole("button", { name: "Cancel" }));
    expect(within(pack).queryByTestId("filing-confirmation")).not.toBeInTheDocument();
    expect(within(pack).getByRole("button", { name: "File with the supervisor" })).toHaveFocus();

    await user.keyboard("{Enter}");
    expect(within(pack).getByRole("button", { name: "Send the pack" })).toHaveFocus();
    await user.keyboard("{Enter}");
    const alert = await within(pack).findByRole("alert");
    expect(alert).toHaveTextContent("LKS-EU has no supervisor contacts");
    expect(alert).toHaveFocus();
  });

  it("when the reader copies the filed pack's SHA-256, then all 64 characters go to the clipboard and the button says Copied", async () => {
    const { user } = openSnapshot("cro", [filed()], { "GET /api/filings": { status: 200, body: [filingOf()] } });

    const sha = await screen.findByTestId("filing-sha256");
    expect(within(sha).getByText(PACK_SHA256).tagName).toBe("CODE");
    await user.click(within(sha).getByRole("button", { name: "Copy" }));

    expect(await navigator.clipboard.readText()).toBe(PACK_SHA256);
    expect(within(sha).getByRole("button", { name: "Copied" })).toBeInTheDocument();
  });

  it("when the entity has no supervisor contacts (422), then the screen says an administrator adds them", async () => {
    const { user, pack } = await fileRefusedBy(NO_CONTACTS);
    await user.click(within(pack).getByRole("button", { name: "Send the pack" }));
    expect(await within(pack).findByRole("alert")).toHaveTextContent(
      "LKS-EU has no supervisor contacts, so there is nobody to send the pack to. An administrator adds them under Admin › Entities; then file it again.",
    );
    expect(within(pack).queryByRole("link", { name: /Admin/ })).not.toBeInTheDocument();
  });

  it("when an analyst opens an approved quarter, then the pack can be downloaded but filing is not offered", async () => {
    openSnapshot("analyst", [approved()]);

    const pack = await screen.findByRole("region", { name: "Pack and filing" });
    expect(within(pack).getByRole("button", { name: "Download the pack (PDF)" })).toBeInTheDocument();
    expect(within(pack).getByText(/A chief risk officer files Q4 2025 with the supervisor/)).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "File with the supervisor" })).not.toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Acknowledge receipt" })).not.toBeInTheDocument();
  });

  it("when a draft is opened, then its pack is offered with the warning that it is not signed off", async () => {
    openSnapshot("analyst", [snapshot()]);

    const pack = await screen.findByRole("region", { name: "Pack and filing" });
    expect(within(pack).getByRole("button", { name: "Download the pack (PDF)" })).toBeInTheDocument();
    expect(within(pack).getByText("Not signed off: every page of Q4 2025's pack says so.")).toBeInTheDocument();
  });

  it("when the server refuses the pack, then its message shows beside the download instead of a failed browser download", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("analyst"),
      ...snapshotRoutes([snapshot()], {
        "GET /api/snapshots/12/pack.pdf": refusal(403, "forbidden", "Your role may not download this entity's pack."),
      }),
    });
    const created = vi.fn(() => "blob:quartermark.test/1");
    const realCreate = URL.createObjectURL;
    URL.createObjectURL = created;
    try {
      const user = userEvent.setup();
      renderApp("/quarters?entity=LKS-EU&snapshot=12");

      const pack = await screen.findByRole("region", { name: "Pack and filing" });
      await user.click(within(pack).getByRole("button", { name: "Download the pack (PDF)" }));

      expect(await within(pack).findByRole("alert")).toHaveTextContent(
        "Your role may not download this entity's pack.",
      );
      expect(api.callsTo("GET", "/api/snapshots/12/pack.pdf")).toHaveLength(1);
      expect(created).not.toHaveBeenCalled();
    } finally {
      URL.createObjectURL = realCreate;
    }
  });

  it("when a filed quarter is opened, then its filing is found in the filings list and shows who sent it and who acknowledged it", async () => {
    const { api } = openSnapshot("analyst", [filed()], {
      "GET /api/filings": {
        status: 200,
        body: [
          filingOf({ id: 35, snapshotId: 14, quarterEnd: "2026-03-31", sha256: "f".repeat(64) }),
          filingOf({ acknowledgedBy: "regulator@larkspur.test", acknowledgedAt: "2026-01-15T08:30:00.000Z" }),
        ],
      },
    });

    const record = await screen.findByTestId("snapshot-filing");
    expect(record).toHaveTextContent("14 Jan 2026, 10:00 UTC by cro@larkspur.test");
    expect(within(record).getByText(PACK_SHA256)).toBeInTheDocument();
    expect(within(record).getByTestId("filing-acknowledged")).toHaveTextContent(
      "15 Jan 2026, 08:30 UTC by regulator@larkspur.test",
    );
    expect(within(record).getByRole("link", { name: "Open the filing on the Filings screen" })).toHaveAttribute(
      "href",
      "/filings?filing=31",
    );
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(1);
  });

  it("when an approved quarter's filing waits for the mail server, then it says so and does not offer to file again", async () => {
    openSnapshot("cro", [approved()], {
      "GET /api/filings": {
        status: 200,
        body: [
          filingOf({
            delivery: "pending",
            messageId: null,
            sentAt: null,
            lastError: "connect ECONNREFUSED 127.0.0.1:2525",
          }),
        ],
      },
    });

    const pending = await screen.findByTestId("filing-pending");
    expect(pending).toHaveTextContent("the mail server did not take the message (connect ECONNREFUSED 127.0.0.1:2525)");
    expect(pending).toHaveTextContent("It is sent automatically as soon as the server answers");
    expect(screen.queryByRole("button", { name: "File with the supervisor" })).not.toBeInTheDocument();
  });

  it("when treasury opens a filed quarter, then neither the pack nor the filing is offered and no filing is asked for", async () => {
    const { api } = openSnapshot("treasury", [filed()]);

    expect(await screen.findByTestId("snapshot-status")).toHaveTextContent("Filed");
    expect(screen.queryByRole("region", { name: "Pack and filing" })).not.toBeInTheDocument();
    expect(api.callsTo("GET", "/api/filings")).toHaveLength(0);
  });
});

describe("Quarter close › which quarter ends may be prepared", () => {
  it("when today is the last day of a quarter, then that quarter is not yet offered; the day after it is, first", () => {
    expect(endedQuarterEnds(new Date("2026-03-31T23:59:00Z"))[0]).toBe("2025-12-31");
    expect(endedQuarterEnds(new Date("2026-04-01T00:01:00Z"))).toEqual([
      "2026-03-31",
      "2025-12-31",
      "2025-09-30",
      "2025-06-30",
      "2025-03-31",
      "2024-12-31",
      "2024-09-30",
      "2024-06-30",
    ]);
  });
});

// Amended filings (docs/api.md#amendments). Display fixtures: the amendment below drops one of six
// exceptions, so the zone stays yellow and the plus factor falls from 0.50 to 0.40 (BCBS 1996 Table 2).
const RESTATED = {
  at: "2026-02-03T14:20:00.000Z",
  detail: "1 day inside this snapshot's window changed by upload #88: 1 restated (LKS-EU-TOTAL 2025-11-14).",
};

const amendmentOf12 = (over: Partial<Snapshot> = {}) =>
  snapshot({
    id: 13,
    status: "draft",
    counted: 5,
    plusFactor: 0.4,
    multiplier: 3.4,
    capital: 400_714_286,
    figures: figures({
      exceptions: { actual: 4, hypothetical: 4, counted: 5, excluded: 1 },
      plusFactor: 0.4,
      multiplier: 3.4,
      capital: 400_714_286,
    }),
    amends: 12,
    amendment: {
      amends: 12,
      original: {
        snapshotId: 12,
        hash: HASH,
        approvedAt: "2026-01-12T09:05:00.000Z",
        filingId: 31,
        filedAt: "2026-01-14T10:00:00.000Z",
        filedBy: "Bram Oduya",
        packSha256: PACK_SHA256,
      },
      reason: RESTATED.detail,
      changes: [
        { key: "counted", label: "Counted exceptions", group: "headline", unit: "count", before: 6, after: 5 },
        { key: "plusFactor", label: "Plus factor", group: "headline", unit: "factor", before: 0.5, after: 0.4 },
        {
          key: "capital",
          label: "Capital requirement",
          group: "headline",
          unit: "amount",
          before: 412_500_000,
          after: 400_714_286,
        },
        {
          key: "c24.r010.c140",
          label: "Number of overshootings during previous 250 working days",
          group: "return",
          templateRow: "C 24.00 r010 c140",
          unit: "count",
          before: 6,
          after: 5,
        },
      ],
      exceptions: [{ date: "2025-11-14", change: "removed", detail: "No longer an exception after the restatement." }],
      capitalImpact: { before: 412_500_000, after: 400_714_286, change: -11_785_714, currency: "EUR" },
    },
    history: [
      { at: "2026-02-04T09:00:00.000Z", by: "analyst@larkspur.test", action: "prepared", comment: "Amends #12." },
    ],
    ...over,
  });

describe("Quarter close › amending a filed quarter", () => {
  it("when a filed quarter carries a restatement flag, then the analyst confirms and prepares its amendment, and its view shows what changed", async () => {
    const store = [filed({ restatedAfterSignOff: RESTATED })];
    const { api, user } = openSnapshot("analyst", store, {
      "GET /api/filings": { status: 200, body: [filingOf()] },
      "POST /api/snapshots": () => {
        store[0] = { ...store[0], amendedBy: 13 };
        return answer(store, amendmentOf12(), 201);
      },
    });

    expect(await screen.findByText(/A day inside it was restated since: prepare an amendment/)).toBeInTheDocument();
    await user.click(screen.getByRole("button", { name: "Prepare amendment" }));
    const confirm = screen.getByRole("group", { name: "Prepare an amendment" });
    expect(confirm).toHaveTextContent("computed on today's data as a new draft that names snapshot #12");
    expect(confirm).toHaveTextContent("Snapshot #12, its filing and its pack stay exactly as filed.");
    expect(api.callsTo("POST", "/api/snapshots")).toHaveLength(0);
    // The confirmation takes the focus; Escape closes it and gives the focus back to the button that opened it.
    expect(within(confirm).getByRole("button", { name: "Prepare the amendment" })).toHaveFocus();
    await user.keyboard("{Escape}");
    expect(screen.queryByRole("group", { name: "Prepare an amendment" })).not.toBeInTheDocument();
    expect(screen.getByRole("button", { name: "Prepare amendment" })).toHaveFocus();
    await user.click(screen.getByRole("button", { name: "Prepare amendment" }));
    await user.click(
      within(screen.getByRole("group", { name: "Prepare an amendment" })).getByRole("button", {
        name: "Prepare the amendment",
      }),
    );

    expect(api.callsTo("POST", "/api/snapshots")[0].body).toEqual({
      entity: "LKS-EU",
      quarterEnd: "2025-12-31",
      amends: 12,
    });
    expect(await screen.findByText(/The amendment of Q4 2025 \(#13\) is prepared as a draft/)).toBeInTheDocument();
    await waitFor(() =>
      expect(screen.getByTestId("amendment-links")).toHaveTextContent("Amends #12 (filed 14 Jan 2026, 10:00 UTC)"),
    );
    const links = screen.getByTestId("amendment-links");
    expect(within(links).getByRole("link", { name: "Amends #12" })).toHaveAttribute(
      "href",
      "/quarters?entity=LKS-EU&snapshot=12",
    );
    const table = screen.getByRole("table", { name: "Before and after: 4 figures changed" });
    const row = (name: string) => within(table).getByText(name).closest("tr")!.textContent!.replace(/\s+/g, " ");
    expect(row("Counted exceptions")).toBe("Counted exceptions—65");
    expect(row("Plus factor")).toBe("Plus factor—0.500.40");
    expect(row("Capital requirement")).toBe("Capital requirement—412,500,000 EUR400,714,286 EUR");
    expect(row("Number of overshootings during previous 250 working days")).toContain("C 24.00 r010 c140");
    expect(screen.getByTestId("capital-impact")).toHaveTextContent("−11,785,714 EUR");
    expect(screen.getByRole("table", { name: "Exceptions added, removed or changed" })).toHaveTextContent(
      "2025-11-14RemovedNo longer an exception after the restatement.",
    );
    expect(screen.getByText(HASH)).toBeInTheDocument();
  });

  it("when the amendment is filed, then the original says its restatement is resolved, links to it, and offers no second amendment", async () => {
    openSnapshot(
      "analyst",
      [
        filed({
          restatedAfterSignOff: { ...RESTATED, resolvedBy: { snapshotId: 13, filedAt: "2026-02-06T08:00:00.000Z" } },
          amendedBy: 13,
        }),
      ],
      { "GET /api/filings": { status: 200, body: [filingOf()] } },
    );

    const resolved = await screen.findByRole("note", { name: "Restatement resolved" });
    expect(resolved).toHaveTextContent(
      "Restatement resolved: the amendment #13 corrects this quarter and was filed on 06 Feb 2026, 08:00 UTC.",
    );
    expect(screen.queryByRole("note", { name: "Restated after sign-off" })).not.toBeInTheDocument();
    expect(within(screen.getByTestId("amendment-links")).getByRole("link", { name: "Amended by #13" })).toHaveAttribute(
      "href",
      "/quarters?entity=LKS-EU&snapshot=13",
    );
    expect(screen.queryByRole("button", { name: "Prepare amendment" })).not.toBeInTheDocument();
  });

  it("when the server refuses the amendment (one is already in sign-off), then its reason shows and nothing changes", async () => {
    const store = [filed({ restatedAfterSignOff: RESTATED })];
    const { user } = openSnapshot("analyst", store, {
      "GET /api/filings": { status: 200, body: [filingOf()] },
      "POST /api/snapshots": refusal(
        409,
        "amendment_open",
        "Snapshot #12 already has an amendment in sign-off (#13, submitted); finish or return that one first.",
      ),
    });

    await user.click(await screen.findByRole("button", { name: "Prepare amendment" }));
    await user.click(screen.getByRole("button", { name: "Prepare the amendment" }));
    expect(await screen.findByText(/already has an amendment in sign-off \(#13, submitted\)/)).toBeInTheDocument();
    expect(screen.getByTestId("snapshot-status")).toHaveTextContent("Filed");
  });
});

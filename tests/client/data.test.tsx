import { act, fireEvent, screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { vi } from "vitest";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const columns = ["portfolio", "date", "actual_pnl", "hypothetical_pnl", "var_99"];
const weekendMessage = "2026-03-28 is a Saturday, not a business day of LKS-EU";

function preview(over: Partial<Record<string, unknown>> = {}) {
  return {
    id: 41,
    status: "preview",
    fileName: "daily-2026-03-31.csv",
    sha256: "3f9a0c1d2e4b5a6978c0d1e2f3a4b5c6d7e8f90112233445566778899aabbccd",
    rows: 1250,
    valid: 1249,
    invalid: 1,
    newRows: 1000,
    restatements: 249,
    unchanged: 0,
    errors: [{ line: 3, column: "date", message: weekendMessage }],
    errorCount: 1,
    portfolios: ["LKS-EU-TOTAL", "LKS-US-TOTAL"],
    from: "2026-01-02",
    to: "2026-03-31",
    uploadedBy: "analyst@larkspur.test",
    uploadedAt: "2026-03-31T18:02:00.000Z",
    committedAt: null,
    committedBy: null,
    inserted: null,
    ...over,
  };
}
const summary = (p: ReturnType<typeof preview>) => {
  const { errors: _errors, ...rest } = p;
  return rest;
};

const badRow = {
  line: 3,
  cells: {
    portfolio: "LKS-EU-TOTAL",
    date: "2026-03-28",
    actual_pnl: "-1250000.00",
    hypothetical_pnl: "-1190000.00",
    var_99: "4200000",
  },
  errors: [{ line: 3, column: "date", message: weekendMessage }],
};
const goodRow = {
  line: 2,
  cells: {
    portfolio: "LKS-EU-TOTAL",
    date: "2026-03-27",
    actual_pnl: "310000.00",
    hypothetical_pnl: "295000.00",
    var_99: "4100000",
  },
  errors: [],
};

/**
 * The upload goes out through XMLHttpRequest (for its progress events): this stands in for the
 * network at that boundary. The test drives it: bytes sent, all sent, then the server's answer.
 */
class FakeXhr {
  static last: FakeXhr | undefined;
  method = "";
  url = "";
  body: FormData | undefined;
  status = 0;
  statusText = "";
  responseText = "";
  headers: Record<string, string> = {};
  upload: { onprogress: ((e: ProgressEvent) => void) | null; onload: (() => void) | null } = {
    onprogress: null,
    onload: null,
  };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k] = v;
  }
  send(body: FormData) {
    this.body = body;
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ loaded, total, lengthComputable: true } as ProgressEvent);
  }
  allSent() {
    this.upload.onload?.();
  }
  respond(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

function stubXhr() {
  FakeXhr.last = undefined;
  vi.stubGlobal("XMLHttpRequest", FakeXhr);
}

const csv = (name = "daily-2026-03-31.csv") =>
  new File(["portfolio,date,actual_pnl,hypothetical_pnl,var_99\n"], name, { type: "text/csv" });

function baseRoutes(role: "analyst" | "cro" = "analyst") {
  return {
    "GET /api/auth/session": signedInAs(role),
    "GET /api/entities": { status: 200, body: [] },
    "GET /api/findings": { status: 200, body: [] },
  };
}

describe("Data › upload preview", () => {
  it("shows the file's counts and marks the erroneous cell with its message; commit waits for a fixed file", async () => {
    const api = fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(preview())] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [badRow], total: 1 } },
    });
    renderApp("/data?upload=41");

    const summaryList = await screen.findByLabelText("Summary of the file");
    expect(summaryList).toHaveTextContent("Rows1,250");
    expect(summaryList).toHaveTextContent("Valid1,249");
    expect(summaryList).toHaveTextContent(/With errors\D*1New days/);
    expect(summaryList).toHaveTextContent("New days1,000");
    expect(summaryList).toHaveTextContent("Restatements249");
    expect(summaryList).toHaveTextContent("LKS-EU-TOTAL, LKS-US-TOTAL");
    expect(summaryList).toHaveTextContent("2026-01-02 to 2026-03-31");
    expect(within(summaryList).getByText("3f9a0c1d2e4b…")).toHaveAttribute("title", preview().sha256);

    const table = await screen.findByRole("table", { name: "Rows of the uploaded file" });
    const cell = within(table).getByRole("cell", { name: new RegExp("2026-03-28") });
    expect(cell).toHaveAttribute("aria-invalid", "true");
    expect(cell).toHaveAttribute("title", weekendMessage);
    expect(within(cell).getByText(weekendMessage)).toBeInTheDocument();
    expect(within(table).getByRole("cell", { name: "LKS-EU-TOTAL" })).not.toHaveAttribute("aria-invalid");
    // The preview opens on the rows with errors.
    expect(new URLSearchParams(api.callsTo("GET", "/api/uploads/41/rows")[0].search).get("invalidOnly")).toBe("true");
    expect(screen.getByRole("checkbox", { name: "Only rows with errors" })).toBeChecked();

    const commit = screen.getByRole("button", { name: "Commit 1,249 rows" });
    expect(commit).toBeDisabled();
    expect(commit).toHaveAccessibleDescription(
      "Nothing can be committed while 1 row has errors. Fix them in the file and upload it again.",
    );
  });

  it("clearing 'Only rows with errors' asks the server for every row and they sort by line", async () => {
    const api = fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(preview())] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": (call) =>
        new URLSearchParams(call.search).get("invalidOnly") === "true"
          ? { status: 200, body: { columns, rows: [badRow], total: 1 } }
          : { status: 200, body: { columns, rows: [badRow, goodRow], total: 1250 } },
    });
    const user = userEvent.setup();
    renderApp("/data?upload=41");

    await user.click(await screen.findByRole("checkbox", { name: "Only rows with errors" }));
    expect(await screen.findByText("Lines 1–100 of 1,250 rows")).toBeInTheDocument();
    expect(new URLSearchParams(api.calls.at(-1)!.search).get("invalidOnly")).toBe("false");

    const table = screen.getByRole("table", { name: "Rows of the uploaded file" });
    const lines = () =>
      within(table)
        .getAllByRole("row")
        .slice(1)
        .map((r) => (r as HTMLTableRowElement).cells[0].textContent);
    expect(lines()).toEqual(["3", "2"]);
    // Clean amounts read with separators; the cell with the problem keeps the file's text.
    expect(within(table).getByRole("cell", { name: "310,000.00" })).toBeInTheDocument();
    await user.click(within(table).getByRole("button", { name: /Line/ }));
    expect(lines()).toEqual(["2", "3"]);

    await user.click(screen.getByRole("button", { name: "Next 100" }));
    expect(new URLSearchParams(api.calls.at(-1)!.search).get("offset")).toBe("100");
  });

  it("committing a clean preview calls the endpoint, says what was written and refreshes history and findings", async () => {
    let committed = false;
    const clean = () =>
      preview({
        invalid: 0,
        valid: 1250,
        errors: [],
        errorCount: 0,
        ...(committed ? { status: "committed", committedAt: "2026-03-31T18:05:00.000Z", inserted: 1000 } : {}),
      });
    const api = fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": () => ({ status: 200, body: [summary(clean())] }),
      "GET /api/uploads/41": () => ({ status: 200, body: clean() }),
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [goodRow], total: 1250 } },
      "POST /api/uploads/41/commit": () => {
        committed = true;
        return { status: 200, body: { id: 41, status: "committed", inserted: 1249, restated: 249, unchanged: 1 } };
      },
    });
    const user = userEvent.setup();
    renderApp("/data?upload=41");

    const commit = await screen.findByRole("button", { name: "Commit 1,250 rows" });
    const before = {
      uploads: api.callsTo("GET", "/api/uploads").length,
      findings: api.callsTo("GET", "/api/findings").length,
    };
    await user.click(commit);

    expect(
      await screen.findByText(
        "Upload #41 is committed: 1,000 new days written, 249 days restated (earlier versions kept), 1 unchanged.",
      ),
    ).toBeInTheDocument();
    expect(api.callsTo("POST", "/api/uploads/41/commit")).toHaveLength(1);
    expect(api.callsTo("GET", "/api/uploads").length).toBeGreaterThan(before.uploads);
    expect(api.callsTo("GET", "/api/findings").length).toBeGreaterThan(before.findings);
    const history = screen.getByRole("table", { name: "Uploads, newest first" });
    expect(await within(history).findByText("Committed")).toBeInTheDocument();
    expect(screen.queryByRole("button", { name: /Commit/ })).not.toBeInTheDocument();
  });

  it("a restated day shows each changed cell old → new; one in an approved quarter is warned of and commits only once confirmed", async () => {
    const quarter = { entity: "LKS-EU", quarterEnd: "2026-03-31", status: "approved" };
    const restating = preview({
      invalid: 0,
      valid: 2,
      rows: 2,
      newRows: 0,
      restatements: 2,
      errors: [],
      errorCount: 0,
      restatedDays: [
        {
          portfolio: "LKS-EU-TOTAL",
          date: "2026-03-27",
          changes: [
            { column: "actual_pnl", from: 310000, to: -120000.5 },
            { column: "var_99", from: 4100000, to: null },
          ],
          signedOff: quarter,
        },
        {
          portfolio: "LKS-EU-TOTAL",
          date: "2026-04-01",
          changes: [{ column: "svar_99", from: 1, to: 2 }],
          signedOff: null,
        },
      ],
      signedOffRestatements: 1,
      signedOffQuarters: [{ ...quarter, days: 1 }],
      expiresAt: "2026-04-01T02:02:00.000Z",
      expired: false,
    });
    const api = fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(restating)] },
      "GET /api/uploads/41": { status: 200, body: restating },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [goodRow], total: 2 } },
      "POST /api/uploads/41/commit": {
        status: 200,
        body: { id: 41, status: "committed", inserted: 2, restated: 2, unchanged: 0 },
      },
    });
    const user = userEvent.setup();
    renderApp("/data?upload=41");

    const table = await screen.findByRole("table", { name: "Restated days of upload #41" });
    const [first, second] = within(table).getAllByRole("row").slice(1);
    expect(first).toHaveTextContent("actual_pnl 310,000.00 → −120,000.50");
    expect(first).toHaveTextContent("var_99 4,100,000.00 → empty");
    expect(first).toHaveTextContent("LKS-EU Q1 2026 (approved)");
    expect(second).toHaveTextContent("svar_99 1.00 → 2.00");
    expect(second.lastElementChild).toHaveTextContent("—");
    expect(screen.getByRole("note")).toHaveTextContent(
      "This file restates 1 day in signed-off quarters: LKS-EU Q1 2026 (approved), 1 day.",
    );
    // An approved quarter is not filed yet: no amendment to prepare (docs/api.md#amendments).
    expect(screen.getByRole("note")).not.toHaveTextContent("amendment");
    expect(screen.getByText(/Can be committed until/)).toBeInTheDocument();

    const commit = screen.getByRole("button", { name: "Commit 2 rows" });
    expect(commit).toBeDisabled();
    await user.click(screen.getByRole("checkbox", { name: "I mean to restate 1 day of signed-off quarters" }));
    expect(commit).toBeEnabled();
    await user.click(commit);
    await screen.findByText(/Upload #41 is committed/);
    expect(api.callsTo("POST", "/api/uploads/41/commit")[0].body).toEqual({ confirmSignedOff: true });
  });

  it("people appear by name with their e-mail on hover, in the history and the preview", async () => {
    const committed = preview({
      invalid: 0,
      errors: [],
      errorCount: 0,
      status: "committed",
      committedAt: "2026-03-31T18:05:00.000Z",
      committedBy: "analyst2@larkspur.test",
    });
    fakeApi({
      ...baseRoutes(),
      "GET /api/people": {
        status: 200,
        body: [
          { email: "analyst@larkspur.test", name: "Theo Marchetti" },
          { email: "analyst2@larkspur.test", name: "Priya Ramanathan" },
        ],
      },
      "GET /api/uploads": { status: 200, body: [summary(committed)] },
      "GET /api/uploads/41": { status: 200, body: committed },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [goodRow], total: 1250 } },
    });
    renderApp("/data?upload=41");
    const history = await screen.findByRole("table", { name: "Uploads, newest first" });
    expect(await within(history).findByText("Theo Marchetti")).toHaveAttribute("title", "analyst@larkspur.test");
    expect(within(history).getByText("Priya Ramanathan")).toHaveAttribute("title", "analyst2@larkspur.test");
    expect(within(history).queryByText("analyst@larkspur.test")).not.toBeInTheDocument();
    const panel = screen.getByRole("region", { name: /Upload #41/ });
    expect(within(panel).getByText("Theo Marchetti")).toHaveAttribute("title", "analyst@larkspur.test");
  });

  it("the upload history pages twenty files at a time, newest first", async () => {
    const many = Array.from({ length: 45 }, (_, i) =>
      summary(
        preview({
          id: i + 1,
          fileName: `daily-${i + 1}.csv`,
          uploadedAt: new Date(Date.UTC(2026, 2, 1, 9, i)).toISOString(),
          status: "committed",
        }),
      ),
    );
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: many } });
    const user = userEvent.setup();
    renderApp("/data");
    const history = await screen.findByRole("table", { name: "Uploads, newest first" });
    const files = () =>
      within(screen.getByRole("table", { name: "Uploads, newest first" }))
        .getAllByRole("row")
        .slice(1)
        .map((r) => (r as HTMLTableRowElement).cells[0].textContent);
    expect(within(history).getAllByRole("row")).toHaveLength(21);
    expect(files()[0]).toBe("45");
    const pager = screen.getByRole("navigation", { name: "Pages of the upload history" });
    expect(pager).toHaveTextContent("1–20 of 45");
    expect(within(pager).getByRole("button", { name: "Newer" })).toBeDisabled();
    await user.click(within(pager).getByRole("button", { name: "Older" }));
    expect(pager).toHaveTextContent("21–40 of 45");
    expect(pager).toHaveTextContent("Page 2 of 3");
    expect(files()[0]).toBe("25");
    await user.click(within(pager).getByRole("button", { name: "Older" }));
    expect(files()).toEqual(["5", "4", "3", "2", "1"]);
    expect(within(pager).getByRole("button", { name: "Older" })).toBeDisabled();
  });

  it("an expired preview says so and cannot be committed", async () => {
    const old = preview({
      invalid: 0,
      valid: 1250,
      errors: [],
      errorCount: 0,
      expiresAt: "2026-04-01T02:02:00.000Z",
      expired: true,
    });
    fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(old)] },
      "GET /api/uploads/41": { status: 200, body: old },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [goodRow], total: 1250 } },
    });
    renderApp("/data?upload=41");
    expect(await screen.findByText(/^Expired .*: upload the file again to commit it$/)).toBeInTheDocument();
    expect(screen.getByRole("button", { name: "Commit 1,250 rows" })).toBeDisabled();
    const history = screen.getByRole("table", { name: "Uploads, newest first" });
    expect(within(history).getByText("Expired (not committed)")).toBeInTheDocument();
  });

  it("discarding a preview asks once more, sends DELETE and closes the preview", async () => {
    const api = fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(preview())] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [badRow], total: 1 } },
      "DELETE /api/uploads/41": { status: 204 },
    });
    const user = userEvent.setup();
    const { router } = renderApp("/data?upload=41");

    await user.click(await screen.findByRole("button", { name: "Discard" }));
    await user.click(screen.getByRole("button", { name: "Yes, discard" }));

    expect(api.callsTo("DELETE", "/api/uploads/41")).toHaveLength(1);
    await vi.waitFor(() => expect(router.state.location.search).toBe(""), { timeout: 8000 });
    await vi.waitFor(() => expect(screen.queryByLabelText("Summary of the file")).not.toBeInTheDocument(), {
      timeout: 8000,
    });
  });

  it("clicking a row of the history opens that upload's preview", async () => {
    fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [summary(preview())] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [badRow], total: 1 } },
    });
    const user = userEvent.setup();
    renderApp("/data");

    const history = await screen.findByRole("table", { name: "Uploads, newest first" });
    const row = within(history).getAllByRole("row")[1];
    expect(row).toHaveTextContent("analyst@larkspur.test");
    expect(row).toHaveTextContent("1,250");
    expect(row).toHaveTextContent("Awaiting commit");
    expect(row).toHaveTextContent("3f9a0c1d2e4b");
    await user.click(within(row).getByText("249"));

    expect(await screen.findByRole("heading", { name: /Upload #41/ })).toBeInTheDocument();
    expect(await screen.findByText(weekendMessage)).toBeInTheDocument();
  });
});

describe("Data › sending a file", () => {
  it("reports the bytes sent, then the server's checking, then opens the preview", async () => {
    stubXhr();
    fakeApi({
      ...baseRoutes(),
      "GET /api/uploads": { status: 200, body: [] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [badRow], total: 1 } },
    });
    const user = userEvent.setup();
    const { router } = renderApp("/data");

    await user.upload(await screen.findByLabelText("Choose a CSV file"), csv());
    const xhr = FakeXhr.last!;
    expect(xhr.method).toBe("POST");
    expect(xhr.url).toBe("/api/uploads");
    expect((xhr.body!.get("file") as File).name).toBe("daily-2026-03-31.csv");

    act(() => xhr.progress(2_562_000, 6_100_000));
    const sending = screen.getByRole("progressbar", { name: "Sending daily-2026-03-31.csv" });
    expect(sending).toHaveAttribute("aria-valuenow", "42");
    expect(sending).toHaveAttribute("aria-valuetext", "Sending… 42% of 6.1 MB");

    act(() => xhr.allSent());
    const checking = screen.getByRole("progressbar", { name: "Checking daily-2026-03-31.csv" });
    expect(checking).not.toHaveAttribute("aria-valuenow");
    expect(checking).toHaveAttribute("aria-valuetext", "Checking rows on the server…");

    act(() => xhr.respond(201, preview()));
    expect(await screen.findByLabelText("Summary of the file")).toBeInTheDocument();
    expect(router.state.location.search).toBe("?upload=41");
    expect(screen.queryByRole("progressbar", { name: /daily-2026/ })).not.toBeInTheDocument();
  });

  it("when the header is wrong (422), then each problem is listed beside the panel", async () => {
    stubXhr();
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: [] } });
    const user = userEvent.setup();
    renderApp("/data");

    await user.upload(await screen.findByLabelText("Choose a CSV file"), csv("march.csv"));
    act(() =>
      FakeXhr.last!.respond(422, {
        error: {
          code: "invalid_file",
          message: "The header row has 2 problems; nothing was read.",
          details: {
            errors: [
              { line: 1, column: "pnl", message: "Unknown column pnl" },
              { line: 1, column: "var_99", message: "Required column var_99 is missing" },
            ],
          },
        },
      }),
    );

    const alert = await screen.findByRole("alert", { name: "The file cannot be read as daily data" });
    expect(alert).toHaveTextContent("march.csv");
    expect(alert).toHaveTextContent("The header row has 2 problems; nothing was read.");
    const items = within(within(alert).getByRole("list", { name: "Problems with the file" })).getAllByRole("listitem");
    expect(items.map((li) => li.textContent)).toEqual([
      "Line 1 · pnlUnknown column pnl",
      "Line 1 · var_99Required column var_99 is missing",
    ]);
  });

  it("when the same file was committed before (409), then the message names it and links to it", async () => {
    stubXhr();
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: [] } });
    const user = userEvent.setup();
    renderApp("/data");

    await user.upload(await screen.findByLabelText("Choose a CSV file"), csv());
    act(() =>
      FakeXhr.last!.respond(409, {
        error: { code: "conflict", message: "This exact file was committed as upload #12 on 2026-03-30." },
      }),
    );

    const alert = await screen.findByRole("alert", { name: "This file is already in" });
    expect(alert).toHaveTextContent("This exact file was committed as upload #12 on 2026-03-30.");
    expect(within(alert).getByRole("link", { name: "Open upload #12" })).toHaveAttribute("href", "/data?upload=12");
  });

  it("dropping one file on the panel sends it; dropping two is refused", async () => {
    stubXhr();
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: [] } });
    renderApp("/data");

    const zone = (await screen.findByText("Drop a CSV file here, or")).parentElement!;
    fireEvent.drop(zone, { dataTransfer: { files: [csv("a.csv"), csv("b.csv")] } });
    expect(await screen.findByRole("alert", { name: "The file was not accepted" })).toHaveTextContent(
      "2 files were dropped; upload one file at a time.",
    );
    expect(FakeXhr.last).toBeUndefined();

    fireEvent.drop(zone, { dataTransfer: { files: [csv("a.csv")] } });
    await vi.waitFor(() => expect(FakeXhr.last).toBeDefined(), { timeout: 8000 });
    expect((FakeXhr.last!.body!.get("file") as File).name).toBe("a.csv");
    expect(await screen.findByRole("progressbar", { name: "Sending a.csv" })).toBeInTheDocument();
  });

  it("a file that is not .csv is refused before anything is sent", async () => {
    stubXhr();
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: [] } });
    const user = userEvent.setup({ applyAccept: false });
    renderApp("/data");

    await user.upload(await screen.findByLabelText("Choose a CSV file"), new File(["x"], "march.xlsx"));

    expect(await screen.findByRole("alert", { name: "This is not a CSV file" })).toHaveTextContent(
      "march.xlsx is not a .csv file.",
    );
    expect(FakeXhr.last).toBeUndefined();
  });
});

describe("Data › who may do what", () => {
  it("the chief risk officer reads previews, history and findings but has no upload, commit, discard or resolve controls", async () => {
    fakeApi({
      ...baseRoutes("cro"),
      "GET /api/findings": {
        status: 200,
        body: [
          {
            id: 5,
            entity: "LKS-EU",
            portfolio: "LKS-EU-TOTAL",
            kind: "stale_var",
            from: "2026-03-02",
            to: "2026-03-06",
            detail: "VaR 4,200,000 on 5 days",
            status: "open",
            note: null,
            closedBy: null,
            closedAt: null,
            version: 1,
          },
        ],
      },
      "GET /api/uploads": { status: 200, body: [summary(preview())] },
      "GET /api/uploads/41": { status: 200, body: preview() },
      "GET /api/uploads/41/rows": { status: 200, body: { columns, rows: [badRow], total: 1 } },
    });
    renderApp("/data?upload=41");

    expect(await screen.findByLabelText("Summary of the file")).toBeInTheDocument();
    expect(screen.getByRole("table", { name: "Uploads, newest first" })).toBeInTheDocument();
    expect(screen.getByRole("table", { name: "Data-quality findings" })).toHaveTextContent("Stale VaR");
    expect(screen.queryByLabelText("Choose a CSV file")).not.toBeInTheDocument();
    expect(screen.queryByRole("button", { name: /Commit/ })).not.toBeInTheDocument();
    expect(screen.queryByRole("button", { name: "Discard" })).not.toBeInTheDocument();
    expect(screen.queryByRole("button", { name: /Resolve|Explain/ })).not.toBeInTheDocument();
    expect(screen.getByText("This preview waits for an analyst to commit or discard it.")).toBeInTheDocument();
  });

  it("the Data link shows for analysts and the chief risk officer only; treasury cannot open the screen", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("treasury"), "GET /api/entities": { status: 200, body: [] } });
    renderApp("/data");
    expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).queryByRole("link", { name: "Data" }),
    ).not.toBeInTheDocument();
  });

  it("when nothing has been uploaded, the analyst is told how to start", async () => {
    fakeApi({ ...baseRoutes(), "GET /api/uploads": { status: 200, body: [] } });
    renderApp("/data");
    expect(await screen.findByText("No files uploaded yet")).toBeInTheDocument();
    expect(
      screen.getByText(/Download the template, fill in one line per portfolio and business day/),
    ).toBeInTheDocument();
    expect(screen.getByRole("link", { name: "Download the template" })).toHaveAttribute(
      "href",
      "/api/uploads/template.csv",
    );
    expect(
      within(screen.getByRole("navigation", { name: "Main" })).getByRole("link", { name: "Data" }),
    ).toBeInTheDocument();
  });
});

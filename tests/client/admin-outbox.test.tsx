import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const FOLDER = "/srv/quartermark/.data/mail";
const PACK_SHA = "9f2c4e6a8b0d1f3e5c7a9b1d3f5e7c9a0b2d4f6e8a0c2e4f6a8b0d2f4e6a8c0e";
const CSV_SHA = "1a3c5e7f9b1d3f5a7c9e1b3d5f7a9c1e3b5d7f9a1c3e5b7d9f1a3c5e7b9d1f3a";

const packMessage = {
  id: "2026-10-02T09-14-05-118Z-k2v9q4m7x1c8",
  readable: true,
  size: 48_213,
  storedAt: "2026-10-02T09:14:05.118Z",
  from: "Quartermark <quartermark@localhost>",
  to: ["rowan.vale@supervisor.larkspur.test"],
  subject: "Larkspur Markets SA: backtesting pack for Q3 2026",
  date: "2026-10-02T09:14:05.000Z",
  messageId: "<filing-41-9f2c4e6a8b0d1f3e@quartermark>",
  attachments: [
    {
      index: 0,
      filename: "quartermark-LKS-EU-2026-09-30-pack.pdf",
      contentType: "application/pdf",
      size: 46_880,
      sha256: PACK_SHA,
    },
  ],
};
const olderMessage = {
  ...packMessage,
  id: "2026-07-03T08-00-00-000Z-a1b2c3d4e5f6",
  storedAt: "2026-07-03T08:00:00.000Z",
  to: ["desk.review@supervisor.larkspur.test", "second.reader@supervisor.larkspur.test"],
  subject: "Larkspur Securities LLC: backtesting pack for Q2 2026",
  messageId: "<filing-30-1a3c5e7f9b1d3f5a@quartermark>",
  attachments: [
    {
      index: 0,
      filename: "quartermark-LKS-US-2026-06-30-pack.pdf",
      contentType: "application/pdf",
      size: 40_100,
      sha256: PACK_SHA,
    },
    { index: 1, filename: "exceptions.csv", contentType: "text/csv", size: 812, sha256: CSV_SHA },
  ],
};
const brokenFile = {
  id: "2026-06-30-left-by-hand",
  readable: false,
  size: 10,
  storedAt: "2026-06-30T12:00:00.000Z",
  problem: "The file has no From or To header: it is not an e-mail message.",
};

/** The sink's folder as the server lists it: the pack, an older message and a file that is no message. */
const threeKept = {
  status: 200,
  body: { folder: FOLDER, total: 3, messages: [packMessage, olderMessage, brokenFile] },
};

const detailOf = (m: typeof packMessage, text: string) => ({ status: 200, body: { ...m, text } });

describe("Admin › Outbox (development only)", () => {
  it("lists what the mail sink kept, newest first, and opens the newest with its text and each attachment's SHA-256 and download", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/admin/outbox": threeKept,
      [`GET /api/admin/outbox/${packMessage.id}`]: detailOf(
        packMessage,
        "Dear Ms Rowan Vale,\n\nPlease find attached the pack.\nSHA-256 of the attached file: " + PACK_SHA,
      ),
    });
    renderApp("/admin/outbox");

    expect(await screen.findByRole("heading", { level: 1, name: "Outbox" })).toBeInTheDocument();
    expect(screen.getByText("Development only")).toBeInTheDocument();
    expect(screen.getByText(/None of them reached a real mail server/)).toBeInTheDocument();
    expect(screen.getByText(FOLDER)).toBeInTheDocument();
    expect(screen.getByText(/3 messages · 1 unreadable · latest 02 Oct 2026, 09:14 UTC/)).toBeInTheDocument();

    const table = screen.getByRole("table", { name: "Messages kept by the local mail sink, newest first" });
    const [, first, second, third] = within(table).getAllByRole("row");
    expect(within(first).getByText("02 Oct 2026, 09:14 UTC")).toBeInTheDocument();
    expect(within(first).getByText("rowan.vale@supervisor.larkspur.test")).toBeInTheDocument();
    expect(
      within(first).getByRole("link", { name: "Larkspur Markets SA: backtesting pack for Q3 2026" }),
    ).toBeInTheDocument();
    expect(within(first).getByText("quartermark-LKS-EU-2026-09-30-pack.pdf")).toBeInTheDocument();
    expect(first).toHaveAttribute("aria-current", "true");
    expect(within(second).getByText("second.reader@supervisor.larkspur.test")).toBeInTheDocument();
    expect(within(second).getByText("exceptions.csv")).toBeInTheDocument();
    expect(within(third).getByText("Unreadable file")).toBeInTheDocument();
    expect(within(third).getByText(brokenFile.problem)).toBeInTheDocument();

    // The newest message is open: its text, and its pack with the SHA-256 written out in full.
    const view = await screen.findByRole("region", { name: "Larkspur Markets SA: backtesting pack for Q3 2026" });
    expect(within(view).getByText(/Please find attached the pack\./)).toBeInTheDocument();
    expect(within(view).getByText("<filing-41-9f2c4e6a8b0d1f3e@quartermark>")).toBeInTheDocument();
    expect(within(view).getByTestId("attachment-sha256-0")).toHaveTextContent(PACK_SHA);
    const download = within(view).getByRole("link", { name: "Download quartermark-LKS-EU-2026-09-30-pack.pdf" });
    expect(download).toHaveAttribute("href", `/api/admin/outbox/${packMessage.id}/attachments/0`);
    expect(download).toHaveAttribute("download", "quartermark-LKS-EU-2026-09-30-pack.pdf");
    expect(api.callsTo("GET", `/api/admin/outbox/${packMessage.id}`)).toHaveLength(1);
  });

  it("when another row is chosen, then that message opens, and an unreadable file says why and where it lies", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/admin/outbox": threeKept,
      [`GET /api/admin/outbox/${packMessage.id}`]: detailOf(packMessage, "Newest"),
      [`GET /api/admin/outbox/${olderMessage.id}`]: detailOf(olderMessage, "The Q2 pack and the exception list."),
      [`GET /api/admin/outbox/${brokenFile.id}`]: { status: 200, body: brokenFile },
    });
    const user = userEvent.setup();
    const { router } = renderApp("/admin/outbox");

    await user.click(
      await screen.findByRole("link", { name: "Larkspur Securities LLC: backtesting pack for Q2 2026" }),
    );
    const view = await screen.findByRole("region", { name: "Larkspur Securities LLC: backtesting pack for Q2 2026" });
    expect(router.state.location.search).toBe(`?message=${olderMessage.id}`);
    expect(within(view).getByText("The Q2 pack and the exception list.")).toBeInTheDocument();
    expect(within(view).getByTestId("attachment-sha256-1")).toHaveTextContent(CSV_SHA);
    expect(within(view).getByRole("link", { name: "Download exceptions.csv" })).toHaveAttribute(
      "href",
      `/api/admin/outbox/${olderMessage.id}/attachments/1`,
    );

    await user.click(screen.getByRole("link", { name: "Unreadable file" }));
    const broken = await screen.findByRole("region", { name: "This file could not be read as an e-mail message" });
    expect(within(broken).getByText(brokenFile.problem)).toBeInTheDocument();
    expect(within(broken).getByText(`${FOLDER}/${brokenFile.id}.eml`)).toBeInTheDocument();
    expect(api.callsTo("GET", `/api/admin/outbox/${brokenFile.id}`)).toHaveLength(1);
  });

  it("when nothing has been sent, then the empty state says that filing a pack from Quarter close sends one", async () => {
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/admin/outbox": { status: 200, body: { folder: FOLDER, total: 0, messages: [] } },
    });
    renderApp("/admin/outbox");
    expect(
      await screen.findByText("No e-mail sent yet — filing a pack from Quarter close sends one"),
    ).toBeInTheDocument();
    expect(screen.queryByRole("table")).not.toBeInTheDocument();
  });

  it("when the server has no outbox (production), then the screen says so in the server's words instead of failing", async () => {
    const message =
      "The mail outbox exists only in development; this server runs with NODE_ENV=production, where e-mail goes to the real mail server.";
    fakeApi({
      "GET /api/auth/session": signedInAs("admin"),
      "GET /api/admin/outbox": { status: 404, body: { error: { code: "outbox_unavailable", message } } },
    });
    renderApp("/admin/outbox");
    const status = await screen.findByRole("status");
    expect(within(status).getByText("There is no outbox on this server")).toBeInTheDocument();
    expect(within(status).getByText(message)).toBeInTheDocument();
    expect(screen.getByRole("heading", { level: 1, name: "Outbox" })).toBeInTheDocument();
  });

  it.each(["analyst", "cro", "treasury", "regulator"] as const)(
    "when a %s opens the address, then it is not for their role and the outbox is never asked",
    async (role) => {
      const api = fakeApi({
        "GET /api/auth/session": signedInAs(role),
        "GET /api/admin/outbox": { status: 403, body: { error: { code: "forbidden", message: "No" } } },
      });
      renderApp("/admin/outbox");
      expect(await screen.findByRole("heading", { name: "Not available for your role" })).toBeInTheDocument();
      expect(api.callsTo("GET", "/api/admin/outbox")).toHaveLength(0);
    },
  );
});

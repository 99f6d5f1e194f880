import { render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, vi } from "vitest";
import { DownloadButton } from "@/components/ui/download-button";
import { Notice } from "@/components/ui/notice";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { fileNameFromDisposition } from "@/lib/download";
import { fakeApi } from "./support/fake-api";

const ZONE_CLASS = /\b(bg|text|border)-zone-/;

/** Catches the save: the object URL made for the Blob, and the name the hidden link carried when clicked. */
const realCreate = URL.createObjectURL;
const realRevoke = URL.revokeObjectURL;
afterEach(() => {
  URL.createObjectURL = realCreate;
  URL.revokeObjectURL = realRevoke;
  vi.restoreAllMocks();
});

function catchSaves() {
  const blobs: Blob[] = [];
  const saved: { href: string; download: string }[] = [];
  URL.createObjectURL = vi.fn((b: Blob) => {
    blobs.push(b);
    return `blob:quartermark.test/${blobs.length}`;
  });
  URL.revokeObjectURL = vi.fn();
  vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
    saved.push({ href: this.href, download: this.download });
  });
  return { blobs, saved };
}

/** The download button for `href` on its own, its saves caught; the user who clicks it. */
function renderDownloadButton(href: string, fallbackName: string, label = "Download the pack (PDF)") {
  const saves = catchSaves();
  const user = userEvent.setup();
  render(
    <DownloadButton href={href} fallbackName={fallbackName}>
      {label}
    </DownloadButton>,
  );
  return { saves, user };
}

describe("DownloadButton", () => {
  it("when the server sends the PDF, then it is saved through a Blob URL under the name in its Content-Disposition", async () => {
    const api = fakeApi({
      "GET /api/filings/31/pack.pdf": {
        status: 200,
        raw: "%PDF-1.7\n%%EOF\n",
        headers: {
          "Content-Type": "application/pdf",
          "Content-Disposition": 'attachment; filename="LKS-EU-2026-09-30-pack.pdf"',
        },
      },
    });
    const { saves, user } = renderDownloadButton("/api/filings/31/pack.pdf", "pack.pdf");

    await user.click(screen.getByRole("button", { name: "Download the pack (PDF)" }));

    await waitFor(() =>
      expect(saves.saved).toEqual([{ href: "blob:quartermark.test/1", download: "LKS-EU-2026-09-30-pack.pdf" }]),
    );
    expect(await saves.blobs[0]!.text()).toBe("%PDF-1.7\n%%EOF\n");
    expect(api.callsTo("GET", "/api/filings/31/pack.pdf")).toHaveLength(1);
    expect(vi.mocked(fetch).mock.calls[0]![1]).toMatchObject({ credentials: "same-origin" });
    expect(screen.queryByRole("alert")).not.toBeInTheDocument();
    expect(screen.getByRole("button", { name: "Download the pack (PDF)" })).not.toHaveAttribute("aria-busy");
  });

  it("when the server names no file, then the fallback name is used", async () => {
    fakeApi({
      "GET /api/snapshots/12/pack.pdf": {
        status: 200,
        raw: "%PDF-1.7\n",
        headers: { "Content-Type": "application/pdf" },
      },
    });
    const { saves, user } = renderDownloadButton(
      "/api/snapshots/12/pack.pdf",
      "quartermark-lks-eu-2025-12-31-pack.pdf",
      "Download",
    );

    await user.click(screen.getByRole("button", { name: "Download" }));

    await waitFor(() => expect(saves.saved.map((s) => s.download)).toEqual(["quartermark-lks-eu-2025-12-31-pack.pdf"]));
  });

  it.each([
    [404, "not_found", "No snapshot 12."],
    [403, "forbidden", "A supervisor reads filed packs under Filings, not a quarter's draft."],
  ])(
    "when the server refuses with %i, then its message shows beside the control and nothing is saved",
    async (status, code, message) => {
      fakeApi({ "GET /api/snapshots/12/pack.pdf": { status, body: { error: { code, message } } } });
      const { saves, user } = renderDownloadButton("/api/snapshots/12/pack.pdf", "pack.pdf");

      await user.click(screen.getByRole("button", { name: "Download the pack (PDF)" }));

      expect(await screen.findByRole("alert")).toHaveTextContent(message);
      expect(saves.saved).toEqual([]);
      expect(URL.createObjectURL).not.toHaveBeenCalled();
    },
  );

  it("while the PDF is on its way, then the control says so and a second press sends no second request", async () => {
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const fetchStub = vi.fn(async () => {
      await gate;
      return new Response("%PDF-1.7\n", {
        status: 200,
        headers: { "Content-Disposition": 'attachment; filename="a.pdf"' },
      });
    });
    vi.stubGlobal("fetch", fetchStub);
    const { saves, user } = renderDownloadButton("/api/filings/31/pack.pdf", "pack.pdf");

    await user.click(screen.getByRole("button", { name: "Download the pack (PDF)" }));
    const busy = await screen.findByRole("button", { name: "Downloading…" });
    expect(busy).toHaveAttribute("aria-busy", "true");
    await user.click(busy);
    expect(fetchStub).toHaveBeenCalledTimes(1);

    release();
    expect(await screen.findByRole("button", { name: "Download the pack (PDF)" })).not.toHaveAttribute("aria-busy");
    expect(saves.saved.map((s) => s.download)).toEqual(["a.pdf"]);
  });
});

describe("fileNameFromDisposition", () => {
  it("reads the quoted, the bare and the RFC 5987 forms, and keeps only the last path segment", () => {
    expect(fileNameFromDisposition('attachment; filename="LKS-EU-2026-09-30-pack.pdf"')).toBe(
      "LKS-EU-2026-09-30-pack.pdf",
    );
    expect(fileNameFromDisposition("attachment; filename=pack.pdf")).toBe("pack.pdf");
    expect(fileNameFromDisposition("attachment; filename=\"x.pdf\"; filename*=UTF-8''Q4%20pack.pdf")).toBe(
      "Q4 pack.pdf",
    );
    expect(fileNameFromDisposition('attachment; filename="../../etc/pack.pdf"')).toBe("pack.pdf");
    expect(fileNameFromDisposition("attachment")).toBeNull();
    expect(fileNameFromDisposition(null)).toBeNull();
  });
});

describe("Notice", () => {
  it("carries the neutral notice tone and an icon, never a zone colour, while a zone badge keeps its zone colour", () => {
    render(
      <>
        <Notice label="Four eyes">You prepared this snapshot.</Notice>
        <ZoneBadge zone="yellow" />
      </>,
    );
    const note = screen.getByRole("note", { name: "Four eyes" });
    expect(note).toHaveAttribute("data-tone", "notice");
    expect(note.className).toMatch(/\bbg-notice-soft\b/);
    expect(note.outerHTML).not.toMatch(ZONE_CLASS);
    expect(note.querySelector("svg[aria-hidden='true']")).not.toBeNull();
    expect(screen.getByText("Yellow").className).toMatch(/\bbg-zone-yellow-soft\b/);
  });
});

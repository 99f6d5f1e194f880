import { screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, signedInAs } from "./support/fake-api";
import { renderApp } from "./support/render-app";

const choices = (on: string[]) => ({
  choices: [
    { kind: "new_exception", label: "A committed day is a new exception", on: on.includes("new_exception") },
    { kind: "snapshot_submitted", label: "A quarter is submitted for sign-off", on: on.includes("snapshot_submitted") },
    { kind: "snapshot_approved", label: "A quarter is approved and sealed", on: on.includes("snapshot_approved") },
  ],
});

describe("Your account › e-mails you receive", () => {
  it("shows the kinds for the role as the server has them and sends exactly the ticked ones", async () => {
    const api = fakeApi({
      "GET /api/auth/session": signedInAs("cro", "Margot Ellsworth"),
      "GET /api/notifications/choices": { status: 200, body: choices(["snapshot_approved"]) },
      "PUT /api/notifications/choices": (call) => ({
        status: 200,
        body: choices((call.body as { on: string[] }).on),
      }),
    });
    const user = userEvent.setup();
    renderApp("/account");

    const submitted = await screen.findByRole("checkbox", { name: "A quarter is submitted for sign-off" });
    expect(submitted).not.toBeChecked();
    expect(screen.getByRole("checkbox", { name: "A quarter is approved and sealed" })).toBeChecked();
    await user.click(submitted);
    await user.click(screen.getByRole("checkbox", { name: "A quarter is approved and sealed" }));
    await user.click(screen.getByRole("button", { name: "Save e-mail choices" }));

    expect(await screen.findByText("Saved: you receive 1 kind of e-mail.")).toHaveFocus();
    expect(api.callsTo("PUT", "/api/notifications/choices").map((c) => c.body)).toEqual([
      { on: ["snapshot_submitted"] },
    ]);
    expect(screen.getByRole("checkbox", { name: "A quarter is submitted for sign-off" })).toBeChecked();
  });
});

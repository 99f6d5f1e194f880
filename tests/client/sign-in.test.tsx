import { screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { fakeApi, refusal, signedInAs, signedOut, type Reply } from "./support/fake-api";
import { renderApp } from "./support/render-app";

/** Types an e-mail address and a password into the sign-in form and sends it. */
async function signInWith(user: ReturnType<typeof userEvent.setup>, email: string, password: string) {
  await user.type(await screen.findByLabelText("E-mail"), email);
  await user.type(screen.getByLabelText("Password"), password);
  await user.click(screen.getByRole("button", { name: "Sign in" }));
}

/** Signed out, signs in with `email` and `password` to a server that answers with `refused`. */
async function signInRefused(refused: Reply, email: string, password: string) {
  const api = fakeApi({ "GET /api/auth/session": signedOut, "POST /api/auth/login": refused });
  renderApp("/sign-in");
  await signInWith(userEvent.setup(), email, password);
  return api;
}

describe("sign-in", () => {
  it("when the e-mail is left empty, then the field says so beside it and nothing is sent", async () => {
    const api = fakeApi({ "GET /api/auth/session": signedOut });
    const user = userEvent.setup();
    renderApp("/sign-in");

    await user.click(await screen.findByRole("button", { name: "Sign in" }));

    const email = screen.getByLabelText("E-mail");
    expect(email).toHaveAttribute("aria-invalid", "true");
    expect(email).toHaveAccessibleDescription("Enter a valid e-mail address");
    expect(api.callsTo("POST", "/api/auth/login")).toHaveLength(0);
  });

  it("when the server answers 401, then its message is shown for the whole form", async () => {
    const api = await signInRefused(
      refusal(401, "invalid_credentials", "E-mail or password is not right."),
      "analyst@larkspur.test",
      "wrong password",
    );

    expect(await screen.findByRole("alert")).toHaveTextContent("E-mail or password is not right.");
    expect(api.callsTo("POST", "/api/auth/login")[0].body).toEqual({
      email: "analyst@larkspur.test",
      password: "wrong password",
    });
    expect(screen.getByRole("button", { name: "Sign in" })).toBeEnabled();
  });

  it("when there were too many attempts (429), then the server's message says to wait", async () => {
    await signInRefused(
      refusal(429, "rate_limited", "Too many sign-in attempts. Try again in 15 minutes."),
      "cro@larkspur.test",
      "anything",
    );

    expect(await screen.findByRole("alert")).toHaveTextContent("Try again in 15 minutes.");
  });

  it("when the password is over 72 bytes, then the field refuses it before anything is sent", async () => {
    const api = fakeApi({ "GET /api/auth/session": signedOut });
    const user = userEvent.setup();
    renderApp("/sign-in");

    await signInWith(user, "admin@larkspur.test", "x".repeat(73));

    expect(screen.getByLabelText("Password")).toHaveAccessibleDescription(/limited to 72 bytes/);
    expect(api.callsTo("POST", "/api/auth/login")).toHaveLength(0);
  });

  it("when sign-in succeeds, then the reader lands where they were going", async () => {
    let signedIn = false;
    fakeApi({
      "GET /api/auth/session": () => (signedIn ? { status: 200, body: { user } } : signedOut),
      "POST /api/auth/login": () => {
        signedIn = true;
        return { status: 200, body: { user } };
      },
      "GET /api/entities": { status: 200, body: [] },
    });
    const user = { id: 1, email: "treasury@larkspur.test", name: "Tom Treasury", role: "treasury" };
    const ue = userEvent.setup();
    const { router } = renderApp("/sign-in?redirectTo=%2F");

    await signInWith(ue, "treasury@larkspur.test", "quartermark-demo");

    expect(await screen.findByRole("heading", { name: "Overview" })).toBeInTheDocument();
    await waitFor(() => expect(router.state.location.pathname).toBe("/"));
    expect(screen.getByText("Tom Treasury")).toBeInTheDocument();
  });

  it("when someone is already signed in, then the page says who and still lets another person sign in", async () => {
    fakeApi({ "GET /api/auth/session": signedInAs("cro", "Cora Rowe") });
    renderApp("/sign-in");

    expect(await screen.findByText(/You are signed in as Cora Rowe \(Chief risk officer\)/)).toBeInTheDocument();
    expect(screen.getByRole("link", { name: "Continue as Cora" })).toHaveAttribute("href", "/");
    expect(screen.getByLabelText("E-mail")).toBeInTheDocument();
  });
});

import request from "supertest";
import { describe, expect, it } from "vitest";
import { createTestEntity, createTestPortfolio, createTestUser, sessionCookieFor, testApp } from "../server/helpers";
import { uploadCsv, weekdays } from "../server/ingest-helpers";
import { expectAccessible } from "./axe";
import { browserSuite, keepScreenshot, pageSignedInAs } from "./browser";

let code = "";
let analystEmail = "";

/**
 * An FRTB entity with a top of house and two desks up to 31 March 2026; desk A has 13 losses beyond
 * its 99% VaR in 2026 Q1, so the Q1 determination puts it out of the model (MAR32.19). The charges
 * are those worked by hand in tests/server/frtb-capital.test.ts: ACR 815 from 1 April 2026.
 */
async function loadBook() {
  const app = testApp();
  const entity = await createTestEntity({ regime: "frtb" });
  code = entity.code;
  const top = await createTestPortfolio(entity);
  const a = await createTestPortfolio(entity, "A", "Desk A", "desk");
  const b = await createTestPortfolio(entity, "B", "Desk B", "desk");
  const analyst = await createTestUser("analyst");
  analystEmail = analyst.email;
  const cookie = await sessionCookieFor(analyst.id);
  const dates = weekdays("2025-04-01", 600).filter((d) => d <= "2026-03-31");
  const q1 = dates.filter((d) => d >= "2026-01-05").slice(0, 13);
  const lines = ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,es_975,ses,ima_drc,sbm,rrao,sa_drc"];
  for (const d of dates) {
    lines.push(`${top.code},${d},10,10,100,80,300,50,40,900,20,80`);
    lines.push(`${a.code},${d},${q1.includes(d) ? -150 : 10},10,100,80,200,30,25,500,10,40`);
    lines.push(`${b.code},${d},10,10,100,80,150,20,20,400,5,45`);
  }
  const res = await uploadCsv(app, cookie, `${lines.join("\n")}\n`);
  const commit = await request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie);
  expect(commit.status).toBe(200);
}

const suite = browserSuite(loadBook);

describe("FRTB capital in a real browser", () => {
  it("when an analyst opens Capital for an FRTB entity, then the aggregation, the desks and their timeline show and the page is accessible", async () => {
    const { page, errors } = await pageSignedInAs(suite, analystEmail, `/capital?entity=${code}`);
    const section = page.getByRole("region", { name: "FRTB aggregate capital requirement" });
    await section.getByTestId("frtb-acr").waitFor({ timeout: 20_000 });
    // Today is after 1 April 2026, so the Q1 determination is in force: desk A out, C_U 550, ACR 815.
    expect(await section.getByTestId("frtb-cu").textContent()).toContain("550");
    expect(await section.getByTestId("frtb-acr").textContent()).toContain("815");
    await section.getByRole("table", { name: /Desk status at each determination/ }).waitFor();
    await page.waitForLoadState("networkidle");
    await expectAccessible(page, "capital-frtb-aggregation");
    await keepScreenshot(page, "capital-frtb-aggregation");
    expect(errors).toEqual([]);
    await page.close();
  });
});

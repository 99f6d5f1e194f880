import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { portfolioCodeParamSchema } from "../../../shared/schemas/common";
import { backtestQuerySchema, rollingQuerySchema } from "../../../shared/schemas/backtest";
import { getBacktest, getOverview, getRollingJson } from "./backtest.service";

export function backtestRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/backtest", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    res.json(await getBacktest(code, asOf));
  });
  r.get("/api/portfolios/:code/rolling", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    // Stored JSON, sent as it is: no parse and re-serialise of the whole history on each read.
    res.type("json").send(await getRollingJson(code, parseInput(rollingQuerySchema, req.query, "query")));
  });
  r.get("/api/overview", async (_req, res) => {
    res.json(await getOverview());
  });
  return r.router;
}

import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { portfolioCodeParamSchema } from "../../../shared/schemas/common";
import { backtestQuerySchema, rollingQuerySchema } from "../../../shared/schemas/backtest";
import { getBacktest, getOverview, getRolling } from "./backtest.service";

export function backtestRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/backtest", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    res.json(await getBacktest(code, asOf));
  });
  r.get("/api/portfolios/:code/rolling", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    res.json(await getRolling(code, parseInput(rollingQuerySchema, req.query, "query")));
  });
  r.get("/api/overview", async (_req, res) => {
    res.json(await getOverview());
  });
  return r.router;
}

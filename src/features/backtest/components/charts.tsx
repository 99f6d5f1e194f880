// The charts live in their own module so that recharts loads only when a backtest is on screen.
export { PnlChart } from "./pnl-chart";
export { RollingChart } from "./rolling-chart";

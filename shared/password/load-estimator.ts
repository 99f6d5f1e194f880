import type { StrengthEstimator } from "./policy";

let loading: Promise<StrengthEstimator> | undefined;

/** The estimator, loaded on first use (in the client: its own chunk, outside the main bundle) and kept. */
export function loadStrengthEstimator(): Promise<StrengthEstimator> {
  loading ??= import("./estimator").then((m) => m.createStrengthEstimator());
  loading.catch(() => (loading = undefined));
  return loading;
}

import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import { adjacencyGraphs, dictionary as commonDictionary } from "@zxcvbn-ts/language-common";
import { dictionary as englishDictionary, translations } from "@zxcvbn-ts/language-en";
import type { StrengthEstimator } from "./policy";

/**
 * zxcvbn-ts with the common (breached and frequent passwords, keyboard graphs) and English
 * (words, names, Wikipedia terms) dictionaries and English feedback, as the library recommends.
 * Levenshtein matching is left off: it multiplies the time of a check by ten or more.
 * Building it ranks every dictionary (about a second): build once and keep it.
 */
export function createStrengthEstimator(): StrengthEstimator {
  return new ZxcvbnFactory({
    translations,
    graphs: adjacencyGraphs,
    dictionary: { ...commonDictionary, ...englishDictionary },
  });
}

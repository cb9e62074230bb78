import { describe, expect, it } from "vitest";
import { INHIBITION_MODELS } from "@/lib/kinetics";
import { HEADLINE_CONSTANT, headlineKi } from "./headline-ki";

// Which constant represents each model: Segel, Enzyme Kinetics (1975), ch. 3 [from memory];
// Kic for a mixed inhibitor is common practice.
describe("headline Ki", () => {
  it("names a constant for every model: Kiu for uncompetitive, Kic for the other three", () => {
    expect(Object.keys(HEADLINE_CONSTANT).sort()).toEqual([...INHIBITION_MODELS].sort());
    expect(HEADLINE_CONSTANT).toEqual({
      competitive: "kic",
      uncompetitive: "kiu",
      noncompetitive: "kic",
      mixed: "kic",
    });
  });

  it("reads the value and the 95 % CI of that constant (invented numbers)", () => {
    const fit = { kicUm: 0.8, kiuUm: 3.2, ci95: { kic: [0.6, 1.1] as const, kiu: [2.5, null] as const } };
    expect(headlineKi("competitive", fit)).toEqual({ kiUm: 0.8, ci95: [0.6, 1.1] });
    expect(headlineKi("mixed", fit)).toEqual({ kiUm: 0.8, ci95: [0.6, 1.1] });
    expect(headlineKi("noncompetitive", fit)).toEqual({ kiUm: 0.8, ci95: [0.6, 1.1] });
    expect(headlineKi("uncompetitive", fit)).toEqual({ kiUm: 3.2, ci95: [2.5, null] });
  });

  it("gives an open interval when the fit has no CI", () => {
    expect(headlineKi("uncompetitive", { kicUm: null, kiuUm: 1.5 })).toEqual({ kiUm: 1.5, ci95: [null, null] });
    expect(headlineKi("competitive", { kicUm: null, kiuUm: null, ci95: null })).toEqual({
      kiUm: null,
      ci95: [null, null],
    });
  });
});

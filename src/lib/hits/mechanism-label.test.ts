// The label sentences of the hit grid and the digest (common practice: say why a call is not to be
// trusted, in words, beside it). Flag codes are the engine's (src/lib/kinetics/mechanism-judgement.ts).
import { describe, expect, it } from "vitest";
import { mechanismLabelNote } from "./mechanism-label";

describe("mechanismLabelNote", () => {
  it("says why an inadequate call is one, from its flags, in a fixed order, and what to do", () => {
    expect(mechanismLabelNote("inadequate", ["mechanism-inadequate", "partial-inhibition", "inadequate-fit"])).toEqual({
      label: "inadequate",
      why: "Mechanism inadequate: the chosen standard model fails its adequacy checks (lack of fit or residual pattern, p < 0.01); partial inhibition: a model in which the enzyme–inhibitor–substrate complex turns over is recommended. Open the mechanism result before using this Ki.",
    });
    expect(mechanismLabelNote("inadequate", ["mechanism-inadequate"])!.why).toMatch(
      /^Mechanism inadequate: a model other than the standard call is recommended\./,
    );
    expect(mechanismLabelNote("inadequate", ["no-adequate-model"])!.why).toContain("no Ki can be trusted");
  });

  it("an ambiguous call gets its own sentence; clear, override and no call get none", () => {
    expect(mechanismLabelNote("ambiguous", [])!.label).toBe("ambiguous");
    for (const label of ["clear", "override", null]) expect(mechanismLabelNote(label, ["inadequate-fit"])).toBeNull();
  });
});

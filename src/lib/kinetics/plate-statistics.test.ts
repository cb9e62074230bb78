import { describe, expect, it } from "vitest";
import { plateQuality, summarizeControls, zFactor } from "./plate-statistics";
import { percentInhibition, percentActivity } from "./normalization";
import { callHits } from "./hit-calling";

// Worked example of plate quality and normalisation (values computed with SciPy); the Z′
// definition is Zhang, Chung & Oldenburg, J Biomol Screen 1999;4:67–73.
const neutral = [950, 1010, 1040, 980, 1020, 1000];
const full = [90, 110, 95, 105, 100, 100];

describe("plate statistics (Zhang, Chung & Oldenburg 1999 definitions; worked example computed with SciPy)", () => {
  const q = plateQuality(neutral, full);

  it("means, SDs (n − 1) and CVs of each control group", () => {
    expect(q.neutral.mean).toBeCloseTo(1000, 10);
    expect(q.neutral.sd).toBeCloseTo(31.623, 3);
    expect(q.fullInhibition.mean).toBeCloseTo(100, 10);
    expect(q.fullInhibition.sd).toBeCloseTo(7.0711, 4);
    expect(q.neutral.cvPercent).toBeCloseTo(3.16, 2);
    expect(q.fullInhibition.cvPercent).toBeCloseTo(7.07, 2);
  });

  it("Z′ 0.87102, signal window 24.79, S/B 10", () => {
    expect(q.zPrime).toBeCloseTo(0.87102, 5);
    expect(q.signalWindow).toBeCloseTo(24.79, 2);
    expect(q.signalToBackground).toBeCloseTo(10, 10);
  });

  it("a well reading 550 is 50 % inhibition (definition of % inhibition, common practice)", () => {
    expect(percentInhibition(550, 1000, 100)).toBeCloseTo(50, 12);
    expect(percentActivity(550, 1000, 100)).toBeCloseTo(50, 12);
    // rising-signal assays: neutral low, full inhibition high
    expect(percentInhibition(75, 50, 100)).toBeCloseTo(50, 12);
  });

  it("robust variants use median and 1.4826·MAD (common practice)", () => {
    const s = summarizeControls(neutral);
    expect(s.median).toBe(1005);
    expect(s.mad).toBe(20); // |x − 1005| = 55, 5, 35, 25, 15, 5 → median 20
    expect(s.robustSd).toBeCloseTo(29.652, 3);
    expect(q.robustZPrime).toBeGreaterThan(0.8);
    // one wild neutral well barely moves the robust Z′ but wrecks the classical one
    const spoiled = plateQuality([...neutral, 300], full);
    expect(spoiled.zPrime!).toBeLessThan(0.5);
    expect(spoiled.robustZPrime!).toBeGreaterThan(0.8);
  });

  it("Z (samples vs a control) uses the same formula as Z′ (Zhang, Chung & Oldenburg 1999)", () => {
    expect(zFactor(neutral, full)).toBeCloseTo(0.87102, 5);
    expect(zFactor([1], full)).toBeNull();
  });

  it("rejects empty or single-well control groups with a clear message", () => {
    expect(() => plateQuality([1], full)).toThrow(/at least 2 wells/);
    expect(() => summarizeControls([])).toThrow(/no values/);
  });
});

describe("hit calling (common practice: % threshold, mean + 3 SD, median + 3·1.4826·MAD)", () => {
  const controlsPct = neutral.map((x) => percentInhibition(x, 1000, 100));
  it("mean + 3 SD of neutral controls", () => {
    // neutral controls as % inhibition: SD = 31.623/9 = 3.5136 %, mean 0 → threshold 10.54 %
    const r = callHits([5, 10, 11, 60], { kind: "sd", k: 3 }, controlsPct);
    expect(r.threshold).toBeCloseTo((3 * 31.6227766) / 9, 4);
    expect(r.isHit).toEqual([false, false, true, true]);
    expect(r.hitCount).toBe(2);
  });
  it("fixed % threshold and robust rule", () => {
    expect(callHits([29.9, 30, 75], { kind: "percent", thresholdPercent: 30 }).isHit).toEqual([false, true, true]);
    const robust = callHits([12], { kind: "robust", k: 3 }, controlsPct);
    expect(robust.threshold).toBeCloseTo(-0.5555556 + (3 * 1.4826022 * 20) / 9, 4);
  });
});

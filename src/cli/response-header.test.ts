// Common practice: a dose-response file says in its header what the response is; a raw signal
// (OD, RFU) must never be judged against % inhibition thresholds (R datasets::DNase is density).
import { describe, expect, it } from "vitest";
import { responseFromHeader } from "./analyze";

describe("--response=auto reads the response column's unit", () => {
  it("% inhibition, % activity, or a raw signal", () => {
    expect(responseFromHeader("compound,concentration,response (% inhibition)\nA,1,2\n")).toBe("inhibition-pct");
    expect(responseFromHeader("\uFEFFcompound,concentration,response (%)\r\n")).toBe("inhibition-pct");
    expect(responseFromHeader("compound,concentration,Response [% activity]\n")).toBe("activity-pct");
    expect(responseFromHeader("compound,concentration,response\n")).toBe("signal");
    expect(responseFromHeader("compound,concentration,response (OD 450)\n")).toBe("signal");
  });
});

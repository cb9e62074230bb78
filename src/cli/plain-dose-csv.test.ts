// The command's tight reader for plain batch files must give exactly the jobs of the engine's own
// reader (readDoseResponseCsv), and leave every other file to it. The reference is the engine's
// reader itself, which is checked against RFC 4180 in src/lib/csv (common practice: the same
// input read two ways must agree). Data are invented.
import { describe, expect, it } from "vitest";
import { readDoseResponseCsv } from "../lib/kinetics/index";
import { plainDoseJobs, responseFromHeader } from "./analyze";

const engine = (text: string) =>
  readDoseResponseCsv(text, 1, 1).map((s) => ({
    compound: s.compound,
    x: s.concentration,
    y: s.response,
    lines: s.lines,
  }));

describe("the plain-file reader of analyze dose-response", () => {
  it("gives the engine reader's jobs for plain files (column order, units, blank lines, BOM, interleaved compounds)", () => {
    const files = [
      "compound,concentration,response (% inhibition)\nA,10,90\nA,1,50.5\nA,0.1,-3e-1\nB,10,1E2\nB,.5,+4\n",
      "\uFEFFResponse [%],Compound,Concentration (µM)\n80,A,3\n\n   \n20,A,0.3\n70,B,5.\n",
      "concentration,response,compound\n1,2, spaced name \n3,4,other\n5,6, spaced name",
      "compound,concentration,response\nA,0,100\nA,-0,5\nB,1,2\nA,2,3\n",
    ];
    for (const text of files) expect(plainDoseJobs(text)).toEqual(engine(text));
  });

  it("leaves everything else to the engine's reader (quotes, CR, extra or missing columns, bad cells)", () => {
    const head = "compound,concentration,response\n";
    const others = [
      '"compound",concentration,response\nA,1,2\n',
      "compound,concentration,response\r\nA,1,2\r\n",
      "compound,concentration,response,note\nA,1,2,x\n",
      "compound,concentration\nA,1\n",
      "compound,compound,response\nA,1,2\n",
      "\ncompound,concentration,response\nA,1,2\n",
      head,
      head + "A,1\n",
      head + "A,1,2,3\n",
      head + ",1,2\n",
      head + "A, 1,2\n",
      head + "A,1,0x10\n",
      head + "A,1,Infinity\n",
      head + "A,1e999,2\n",
      head + "A,-1,2\n",
      head + "A,1.,.\n",
      head + "A,1,2e\n",
      head + "A,1,\n",
      head + "stray\n",
    ];
    for (const text of others) expect(plainDoseJobs(text)).toBeNull();
  });

  it("reads the response unit from the first non-blank line only", () => {
    expect(responseFromHeader("\n  \ncompound,concentration,response (% activity)\nA,1,2\n")).toBe("activity-pct");
    expect(responseFromHeader("")).toBe("signal");
    expect(responseFromHeader("compound,concentration,response (%)")).toBe("inhibition-pct");
  });
});

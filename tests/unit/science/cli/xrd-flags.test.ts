/**
 * `xrd identify --ka2 auto|yes|no`: argument parsing and the usage text (in process; the identification itself is
 * covered by xrd.test.ts). Whether a scan carries Kα2 is a property of the tube and optics (a primary
 * monochromator removes it, common practice), which is why the analyst can say so.
 */
import { describe, expect, test } from "vitest";
import { CliError, parseArgs, runCli, USAGE } from "@/scripts/xrd";

describe("--ka2 flag", () => {
  test.each([
    [["--ka2", "no"], "no"],
    [["--ka2", "yes"], "yes"],
    [["--ka2", "auto"], "auto"],
    [["--ka2=NO"], "no"],
    [["--ka2=Yes"], "yes"],
  ])("identify scan.xy %j → ka2 %s", (flags, expected) => {
    expect(parseArgs(["identify", "scan.xy", ...flags]).ka2).toBe(expected);
  });
  test("absent flag: left to the default (auto, decided from the peak shapes)", () => {
    expect(parseArgs(["identify", "scan.xy"]).ka2).toBeUndefined();
  });
  test("a value other than auto, yes or no is a usage error naming the value", () => {
    expect(() => parseArgs(["identify", "scan.xy", "--ka2", "maybe"])).toThrow(CliError);
    expect(() => parseArgs(["identify", "scan.xy", "--ka2", "maybe"])).toThrow(/--ka2 "maybe" must be auto, yes or no/);
    expect(() => parseArgs(["identify", "scan.xy", "--ka2"])).toThrow(/--ka2 needs a value/);
  });
  test("only for identify: pattern refuses it", () => {
    expect(() => parseArgs(["pattern", "x.cif", "--ka2", "no"])).toThrow(/unknown option "--ka2" for pattern/);
  });
  test("exit code 2 and a one-line message from runCli; the usage lists the flag", () => {
    const r = runCli(["identify", "scan.xy", "--ka2", "both"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^xrd: --ka2 "both" must be auto, yes or no\n/);
    expect(USAGE).toMatch(/--ka2 auto\|yes\|no/);
  });
});

describe("--standard (Chung 1974 internal standard)", () => {
  test("PHASE:WT names a library phase and the wt% of the spiked specimen", () => {
    expect(parseArgs(["identify", "a.xy", "--standard", "corundum:20"]).standard).toEqual({ referenceId: "corundum", wtPercent: 20 });
    expect(() => parseArgs(["identify", "a.xy", "--standard", "corundum"])).toThrow(CliError);
    expect(() => parseArgs(["identify", "a.xy", "--standard", "unobtainium:20"])).toThrow(/PHASE:WT with a library phase/);
    expect(() => parseArgs(["identify", "a.xy", "--standard", "corundum:100"])).toThrow(/0 < WT < 100/);
  });
});

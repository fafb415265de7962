import { QueryClient } from "@tanstack/react-query";
import { ESLint } from "eslint";
import { describe, expect, it } from "vitest";
import { phaseMapKeys, photoKeys, referenceKeys, sampleKeys, scanKeys, stationKeys } from "@/lib/client/query-keys";

/**
 * The factories are only useful if a prefix reaches every view of a resource and nothing else: checked with
 * TanStack Query's own matcher (QueryClient.invalidateQueries → partial key match), not a re-implementation.
 */
async function invalidated(seed: readonly (readonly unknown[])[], prefix: readonly unknown[]) {
  const qc = new QueryClient();
  for (const k of seed) qc.setQueryData(k, 1);
  await qc.invalidateQueries({ queryKey: prefix });
  return seed.filter((k) => qc.getQueryState(k)?.isInvalidated).map((k) => JSON.stringify(k));
}

describe("query key factories", () => {
  it("sampleKeys.all reaches the register, the map layer and both pickers of that project only", async () => {
    const seed = [
      sampleKeys.register("p1", "page=2"),
      sampleKeys.map("p1", "type=rock"),
      sampleKeys.search("p1", "AB"),
      sampleKeys.picker("p1", ""),
      sampleKeys.register("p2", ""),
      stationKeys.map("p1"),
      photoKeys.owner("p1", { sampleId: "s1" }),
    ];
    expect(await invalidated(seed, sampleKeys.all("p1"))).toEqual(seed.slice(0, 4).map((k) => JSON.stringify(k)));
  });

  it("scanKeys.detail reaches every run and the sign-off history of one scan, not the list or another scan", async () => {
    const seed = [
      scanKeys.run("p1", "a", null),
      scanKeys.run("p1", "a", "run-2"),
      scanKeys.signOffs("p1", "a"),
      scanKeys.run("p1", "b", null),
      scanKeys.list("p1", "", 1),
    ];
    expect(await invalidated(seed, scanKeys.detail("p1", "a"))).toEqual(seed.slice(0, 3).map((k) => JSON.stringify(k)));
  });

  it("a station's photos and a sample's photos with the same id are different queries", () => {
    expect(photoKeys.owner("p", { sampleId: "x" })).not.toEqual(photoKeys.owner("p", { stationId: "x" }));
  });

  it("keys are stable values (same arguments → equal keys, so the cache is hit)", () => {
    expect(referenceKeys.pattern("q", 1.5406, 90)).toEqual(referenceKeys.pattern("q", 1.5406, 90));
    expect(phaseMapKeys.station("p", "ST-1", "a=1")).toEqual(phaseMapKeys.station("p", "ST-1", "a=1"));
  });

  it("eslint refuses an ad-hoc queryKey array in a component", async () => {
    const eslint = new ESLint();
    const [res] = await eslint.lintText('useQuery({ queryKey: ["samples", projectId], queryFn });\n', { filePath: "components/x/example.tsx" });
    expect(res.messages.map((m) => m.ruleId)).toContain("no-restricted-syntax");
  }, 60_000);
});

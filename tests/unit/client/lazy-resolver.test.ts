import { ESLint } from "eslint";
import { describe, expect, it, vi } from "vitest";
import type { ResolverOptions } from "react-hook-form";
import { lazyZodResolver } from "@/lib/client/lazy-resolver";

type Values = Record<string, unknown>;
const options = { fields: {}, shouldUseNativeValidation: false } as ResolverOptions<Values>;
const loadStructureSchema = () => import("@/lib/validation/structure").then((m) => m.structureCreateSchema);

describe("lazyZodResolver: the server's schema, loaded on the first check", () => {
  it("passes a valid plane through the real structure schema (with its defaults applied)", async () => {
    const resolver = lazyZodResolver<Values>(loadStructureSchema);
    const result = await resolver({ convention: "rhr", feature: "bedding", strike: 120, dip: 35 }, undefined, options);
    expect(result.errors).toEqual({});
    expect(result.values).toMatchObject({ convention: "rhr", kind: "planar", strike: 120, dip: 35, azimuthRef: "true" });
  });

  it("reports the schema's message on the field that is wrong", async () => {
    const resolver = lazyZodResolver<Values>(loadStructureSchema);
    const result = await resolver({ convention: "rhr", feature: "bedding", strike: 120, dip: 95 }, undefined, options);
    expect(result.values).toEqual({});
    expect(result.errors.dip?.message).toBe("Dip must be between 0 and 90°.");
    expect(result.errors.strike).toBeUndefined();
  });

  it("checks the prepared body, not the raw form values", async () => {
    const resolver = lazyZodResolver<Values>(loadStructureSchema, (v) => ({ ...v, dip: Number(v.dipText) }));
    const result = await resolver({ convention: "rhr", feature: "joint", strike: 10, dipText: "not a number" }, undefined, options);
    expect(result.errors.dip?.message).toBe("Dip must be a number (degrees).");
  });

  it("loads the schema once for many checks", async () => {
    const load = vi.fn(loadStructureSchema);
    const resolver = lazyZodResolver<Values>(load);
    for (const dip of [10, 20, 30]) await resolver({ convention: "rhr", feature: "vein", strike: 0, dip }, undefined, options);
    expect(load).toHaveBeenCalledTimes(1);
  });

  it("tries the load again after a failed one (a chunk that could not be fetched)", async () => {
    const load = vi.fn(loadStructureSchema).mockRejectedValueOnce(new Error("chunk load failed"));
    const resolver = lazyZodResolver<Values>(load);
    await expect(resolver({ convention: "rhr", feature: "vein", strike: 0, dip: 5 }, undefined, options)).rejects.toThrow("chunk load failed");
    const again = await resolver({ convention: "rhr", feature: "vein", strike: 0, dip: 5 }, undefined, options);
    expect(again.errors).toEqual({});
    expect(load).toHaveBeenCalledTimes(2);
  });
});

describe("components stay zod-free (eslint)", () => {
  const restricted = async (code: string) => {
    const [res] = await new ESLint().lintText(code, { filePath: "components/x/example.tsx" });
    return res.messages.filter((m) => m.ruleId === "no-restricted-imports").length;
  };

  it("refuses a value import of a schema module or of zod in a component", async () => {
    expect(await restricted('import { sampleCreateSchema } from "@/lib/validation/sample";\nexport const s = sampleCreateSchema;\n')).toBe(1);
    expect(await restricted('import { z } from "zod";\nexport const s = z.string();\n')).toBe(1);
  }, 60_000);

  it("allows a type import and an on-demand import()", async () => {
    expect(await restricted('import type { SampleDetails } from "@/lib/validation/sample-details";\nexport type D = SampleDetails;\n')).toBe(0);
    expect(await restricted('export const load = () => import("@/lib/validation/sample");\n')).toBe(0);
  }, 60_000);
});

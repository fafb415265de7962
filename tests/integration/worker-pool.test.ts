/**
 * The worker pool keeps the request thread free (issue 12): while a hostile job spins a worker's CPU, /api/health
 * answers in under 100 ms; a job past its time or memory limit fails with a 422 naming the limit.
 */
import { afterAll, describe, expect, test } from "vitest";
import { GET as health } from "@/app/api/health/route";
import { closeWorkerPools, JobLimitError, runJob, TaskError } from "@/lib/workers/pool";
import { errorResponse } from "@/lib/api/handler";

afterAll(() => closeWorkerPools());

describe("worker pool limits", () => {
  test("a job spinning past its time limit is stopped with a 422 naming the limit", async () => {
    const started = Date.now();
    const err = await runJob("hostile", { spinMs: 60_000 }, { timeoutMs: 1500 }, "The hostile job").catch((e: unknown) => e);
    expect(err).toBeInstanceOf(JobLimitError);
    expect((err as JobLimitError).limit).toBe("time");
    expect((err as Error).message).toMatch(/did not finish within 1\.5 s \(the time limit/);
    expect(Date.now() - started).toBeLessThan(10_000);
    const res = errorResponse(err);
    expect(res.status).toBe(422);
  });

  test("a job growing its heap past the memory limit is stopped with a 422 naming the limit", async () => {
    const err = await runJob("hostile", { allocateMb: 4000 }, { timeoutMs: 60_000, maxMemoryMb: 64 }, "The hostile job").catch((e: unknown) => e);
    expect(err).toBeInstanceOf(JobLimitError);
    expect((err as JobLimitError).limit).toBe("memory");
    expect((err as Error).message).toMatch(/more than 64 MiB/);
  });

  test("an error thrown by a task arrives with its name, code and line (a CIF with no data block)", async () => {
    const err = await runJob("cif-pattern", { cifText: "# a comment only\n", wavelength: 1.54, twoThetaMax: 90, minIntensity: 0 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TaskError);
    expect((err as TaskError).remoteName).toBe("CifError");
    expect((err as TaskError).code).toBe("no-data-block");
  });

  test("the pool still runs jobs after a worker was terminated", async () => {
    expect(await runJob<{ spunMs: number }>("hostile", { spinMs: 10 })).toMatchObject({ allocatedMb: 0 });
  });
});

describe("/api/health while a hostile job runs", () => {
  test("answers in < 100 ms, every time, while a worker spins for 4 s", async () => {
    await health(); // open the database once
    const job = runJob("hostile", { spinMs: 4000 }, { timeoutMs: 20_000 }).catch(() => null);
    await new Promise((r) => setTimeout(r, 500)); // the worker is started and spinning
    const times: number[] = [];
    for (let i = 0; i < 20; i++) {
      const t = performance.now();
      const res = await health();
      times.push(performance.now() - t);
      expect(res.status).toBe(200);
      await new Promise((r) => setTimeout(r, 100));
    }
    await job;
    const worst = Math.max(...times);
    console.log(`health latency under a hostile job: median ${times.sort((a, b) => a - b)[10].toFixed(1)} ms, worst ${worst.toFixed(1)} ms`);
    expect(worst).toBeLessThan(100);
  }, 30_000);
});

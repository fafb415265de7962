import type { z } from "zod";
import { fieldErrors } from "@/lib/validation/common";
import { AppError } from "./errors";

/** Parses input with a schema after the access check; failures are 422 with per-field messages. */
export function validateInput<T extends z.ZodType>(schema: T, input: unknown): z.infer<T> {
  const parsed = schema.safeParse(input);
  if (!parsed.success) throw new AppError("validation_failed", "Some fields are not valid.", fieldErrors(parsed.error));
  return parsed.data;
}

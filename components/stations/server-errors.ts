import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { ApiError } from "@/lib/client/fetch-json";

/**
 * Puts the API's per-field messages on the form's fields; returns the messages no field shows
 * (to print above the buttons) so nothing the server said is lost.
 */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, known: readonly string[]): string[] {
  if (!(err instanceof ApiError)) return [(err as Error)?.message ?? "Something went wrong."];
  const rest: string[] = [];
  for (const [key, messages] of Object.entries(err.fields ?? {})) {
    const top = key.split(".")[0];
    if (known.includes(top)) setError(key as Path<T>, { type: "server", message: messages.join(" ") });
    else rest.push(`${key}: ${messages.join(" ")}`);
  }
  if (err.status === 409 && typeof err.details?.field === "string" && known.includes(err.details.field)) {
    setError(err.details.field as Path<T>, { type: "server", message: err.message });
  } else if (!err.fields || rest.length) rest.unshift(err.message);
  return rest;
}

/** react-hook-form's setValueAs for optional numbers: "" → null, otherwise Number (NaN is left for zod to reject). */
export const asNumber = (v: unknown): number | null => (v === "" || v === null || v === undefined ? null : typeof v === "number" ? v : Number(v));

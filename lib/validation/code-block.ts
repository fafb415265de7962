import { z } from "zod";
import { CODE_BLOCK_DEFAULT_SIZE, CODE_BLOCK_MAX_SIZE, CODE_BLOCK_MIN_SIZE } from "@/lib/outbox/code-block-math";

/** A device id: 8–100 printable characters without spaces (a UUID fits). */
export const deviceId = z
  .string({ error: "deviceId is required: the id this device made for itself." })
  .trim()
  .regex(/^[\x21-\x7e]{8,100}$/, "deviceId must be 8–100 printable characters without spaces (a UUID works).");

export const codeBlockReserveSchema = z
  .object({
    deviceId,
    deviceLabel: z.string().trim().max(80, "Keep the device name to 80 characters.").nullable().optional(),
    size: z
      .number({ error: "size must be a whole number of codes." })
      .int("size must be a whole number of codes.")
      .min(CODE_BLOCK_MIN_SIZE, `Reserve at least ${CODE_BLOCK_MIN_SIZE} codes.`)
      .max(CODE_BLOCK_MAX_SIZE, `Reserve at most ${CODE_BLOCK_MAX_SIZE} codes at a time.`)
      .default(CODE_BLOCK_DEFAULT_SIZE),
  })
  .strict();

export type CodeBlockReserveInput = z.infer<typeof codeBlockReserveSchema>;

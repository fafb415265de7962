import { z } from "zod";

/** Header naming the device a request comes from (the id the device made for itself, kept on it). */
export const DEVICE_HEADER = "lithodex-device";

/** Codes in one block: enough for a field day without signal, few enough not to leave long gaps (common practice). */
export const CODE_BLOCK_DEFAULT_SIZE = 20;
export const CODE_BLOCK_MIN_SIZE = 5;
export const CODE_BLOCK_MAX_SIZE = 100;
/** Unused reserved codes one device may hold in a project; another block is refused past this. */
export const CODE_BLOCK_MAX_UNUSED = 200;

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

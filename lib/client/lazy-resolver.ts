import type { FieldValues, Resolver } from "react-hook-form";
import type { ZodType } from "zod";

/**
 * A react-hook-form resolver that loads zod and the schema on the first validation instead of with the page
 * (zod alone is about 31 kB gzip of first-load JavaScript). The service worker precaches every built chunk, so
 * this works offline too. `prepare` turns the form's values into the body the schema checks — the same body the
 * server receives — so client and server report the same errors.
 */
export function lazyZodResolver<T extends FieldValues>(loadSchema: () => Promise<ZodType>, prepare: (values: T) => unknown = (values) => values): Resolver<T> {
  let inner: Promise<Resolver<T>> | undefined;
  return async (values, context, options) => {
    inner ??= Promise.all([import("@hookform/resolvers/zod"), loadSchema()])
      .then(([{ zodResolver }, schema]) => zodResolver(schema as never) as unknown as Resolver<T>)
      .catch((error: unknown) => {
        inner = undefined; // a failed chunk load is retried on the next validation
        throw error;
      });
    return (await inner)(prepare(values) as T, context, options);
  };
}

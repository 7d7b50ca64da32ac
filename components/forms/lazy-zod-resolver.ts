"use client";

import { useEffect, useState } from "react";
import type { FieldValues, Resolver } from "react-hook-form";
import type { z } from "zod";

/** Loads a schema from lib/validation, e.g. `() => import("@/lib/validation/owner").then((m) => m.careLogSchema)`. */
export type SchemaLoader<S extends z.ZodType> = () => Promise<S>;

/**
 * A react-hook-form resolver for a zod schema loaded on first use. The schema module, and zod with it
 * (about 46 kB gzip), stays out of the page's first-load JavaScript; the form starts loading it as
 * soon as it mounts, so it is there by the time anyone has typed. If it cannot load, the form is sent
 * unchecked and the server action's own parse of the same schema answers instead.
 */
export function useLazyZodResolver<S extends z.ZodType, TIn extends FieldValues = z.input<S> & FieldValues, TOut = z.output<S>>(load: SchemaLoader<S>): Resolver<TIn, unknown, TOut> {
  const [state] = useState(() => {
    let ready: Promise<Resolver<TIn, unknown, TOut> | null> | undefined;
    const get = () =>
      (ready ??= Promise.all([load(), import("@hookform/resolvers/zod"), import("@/lib/validation/words")]).then(
        ([schema, { zodResolver }, { inWords }]) => zodResolver(schema as never, { error: inWords }) as unknown as Resolver<TIn, unknown, TOut>,
        () => null,
      ));
    const resolver: Resolver<TIn, unknown, TOut> = async (values, context, options) => {
      const r = await get();
      return r ? r(values, context, options) : { values: values as unknown as TOut, errors: {} };
    };
    return { get, resolver };
  });
  useEffect(() => {
    void state.get();
  }, [state]);
  return state.resolver;
}

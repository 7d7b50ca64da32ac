// PATCH schemas: any subset of a schema's fields, where a field that is not sent stays absent (and
// keeps its stored value). zod applies a field's .default() even inside .partial(), so a PATCH built
// with schema.partial() would fill every omitted field with its default and erase what was stored.
import { z } from "zod";

/** The shape without its defaults, so a PATCH's absent fields stay absent. */
type NoDefaults<T extends z.ZodRawShape> = { [K in keyof T]: T[K] extends z.ZodDefault<infer I> ? I : T[K] };
export function withoutDefaults<T extends z.ZodRawShape>(shape: T): NoDefaults<T> {
  return Object.fromEntries(Object.entries(shape).map(([k, v]) => [k, v instanceof z.ZodDefault ? v.unwrap() : v])) as NoDefaults<T>;
}

/** Every field optional and none defaulted: the schema of a PATCH of `schema`. */
export function patchOf<T extends z.ZodRawShape>(schema: z.ZodObject<T>) {
  return z.object(withoutDefaults(schema.shape)).partial();
}

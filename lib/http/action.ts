import "server-only";
import { redirect } from "next/navigation";
import { z } from "zod";
import { requireActor, type ActorFor, type ActorRole } from "@/lib/auth/actor";
import type { FieldErrors } from "@/lib/errors";
import type { ActionResult } from "@/lib/validation/action";
import { asAppError } from "@/lib/validation/care-input";
import { inWords } from "@/lib/validation/words";

// The one boundary of server actions, the twin of route() (lib/http/route.ts): an action names who
// may call it and its input's zod schema (the one its form uses) as data; the wrapper resolves the
// actor, parses once, and turns every refusal into a result the form shows beside its fields.
// Next.js has already checked the request's origin (next.config.mjs: APP_URL and ALLOWED_ORIGINS).
//
//   export const saveProfileAction = action({ roles: ["admin"], schema: profileSchema }, (input, actor) =>
//     updateStudioProfile(actor, input));
//
// A plain <form action> (a mailed link's token form, sign-out) works without JavaScript, so it can show
// no result: it names `refused`, the page a refusal goes to, and its action ends in a redirect.
//
//   export const confirmSignOffAction = action({ schema: signOffSchema, refused: "/visit-sign-off?failed=1" }, ...);

export type { ActionResult };

type Out<S> = S extends z.ZodType ? z.output<S> : undefined;
/** What the form sends: the schema's input, or a FormData (read as an object of its last values). */
type In<S> = S extends z.ZodType ? z.input<S> | FormData : void | FormData;

export type ActionSpec<R extends ActorRole, S> = {
  /** Who may call: studio roles and/or "owner" (every signed-in person). Omitted: anyone (sign-in, sign-up). */
  roles?: readonly R[];
  schema?: S;
};

/** A <form action> posted without JavaScript: a refusal (bad input, no access, an AppError) redirects to `refused`. */
export type FormActionSpec<R extends ActorRole, S> = ActionSpec<R, S> & { refused: string };

type ActionFn<R extends ActorRole, S, T> = (input: Out<S>, actor: [R] extends [never] ? null : ActorFor<R>) => Promise<T | ActionResult<T>> | T | ActionResult<T>;

export function action<R extends ActorRole = never, S extends z.ZodType | undefined = undefined>(
  spec: FormActionSpec<R, S>,
  fn: ActionFn<R, S, void>,
): (data: FormData) => Promise<void>;
export function action<R extends ActorRole = never, S extends z.ZodType | undefined = undefined, T = undefined>(
  spec: ActionSpec<R, S>,
  fn: ActionFn<R, S, T>,
): (raw: In<S>) => Promise<ActionResult<T>>;
export function action<R extends ActorRole, S extends z.ZodType | undefined, T>(spec: ActionSpec<R, S> & { refused?: string }, fn: ActionFn<R, S, T>) {
  const run = answer(spec, fn);
  const refused = spec.refused;
  if (refused === undefined) return run;
  return async (data: FormData): Promise<void> => {
    if (!(await run(data as In<S>)).ok) redirect(refused);
  };
}

function answer<R extends ActorRole, S extends z.ZodType | undefined, T>(spec: ActionSpec<R, S>, fn: ActionFn<R, S, T>) {
  return async (raw: In<S>): Promise<ActionResult<T>> => {
    try {
      const actor = (spec.roles ? await requireActor(spec.roles) : null) as [R] extends [never] ? null : ActorFor<R>;
      let input: Out<S> = undefined as Out<S>;
      if (spec.schema) {
        const parsed = spec.schema.safeParse(raw instanceof FormData ? Object.fromEntries(raw) : raw, { error: inWords });
        if (!parsed.success) return fieldProblems(parsed.error);
        input = parsed.data as Out<S>;
      }
      const out = await fn(input, actor);
      if (out && typeof out === "object" && "ok" in out) return out as ActionResult<T>;
      return { ok: true, data: out as T };
    } catch (e) {
      if (isNextControlFlow(e)) throw e;
      const known = asAppError(e);
      if (known) return { ok: false, message: known.message, fieldErrors: known.fieldErrors };
      console.error(e);
      return { ok: false, message: "Something went wrong on our side. Please try again in a moment." };
    }
  };
}

function fieldProblems(error: z.ZodError): ActionResult<never> {
  const { fieldErrors, formErrors } = z.flattenError(error);
  return { ok: false, message: formErrors[0] ?? "Some fields need a second look.", fieldErrors: fieldErrors as FieldErrors };
}

function isNextControlFlow(e: unknown): boolean {
  // redirect() and notFound() throw errors Next.js must see.
  const digest = (e as { digest?: unknown } | null)?.digest;
  return typeof digest === "string" && (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR"));
}


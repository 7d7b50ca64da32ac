"use client";

import { useState } from "react";
import { useForm, type DefaultValues, type FieldValues, type Path } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import type { ActionResult } from "@/lib/validation/action";
import { useLazyZodResolver, type SchemaLoader } from "./lazy-zod-resolver";

/**
 * A react-hook-form form checked on the client by the same zod schema the server action parses
 * with (loaded when the form mounts, see useLazyZodResolver); the server's field errors land next to
 * their fields, and nothing typed is lost.
 */
export function useActionForm<S extends z.ZodType<FieldValues, FieldValues>, T>({
  schema,
  action,
  defaultValues,
  onSuccess,
  successMessage,
}: {
  schema: SchemaLoader<S>;
  action: (values: z.input<S>) => Promise<ActionResult<T>>;
  defaultValues?: DefaultValues<z.input<S>>;
  onSuccess?: (data: T) => void;
  successMessage?: string;
}) {
  const form = useForm<z.input<S>, unknown, z.output<S>>({
    resolver: useLazyZodResolver<S, z.input<S>, z.output<S>>(schema),
    defaultValues,
    // Checked when the person presses the button, then again as they fix each field. Not on leaving a
    // field: an error line appearing above the button as the press blurs the field moves the button
    // away from the pointer, and the press does nothing (components/claims/claim-form.tsx chose the same).
    mode: "onSubmit",
    reValidateMode: "onChange",
  });
  const [formError, setFormError] = useState<string | null>(null);

  const submit = form.handleSubmit(async (values) => {
    const result = await action(values as z.input<S>);
    if (!result) return; // the action redirected
    if (result.ok) {
      const message = result.message ?? successMessage;
      if (message) toast.success(message);
      onSuccess?.(result.data);
      return;
    }
    setFormError(result.message);
    for (const [field, messages] of Object.entries(result.fieldErrors ?? {})) {
      if (messages?.[0]) form.setError(field as Path<z.input<S>>, { type: "server", message: messages[0] });
    }
  });

  // The last refusal goes at every press, also one the client's own checks stop: it stayed above the form
  // ("That isn't your current password.") while the person fixed something else it no longer applied to.
  const onSubmit: typeof submit = (e) => {
    setFormError(null);
    return submit(e);
  };

  return { form, onSubmit, formError };
}

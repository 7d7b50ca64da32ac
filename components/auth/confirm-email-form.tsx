"use client";

import { useEffect, useRef } from "react";
import { useFormStatus } from "react-dom";
import { Button } from "@/components/ui/button";

/**
 * Sends the confirmation as a POST as soon as the page has loaded in a browser; the button does the
 * same without JavaScript, or if the automatic send did not go through.
 */
export function ConfirmEmailForm({ action, token, next }: { action: (data: FormData) => Promise<void>; token: string; next?: string }) {
  const form = useRef<HTMLFormElement>(null);
  const sent = useRef(false);
  useEffect(() => {
    if (sent.current) return;
    sent.current = true;
    form.current?.requestSubmit();
  }, []);
  return (
    <form ref={form} action={action} className="space-y-3">
      <input type="hidden" name="token" value={token} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
      <SubmitButton />
    </form>
  );
}

function SubmitButton() {
  const { pending } = useFormStatus();
  return (
    <Button type="submit" className="w-full" disabled={pending}>
      {pending ? "Confirming…" : "Confirm my e-mail address"}
    </Button>
  );
}

"use client";

import { useFormStatus } from "react-dom";
import { Button } from "@/components/ui/button";

/** The owner's sign-off: a POST of the link's token, sent only when they press the button. */
export function SignOffForm({ action, token }: { action: (data: FormData) => Promise<void>; token: string }) {
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="token" value={token} />
      <SubmitButton />
    </form>
  );
}

function SubmitButton() {
  const { pending } = useFormStatus();
  return (
    <Button type="submit" className="w-full" disabled={pending}>
      {pending ? "Signing off…" : "I've checked the work: sign it off"}
    </Button>
  );
}

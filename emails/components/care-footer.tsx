import { Link } from "@react-email/components";
import { accentColor } from "./theme";

/** Footer of care mail: why the owner gets it, their preferences, and what still comes after unsubscribing. */
export function CareFooter({ studioName, preferencesUrl, unsubscribeUrl }: { studioName: string; preferencesUrl: string; unsubscribeUrl: string }) {
  return (
    <>
      You get care reminders because you registered a piece made by {studioName}.{" "}
      <Link href={preferencesUrl} style={{ color: accentColor() }}>
        Change your e-mail preferences
      </Link>{" "}
      or{" "}
      <Link href={unsubscribeUrl} style={{ color: accentColor() }}>
        unsubscribe from care reminders
      </Link>
      . Mail about your own claims, payments and visits still comes.
    </>
  );
}

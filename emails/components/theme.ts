// The look of every Grainward e-mail: a calm, paper-like surface, ink-dark text, one accent colour
// (the studio's own when the message is sent for a studio: ./brand.ts).
import { emailBrand } from "./brand";

export const colors = {
  paper: "#faf7f2",
  card: "#ffffff",
  ink: "#1f2328",
  muted: "#5b6169",
  rule: "#e6dfd3",
  accent: "#0f5e5e",
  onAccent: "#ffffff",
} as const;

export const fontStack =
  '-apple-system, BlinkMacSystemFont, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif';
export const serifStack = 'Georgia, "Times New Roman", serif';

/** The accent of the message being rendered: the studio's, else Grainward's own. */
export function accentColor(): string {
  return emailBrand()?.accent ?? colors.accent;
}

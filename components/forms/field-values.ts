// What a form field's text becomes before the zod schema sees it (react-hook-form `setValueAs`).

/** Empty input → null, else a number (NaN stays NaN so zod reports it); a decimal comma is read as a point. */
export const numberOrNull = (v: unknown) => (v === "" || v == null ? null : typeof v === "number" ? v : Number(String(v).replace(",", ".")));
/** Empty input → null, anything else as typed. */
export const emptyToNull = (v: unknown) => (v === "" || v == null ? null : v);

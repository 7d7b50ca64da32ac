import type { z } from "zod";
import { formatCount } from "@/lib/format";

const count = (n: number | bigint) => formatCount(Number(n));
const plural = (n: number | bigint, one: string, many: string) => `${count(n)} ${Number(n) === 1 ? one : many}`;

const TYPES: Record<string, string> = {
  number: "Enter a number.",
  int: "Enter a whole number.",
  bigint: "Enter a whole number.",
  string: "Enter some text.",
  boolean: "Choose yes or no.",
  array: "Give a list of values.",
  object: "Give the fields as an object.",
  date: "Enter a date.",
};

const FORMATS: Record<string, string> = {
  email: "Enter an e-mail address, like name@example.com.",
  url: "Enter a web address, like https://example.com.",
  uuid: "That is not an id we know.",
  guid: "That is not an id we know.",
  date: "Enter a date as YYYY-MM-DD.",
  datetime: "Enter a date and time.",
  time: "Enter a time as HH:MM.",
};

/** At most this many allowed values are listed in a message; past it the message says to choose from the list. */
const LISTED_VALUES = 12;

/**
 * Words for the checks a schema gives no words of its own: zod's built-in English ("Too big: expected
 * number to be <=100", "Invalid option: expected one of …") is written for programmers. Every schema
 * parse at a boundary passes this as its error map (lib/http/route.ts, lib/http/action.ts, the forms'
 * resolver in components/forms/lazy-zod-resolver.ts); a message written on the schema still wins.
 */
export const inWords: z.core.$ZodErrorMap = (issue) => {
  switch (issue.code) {
    case "invalid_type":
      return issue.input === undefined ? "This is required." : (TYPES[issue.expected] ?? "This is not the right kind of value.");
    case "invalid_value": {
      const values = issue.values.map(String);
      return values.length === 1 ? `Use ${values[0]}.` : values.length <= LISTED_VALUES ? `Choose one of: ${values.join(", ")}.` : "Choose one of the listed values.";
    }
    case "too_big": {
      const max = issue.maximum as number | bigint;
      if (issue.origin === "string") return `At most ${plural(max, "character", "characters")}.`;
      if (issue.origin === "array" || issue.origin === "set") return `At most ${plural(max, "item", "items")}.`;
      if (issue.origin === "file") return `At most ${count(max)} bytes.`;
      return issue.inclusive === false ? `Less than ${count(max)}.` : `At most ${count(max)}.`;
    }
    case "too_small": {
      const min = issue.minimum as number | bigint;
      if (issue.origin === "string") return Number(min) <= 1 ? "Fill this in." : `At least ${plural(min, "character", "characters")}.`;
      if (issue.origin === "array" || issue.origin === "set") return `At least ${plural(min, "item", "items")}.`;
      if (issue.origin === "file") return `At least ${count(min)} bytes.`;
      return issue.inclusive === false ? `More than ${count(min)}.` : `At least ${count(min)}.`;
    }
    case "invalid_format":
      return FORMATS[issue.format] ?? "Check the format.";
    case "not_multiple_of":
      return `Use a multiple of ${count(issue.divisor as number)}.`;
    case "unrecognized_keys":
      return `${issue.keys.length === 1 ? "Unknown field" : "Unknown fields"}: ${issue.keys.join(", ")}.`;
    default:
      return "Check this value.";
  }
};

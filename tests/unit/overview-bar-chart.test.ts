// A chart with nothing but zeros (every chart on a new studio's overview) is replaced by words; any
// non-zero value, negative included (a month of refunds), still draws.
import { describe, expect, it } from "vitest";
import { hasBars } from "@/components/overview/bar-chart";

const series = [
  { key: "sent", name: "Sent" },
  { key: "acted", name: "Care logged" },
];

describe("hasBars", () => {
  it("is false for no rows, all zeros, and missing values", () => {
    expect(hasBars([], series)).toBe(false);
    expect(hasBars([{ label: "14 days before", sent: 0, acted: 0 }, { label: "On the due date", sent: 0 }], series)).toBe(false);
  });

  it("is true as soon as one value of one series is not zero", () => {
    expect(hasBars([{ label: "14 days before", sent: 0, acted: 0 }, { label: "On the due date", sent: 0, acted: 1 }], series)).toBe(true);
    expect(hasBars([{ label: "Mar 2026", net: -4500 }], [{ key: "net", name: "Net revenue" }])).toBe(true);
  });
});

// Proposing a quote's lines again keeps staff's edited quantity and price on a line whose ref is proposed
// again, and marks a line changed only where the proposal changed it (lib/repairs/repropose.ts). Hours:
// re-wax 0.25 h + 0.5 h/m², quarter hours rounded up (lib/care/quote DEFAULT_LABOUR, invented for the demo —
// common practice, no published source); the top 1.05 m² → 1 h, a base of 0.5574 m² → 0.75 h.
import { describe, expect, it } from "vitest";
import type { LineDraft } from "@/lib/repairs/lines";
import { editedByStaff, reproposeLines } from "@/lib/repairs/repropose";

const labour = (ref: string, description: string, quantity: number): LineDraft => ({ kind: "labour", source: "labour_rate", ref, description, quantity, unit: "h", unitPriceMinor: 8500 });
const wax = (quantity: number): LineDraft => ({ kind: "materials", source: "catalog", ref: "product:wax:200", description: "Clear paste wax, 200 mL", quantity, unit: "container", unitPriceMinor: 1600 });

describe("proposing again over the lines a quote has", () => {
  // Staff changed the top's 1 h to 1.5 h and the wax's price; the travel line is as proposed; a typed line.
  const before = [
    { ...labour("task:rewax", "Re-wax — labour", 1.5), proposed: { quantity: 1, unitPriceMinor: 8500 } },
    { ...wax(1), unitPriceMinor: 1400, proposed: { quantity: 1, unitPriceMinor: 1600 } },
    { kind: "travel" as const, source: "price_list" as const, ref: "travel", description: "Travel", quantity: 1, unit: "trip" as const, unitPriceMinor: 4000, proposed: { quantity: 1, unitPriceMinor: 4000 } },
    { kind: "other" as const, source: "typed" as const, description: "Carry the desk (invented)", quantity: 1, unit: "each" as const, unitPriceMinor: 2000, proposed: null },
  ];

  it("the base ticked: the top keeps staff's 1.5 h, the wax its price, the base's 0.75 h is new; travel is the same", () => {
    // The proposal with the base: the top's line named for it, the base's own line, the wax now two tins.
    const proposal = [labour("task:rewax", "Re-wax — top", 1), labour("task:rewax:base", "Re-wax — base", 0.75), wax(2), { ...before[2]!, proposed: undefined }];
    const out = reproposeLines(before, proposal);
    expect(out.map((r) => [r.line.ref, r.line.description, r.line.quantity, r.line.unitPriceMinor, r.was])).toEqual([
      // Before this change the top went back to the proposal's 1 h and the wax to $16.00.
      ["task:rewax", "Re-wax — top", 1.5, 8500, "kept"],
      ["task:rewax:base", "Re-wax — base", 0.75, 8500, "new"],
      ["product:wax:200", "Clear paste wax, 200 mL", 1, 1400, "kept"],
      ["travel", "Travel", 1, 4000, "same"],
    ]);
  });

  it("a line staff left as proposed takes the new proposal and is marked changed, with what it was", () => {
    const asProposed = [{ ...labour("task:rewax", "Re-wax — labour", 1), proposed: { quantity: 1, unitPriceMinor: 8500 } }];
    const [top] = reproposeLines(asProposed, [labour("task:rewax", "Re-wax — labour", 1.25)]);
    expect([top!.line.quantity, top!.was, top!.before?.quantity]).toEqual([1.25, "changed", 1]);
    const [same] = reproposeLines(asProposed, [labour("task:rewax", "Re-wax — labour", 1)]);
    expect(same!.was).toBe("same");
  });

  it("a typed line never lends its quantity to a proposed line of the same ref, and work no longer proposed goes", () => {
    const typed = [{ ...labour("task:rewax", "Typed hours", 3), source: "typed" as const, proposed: null }];
    expect(reproposeLines(typed, [labour("task:rewax", "Re-wax — labour", 1)]).map((r) => [r.line.quantity, r.was])).toEqual([[1, "new"]]);
    expect(reproposeLines(before, [])).toEqual([]);
    expect(editedByStaff(before[0]!)).toBe(true);
    expect(editedByStaff(before[2]!)).toBe(false);
    expect(editedByStaff(before[3]!)).toBe(false);
  });
});

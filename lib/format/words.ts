/** Items in an English sentence: "a", "a and b", "a, b and c" (no serial comma, as the product's words write it). */
export function formatAndList(items: readonly string[]): string {
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}

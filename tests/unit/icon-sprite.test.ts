import fs from "node:fs";
import path from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";
import { SPRITE_FILE, spriteSvg } from "@/scripts/icon-sprite";
import { SPRITE_ICONS } from "@/components/ui/sprite-names";

const root = path.resolve(import.meta.dirname, "../..");

/** The ids of the committed sprite's symbols. */
function committedSymbols(): string[] {
  return [...fs.readFileSync(SPRITE_FILE, "utf8").matchAll(/<symbol id="([a-z0-9-]+)"/g)].map((m) => m[1]!);
}

type Named = { name: string; at: string };

/**
 * The icon names a source file gives components/ui/sprite-icon.tsx, read from its syntax: the literal
 * `name` of a <SpriteIcon> (or each side of a choice, `a ? "x" : "y"`), an `icon="…"` attribute, and the
 * literals of a declaration typed with SpriteIconName: `x: SpriteIconName = …`, the `icon` fields of
 * `{ icon: SpriteIconName; … }` look-up tables (also through a local type naming it), and the values of a
 * `Record<…, SpriteIconName>`. A
 * <SpriteIcon name={look.icon}> reads one of those tables; `dynamic` counts them.
 */
function iconNamesIn(fileName: string, text: string): { names: Named[]; dynamic: number } {
  const file = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true, fileName.endsWith(".tsx") ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
  const names: Named[] = [];
  let dynamic = 0;
  const at = (node: ts.Node) => `${fileName}:${file.getLineAndCharacterOfPosition(node.getStart(file)).line + 1}`;
  /** The literal names an expression can take; false when it is not made of literals. */
  const literals = (e: ts.Expression): boolean => {
    if (ts.isStringLiteral(e) || ts.isNoSubstitutionTemplateLiteral(e)) return names.push({ name: e.text, at: at(e) }) > 0;
    if (ts.isParenthesizedExpression(e) || ts.isAsExpression(e) || ts.isSatisfiesExpression(e)) return literals(e.expression);
    if (ts.isConditionalExpression(e)) return [literals(e.whenTrue), literals(e.whenFalse)].every(Boolean);
    return false;
  };
  /** The `icon` fields (or, for a Record of names, every value) of the object literals in a typed initializer. */
  const tables = (e: ts.Expression, recordOfNames: boolean) => {
    const visit = (n: ts.Node): void => {
      if (ts.isObjectLiteralExpression(n)) {
        for (const p of n.properties) {
          if (!ts.isPropertyAssignment(p)) continue;
          if ((recordOfNames && p.parent === top) || (ts.isIdentifier(p.name) && p.name.text === "icon")) literals(p.initializer);
          else visit(p.initializer);
        }
      } else ts.forEachChild(n, visit);
    };
    const top = ts.isObjectLiteralExpression(e) ? e : undefined;
    visit(e);
  };
  // Local types that hold a name (`type Badge = { icon: SpriteIconName; … }`) type a table as well.
  const holders = ["SpriteIconName"];
  for (const s of file.statements) {
    if ((ts.isTypeAliasDeclaration(s) || ts.isInterfaceDeclaration(s)) && /\bSpriteIconName\b/.test(s.getText(file))) holders.push(s.name.text);
  }
  const holds = new RegExp(`\\b(${holders.join("|")})\\b`);
  const typed = (type: ts.TypeNode | undefined, init: ts.Expression | undefined) => {
    if (!type || !init || !holds.test(type.getText(file))) return;
    if (type.getText(file) === "SpriteIconName") literals(init);
    else tables(ts.isAsExpression(init) || ts.isSatisfiesExpression(init) ? init.expression : init, /^Record<[\s\S]+,\s*SpriteIconName>$/.test(type.getText(file)));
  };
  const walk = (n: ts.Node): void => {
    if ((ts.isJsxSelfClosingElement(n) || ts.isJsxOpeningElement(n)) && n.tagName.getText(file) === "SpriteIcon") {
      for (const a of n.attributes.properties) {
        if (!ts.isJsxAttribute(a) || a.name.getText(file) !== "name" || !a.initializer) continue;
        if (ts.isStringLiteral(a.initializer)) literals(a.initializer);
        else if (ts.isJsxExpression(a.initializer) && a.initializer.expression && !literals(a.initializer.expression)) dynamic++;
      }
    }
    if (ts.isJsxAttribute(n) && n.name.getText(file) === "icon" && n.initializer) {
      if (ts.isStringLiteral(n.initializer)) literals(n.initializer);
      else if (ts.isJsxExpression(n.initializer) && n.initializer.expression) literals(n.initializer.expression);
    }
    if (ts.isVariableDeclaration(n) || ts.isPropertyDeclaration(n) || ts.isParameter(n)) typed(n.type, n.initializer);
    if (ts.isSatisfiesExpression(n)) typed(n.type, n.expression);
    ts.forEachChild(n, walk);
  };
  walk(file);
  return { names, dynamic };
}

/** Every .ts/.tsx file under app/ and components/, relative to the repository. */
function appSources(): string[] {
  return ["app", "components"].flatMap((dir) =>
    fs
      .readdirSync(path.join(root, dir), { recursive: true, encoding: "utf8" })
      .filter((f) => /\.tsx?$/.test(f))
      .map((f) => path.join(dir, f)),
  );
}

// The committed sprite (public/icons/sprite.svg) is what scripts/icon-sprite.ts makes from lucide-react
// today: a name added to components/ui/sprite-names.ts, or a lucide-react upgrade that redraws an icon, fails
// here until the script is run again.
describe("icon sprite", () => {
  it("is current with its list and lucide-react's shapes", async () => {
    expect(fs.readFileSync(SPRITE_FILE, "utf8")).toBe(await spriteSvg());
  });

  it("has one symbol for each listed name, each with shapes to draw", () => {
    const text = fs.readFileSync(SPRITE_FILE, "utf8");
    const symbols = [...text.matchAll(/<symbol id="([a-z0-9-]+)"[^>]*>(.*?)<\/symbol>/g)];
    expect(symbols.map((m) => m[1])).toEqual([...SPRITE_ICONS]);
    for (const [, , shapes] of symbols) expect(shapes).toMatch(/^(<(path|rect|circle|line|polyline|polygon|ellipse) [^>]+\/>)+$/);
  });

  it("draws an alias (triangle-alert) with the shapes of the icon it names", async () => {
    const alias = await spriteSvg(["triangle-alert"]);
    const named = await spriteSvg(["triangle-exclamation-point"]);
    expect(alias.replace('id="triangle-alert"', "")).toBe(named.replace('id="triangle-exclamation-point"', ""));
    expect(alias).toContain("<path d=");
  });
});

// Every icon the pages draw has its symbol in the committed sprite, and the sprite carries no icon that
// nothing draws (which also shows the reading below finds the names behind each <SpriteIcon name={…}>).
describe("icons the app draws", () => {
  const used = appSources().flatMap((f) => iconNamesIn(f, fs.readFileSync(path.join(root, f), "utf8")).names);

  it("each has a symbol in the committed sprite", () => {
    const symbols = new Set(committedSymbols());
    expect(used.length).toBeGreaterThan(100);
    expect(used.filter((u) => !symbols.has(u.name))).toEqual([]);
  });

  it("the sprite holds no icon that app/ and components/ never name", () => {
    const names = new Set(used.map((u) => u.name));
    expect(committedSymbols().filter((s) => !names.has(s))).toEqual([]);
  });

  it("reads literal names, choices, icon attributes and the tables typed with SpriteIconName", () => {
    const source = `
      const LOOK: Record<State, { icon: SpriteIconName; tone: string }> = { a: { icon: "inbox", tone: "text-ok" }, b: { icon: "no-such-icon", tone: "x" } };
      const BY_KEY: Record<Key, SpriteIconName> = { a: "flame", b: "zap" };
      const tones = { info: { box: "border-line", icon: "info", label: "Note" } } as const satisfies Record<string, { box: string; icon: SpriteIconName; label: string }>;
      const one: SpriteIconName = wide ? "plus" : "x";
      type Badge = { icon: SpriteIconName; word: string };
      const STATUS: Record<string, Badge> = { sent: { icon: "send", word: "Sent" } };
      const untyped = { icon: "not-read", tone: "text-muted" };
      export const A = () => <p><SpriteIcon name="pencil" className="size-4" /><SpriteIcon name={up ? "arrow-up" : "arrow-down"} className="size-4" /><SpriteIcon name={LOOK[s].icon} className="size-4" /><Badge icon="wrench" /></p>;
    `;
    const { names, dynamic } = iconNamesIn("components/x/y.tsx", source);
    expect(names.map((n) => n.name).sort()).toEqual(["arrow-down", "arrow-up", "flame", "inbox", "info", "no-such-icon", "pencil", "plus", "send", "wrench", "x", "zap"]);
    expect(dynamic).toBe(1);
    expect(names.find((n) => n.name === "no-such-icon")!.at).toBe("components/x/y.tsx:2");
  });
});

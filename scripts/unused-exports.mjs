// Lists exports that nothing imports: `node scripts/unused-exports.mjs` (exits 1 when it finds any).
// It reads the project with the TypeScript compiler (tsconfig.json) and follows every import, re-export
// and `import()` in every file, tests and scripts included. A module reached through `import * as x` or
// `import()` counts as used as a whole. Not checked: app/ (Next.js calls its exports by name), config
// files, and what a file exports only to itself ("used in its own file only" is listed apart; such an
// export can lose its `export`). Pass --all to list those too.
import path from "node:path";
import ts from "typescript";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const showLocal = process.argv.includes("--all");

const config = ts.getParsedCommandLineOfConfigFile(path.join(root, "tsconfig.json"), {}, { ...ts.sys, onUnRecoverableConfigFileDiagnostic: (d) => console.error(d.messageText) });
const program = ts.createProgram({ rootNames: config.fileNames, options: { ...config.options, noEmit: true, incremental: false } });
const checker = program.getTypeChecker();
const rel = (f) => path.relative(root, f);
const ours = program.getSourceFiles().filter((sf) => !sf.isDeclarationFile && !rel(sf.fileName).startsWith("node_modules") && !rel(sf.fileName).startsWith(".."));

/** Files whose exports are checked: product modules, not entry points that a framework or a tool calls. */
const checked = (f) => /^(lib|components|emails|db|jobs)\//.test(rel(f)) && !/^db\/(seed|migrate|backup)/.test(rel(f)) && !/^jobs\/(index|run-once)\.ts$/.test(rel(f));

const used = new Set(); // symbols imported somewhere
const wholeModules = new Set(); // files imported as a namespace or with import()
const localUse = new Set(); // symbols referenced in their own file outside their declaration

const resolved = (sym) => (sym && sym.flags & ts.SymbolFlags.Alias ? checker.getAliasedSymbol(sym) : sym);
const moduleFile = (spec) => checker.getSymbolAtLocation(spec)?.valueDeclaration?.getSourceFile?.()?.fileName;

for (const sf of ours) {
  const visit = (node) => {
    if (ts.isImportDeclaration(node) || ts.isExportDeclaration(node)) {
      const spec = node.moduleSpecifier;
      const clause = ts.isImportDeclaration(node) ? node.importClause : undefined;
      if (ts.isImportDeclaration(node)) {
        if (clause?.name) used.add(resolved(checker.getSymbolAtLocation(clause.name)));
        const nb = clause?.namedBindings;
        if (nb && ts.isNamespaceImport(nb) && spec) wholeModules.add(moduleFile(spec));
        if (nb && ts.isNamedImports(nb)) for (const el of nb.elements) used.add(resolved(checker.getSymbolAtLocation(el.name)));
      } else if (spec) {
        if (!node.exportClause) wholeModules.add(moduleFile(spec)); // export * from
        else if (ts.isNamedExports(node.exportClause)) for (const el of node.exportClause.elements) used.add(resolved(checker.getSymbolAtLocation(el.propertyName ?? el.name)));
      }
    } else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword && node.arguments[0]) {
      wholeModules.add(moduleFile(node.arguments[0]));
    } else if (ts.isImportTypeNode(node) && ts.isLiteralTypeNode(node.argument)) {
      wholeModules.add(moduleFile(node.argument.literal));
    } else if (ts.isIdentifier(node) && checked(sf.fileName)) {
      const sym = checker.getSymbolAtLocation(node);
      if (sym && !(sym.declarations ?? []).some((d) => d.name === node)) localUse.add(resolved(sym));
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
}

const unused = [];
const localOnly = [];
for (const sf of ours.filter((s) => checked(s.fileName) && !wholeModules.has(s.fileName))) {
  const moduleSym = checker.getSymbolAtLocation(sf);
  if (!moduleSym) continue;
  for (const exp of checker.getExportsOfModule(moduleSym)) {
    const target = resolved(exp);
    if (used.has(target) || used.has(exp)) continue;
    const decl = exp.declarations?.[0];
    if (!decl || decl.getSourceFile() !== sf) continue; // a re-export: its own module is checked
    const line = sf.getLineAndCharacterOfPosition(decl.getStart()).line + 1;
    (localUse.has(target) ? localOnly : unused).push(`${rel(sf.fileName)}:${line} ${exp.getName()}`);
  }
}

console.log(`Exports nothing imports (${unused.length}):`);
for (const u of unused.sort()) console.log(`  ${u}`);
console.log(`Exports used in their own file only (${localOnly.length})${showLocal ? ":" : "; --all lists them"}`);
if (showLocal) for (const u of localOnly.sort()) console.log(`  ${u}`);
process.exitCode = unused.length ? 1 : 0;

// Turns a TypeScript entry file and the project files it imports into plain ES modules in a
// directory, so a benchmark child can run on bare `node` without a TypeScript loader (whose
// extra thread would dominate a memory measurement).
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import ts from "typescript";

export function transpileForNode(entryFile: string, projectRoot: string, outDirectory: string): string {
  const pending = [path.resolve(entryFile)];
  const done = new Set<string>();
  while (pending.length > 0) {
    const file = pending.pop()!;
    if (done.has(file)) continue;
    done.add(file);
    const source = readFileSync(file, "utf8");
    let output = ts.transpileModule(source, {
      compilerOptions: { module: ts.ModuleKind.ESNext, target: ts.ScriptTarget.ES2022, verbatimModuleSyntax: false },
      fileName: file,
    }).outputText;
    for (const { fileName: specifier } of ts.preProcessFile(source, true, true).importedFiles) {
      const target = resolveProjectImport(specifier, file, projectRoot);
      if (!target) continue;
      pending.push(target);
      const relative = path.relative(path.dirname(file), target).replace(/\.ts$/, ".js");
      output = output.replaceAll(`"${specifier}"`, `"${relative.startsWith(".") ? relative : `./${relative}`}"`);
    }
    const outFile = path.join(outDirectory, path.relative(projectRoot, file)).replace(/\.ts$/, ".js");
    mkdirSync(path.dirname(outFile), { recursive: true });
    writeFileSync(outFile, output);
  }
  writeFileSync(path.join(outDirectory, "package.json"), JSON.stringify({ type: "module" }));
  return path.join(outDirectory, path.relative(projectRoot, entryFile)).replace(/\.ts$/, ".js");
}

function resolveProjectImport(specifier: string, fromFile: string, projectRoot: string): string | undefined {
  let base: string;
  if (specifier.startsWith("./") || specifier.startsWith("../")) base = path.resolve(path.dirname(fromFile), specifier);
  else if (specifier.startsWith("@/")) base = path.join(projectRoot, specifier.slice(2));
  else return undefined;
  for (const candidate of [`${base}.ts`, path.join(base, "index.ts")]) {
    try {
      readFileSync(candidate);
      return candidate;
    } catch {
      // try the next candidate
    }
  }
  return undefined;
}

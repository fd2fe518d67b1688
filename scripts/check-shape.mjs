// The shape targets of the house, checked over src/: no line over 120 characters and no
// function body over 100 lines (a React component counts as one function).
// Usage: node scripts/check-shape.mjs [files...]   (default: every .ts/.tsx file under src/)
// Prints one line per offence and exits 1 when there is any; tests/architecture.test.ts runs it.
import ts from 'typescript';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

export const MAX_LINE = 120;
export const MAX_BODY_LINES = 100;

function sourceFiles(dir) {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return sourceFiles(p);
    return /\.tsx?$/.test(name) ? [p] : [];
  });
}

export function shapeOffences(files) {
  const out = [];
  for (const file of files) {
    const text = readFileSync(file, 'utf8');
    text.split('\n').forEach((line, i) => {
      if (line.length > MAX_LINE) out.push(`${file}:${i + 1}: line of ${line.length} characters`);
    });
    const kind = file.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS;
    const sf = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true, kind);
    const visit = (n) => {
      const fn =
        ts.isFunctionDeclaration(n) ||
        ts.isMethodDeclaration(n) ||
        ts.isArrowFunction(n) ||
        ts.isFunctionExpression(n);
      if (fn && n.body && ts.isBlock(n.body)) {
        const first = sf.getLineAndCharacterOfPosition(n.body.getStart(sf)).line;
        const last = sf.getLineAndCharacterOfPosition(n.body.getEnd()).line;
        const lines = last - first - 1;
        if (lines > MAX_BODY_LINES) {
          const name = n.name
            ? n.name.getText(sf)
            : n.parent && ts.isVariableDeclaration(n.parent)
              ? n.parent.name.getText(sf)
              : '(anonymous)';
          out.push(`${file}:${first + 1}: function ${name} has a body of ${lines} lines`);
        }
      }
      ts.forEachChild(n, visit);
    };
    visit(sf);
  }
  return out;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const files = process.argv.length > 2 ? process.argv.slice(2) : sourceFiles('src');
  const offences = shapeOffences(files);
  for (const o of offences) console.log(o);
  console.log(`${offences.length} offence(s) in ${files.length} file(s)`);
  process.exit(offences.length ? 1 : 0);
}

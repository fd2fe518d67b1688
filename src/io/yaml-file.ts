/** Read a YAML file and keep the way back from a data path to its line and column. */
import { LineCounter, parseDocument, isCollection, isMap, isScalar, visit, type Document } from 'yaml';
import { readTextFile } from './read-text.js';
import { fail, type Where, type YamlFault } from '../core/index.js';

/** the most alias expansions a file may use (yaml's own default guard, stated here) */
const MAX_ALIAS_COUNT = 100;

export type DataPath = readonly (string | number)[];

export interface YamlSource {
  readonly file: string;
  readonly data: unknown;
  /** line/column of the node at path (or of the nearest existing parent) */
  locate(path: DataPath, key?: string): Where;
}

export function parseYamlText(text: string, file: string): YamlSource {
  const lineCounter = new LineCounter();
  const doc: Document = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length) {
    const e = doc.errors[0];
    const pos = lineCounter.linePos(e.pos[0]);
    fail(
      { code: 'yaml-syntax', fault: { kind: 'parser', message: e.message.split('\n')[0] } },
      { file, line: pos.line, column: pos.col },
    );
  }
  // a list or map used as a key (`? [a, b]: 1`, `{a: 1}: 2`) has no place in these files; refuse it here
  // rather than let the parser turn it into a string with a warning on stderr
  visit(doc, {
    Pair(_, pair) {
      if (isCollection(pair.key)) {
        const r = (pair.key as { range?: [number, number, number] }).range;
        const pos = r ? lineCounter.linePos(r[0]) : undefined;
        fail(
          { code: 'yaml-syntax', fault: { kind: 'collection-key' } },
          { file, line: pos?.line, column: pos?.col },
        );
      }
    },
  });
  // anchors and aliases: an alias bomb (aliases of aliases, each a list of the last) would expand to
  // gigabytes, and an alias to a missing anchor has no value; both are refused with their reason
  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (e) {
    const msg = (e as Error).message;
    const fault: YamlFault = /alias count/i.test(msg)
      ? { kind: 'too-many-aliases', limit: MAX_ALIAS_COUNT }
      : /unresolved alias/i.test(msg)
        ? { kind: 'unresolved-alias', alias: /: (.*)$/.exec(msg)?.[1] ?? 'name' }
        : { kind: 'not-data', message: msg.split('\n')[0] };
    return fail({ code: 'yaml-syntax', fault }, { file });
  }
  const locate = (path: DataPath, key?: string): Where => {
    for (let n = path.length; n >= 0; n--) {
      const node = doc.getIn(path.slice(0, n), true) as { range?: [number, number, number] } | undefined;
      if (n === path.length && key !== undefined && isMap(node)) {
        const pair = node.items.find((p) => isScalar(p.key) && p.key.value === key);
        const r = (pair?.key as { range?: [number, number, number] } | undefined)?.range;
        if (r) {
          const pos = lineCounter.linePos(r[0]);
          return { file, line: pos.line, column: pos.col };
        }
      }
      if (node && node.range) {
        const pos = lineCounter.linePos(node.range[0]);
        return { file, line: pos.line, column: pos.col };
      }
      if (n === 0) break;
    }
    return { file };
  };
  return { file, data, locate };
}

export function readYamlFile(file: string): YamlSource {
  const text = readTextFile(file);
  return parseYamlText(text, file);
}

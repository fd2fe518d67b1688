/**
 * The terminal screens (dist/tui.mjs, ink and react), loaded on first use by `fill` and the wizard.
 *
 * The built command runs its bundle as a compiled script (scripts/cli-load.mjs, for the code
 * cache), and a script has no module loader of its own: a bare `import()` in it fails. The loader
 * therefore hands the bundle an import function (`__mwImport`, resolving beside the bundle), which
 * every lazy load of the command goes through. From source (tests, tsx) there is none and the
 * module is imported as usual.
 */
type TuiModule = typeof import('../tui/run.js');
declare const __mwImport: ((spec: string) => Promise<unknown>) | undefined;

export function loadTui(): Promise<TuiModule> {
  if (typeof __mwImport === 'function') return __mwImport('./tui.mjs') as Promise<TuiModule>;
  return import('../tui/run.js');
}

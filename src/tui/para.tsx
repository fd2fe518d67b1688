/**
 * The one wrapping function of the screens: a paragraph wrapped at words to its box's width. Ink keeps
 * the space it broke a line at as the first character of the next line; a continuation line here
 * starts with its word (the line count, which the layout measured, stays the same).
 */
import type { ComponentProps } from 'react';
import { Box, Text, Transform, useStdout } from 'ink';

/** a space that starts a continuation line, after any colour or weight codes */
const ESC = String.fromCharCode(27);
const LEAD = new RegExp(`^((?:${ESC}\\[[0-9;]*m)*) `);

/** a wrapped line as shown: the first line as it is, a continuation line without its leading space */
export function dropLeadingSpace(line: string, index: number): string {
  return index > 0 ? line.replace(LEAD, '$1') : line;
}

/** a `<Text>` wrapped at words (its own props otherwise) */
export function Para(props: Omit<ComponentProps<typeof Text>, 'wrap'>) {
  return (
    <Transform transform={dropLeadingSpace}>
      <Text {...props} wrap="wrap" />
    </Transform>
  );
}

/**
 * A screen's title: the batch (`base`, e.g. "mixwright fill b1") and what the screen is, on one row when
 * they fit the terminal's width; else what the screen is goes on the row under the batch, whole (a
 * title is never cut, nor broken inside the batch id)
 */
export function ScreenTitle({ base, what }: { readonly base: string; readonly what: string }) {
  const { stdout } = useStdout();
  const columns = stdout?.columns || 80;
  const one = `${base} - ${what}`;
  if (one.length <= columns) return <Text bold>{one}</Text>;
  return (
    <Box flexDirection="column">
      <Text bold>{base}</Text>
      <Para bold>{what}</Para>
    </Box>
  );
}

/**
 * A screen's choices, each on its own line: the key to type, then what it does (`what` empty: the key
 * alone); `after`: what holds for every choice (logged, Ctrl-C), on its own line
 */
export function Options({
  options,
  after,
}: {
  readonly options: readonly (readonly [key: string, what: string])[];
  readonly after?: string;
}) {
  return (
    <Box flexDirection="column">
      {options.map(([key, what], i) => (
        <Para key={i}>{what ? `${key}: ${what}` : key}</Para>
      ))}
      {after ? <Para>{after}</Para> : null}
    </Box>
  );
}

/** Keys that arrive together (a paste, or tmux sending several) come as one chunk: split it. */
export type KeyToken =
  { readonly kind: 'enter' | 'tab' | 'backspace' } | { readonly kind: 'text'; readonly text: string };

export function splitChunk(input: string): KeyToken[] {
  const out: KeyToken[] = [];
  let buf = '';
  const flush = () => {
    if (buf) out.push({ kind: 'text', text: buf });
    buf = '';
  };
  for (const ch of input) {
    if (ch === '\r' || ch === '\n') {
      flush();
      out.push({ kind: 'enter' });
    } else if (ch === '\t') {
      flush();
      out.push({ kind: 'tab' });
    } else if (ch === '\x7f' || ch === '\b') {
      flush();
      out.push({ kind: 'backspace' });
    } else if (ch >= ' ') buf += ch;
  }
  flush();
  return out;
}

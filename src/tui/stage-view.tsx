/** The end screen's block for a stage of a two-stage fill (lines from stage-state.ts). */
import { Box } from 'ink';
import type { LogHeader } from '../io/batch-log.js';
import type { CheckReport } from '../io/check.js';
import { stageEndLines } from './stage-state.js';
import { Para } from './para.js';

export function StageEnd({
  header,
  report,
  closed,
}: {
  readonly header: LogHeader;
  readonly report?: CheckReport;
  readonly closed: boolean;
}) {
  const lines = stageEndLines(header, report, closed);
  if (!lines.length) return null;
  return (
    <Box flexDirection="column" marginTop={1}>
      {lines.map((l, i) => (
        <Para key={i} bold={i === 0}>
          {l}
        </Para>
      ))}
    </Box>
  );
}

/**
 * The review screen of the guided fill (phase 'review', fill-review.ts): the hazards the re-targeted
 * remainder passes that the plan did not, why, the safer stop the core computed where there is one,
 * and the choices, each logged with initials.
 */
import { Box, Text } from 'ink';
import type { FillState } from './fill-state.js';
import { alternativeTargets, continuationOffered } from './fill-review.js';
import { fromPa } from '../io/quantity.js';
import { fillTitle } from './stage-state.js';
import { Options, Para, ScreenTitle } from './para.js';

const TRIGGER_WORDS = {
  reading: 'the reading just logged',
  undo: 'the reading withdrawn',
  correction: 'the corrected reading',
  resume: 'resuming this log',
  temperature: 'the new tank temperature',
  start: "the top-up's starting pressure",
} as const;

const torr = (pa: number) => `${fromPa(pa, 'Torr').toFixed(2)} Torr`;

export function RemainderReviewScreen({ state }: { readonly state: FillState }) {
  const r = state.review!;
  const h = state.setup.header;
  const alt = r.alternative;
  const cont = r.continuation;
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(h)} what="SAFETY REVIEW of the remaining fills" />
      {state.message ? <Para>{state.message}</Para> : null}
      <Para>
        After {TRIGGER_WORDS[r.trigger]}, the fills ahead (re-targeted from the tank as read, every state and
        fill path reviewed) pass what the plan did not have:
      </Para>
      {r.hazards.map((z, i) => (
        <Para key={i}>
          - {z.severity.toUpperCase()} {z.code}
          {z.step ? ` (fill ${z.step})` : ''}
          {z.numbers ? ` ${z.numbers}` : ''}
        </Para>
      ))}
      <Text> </Text>
      {cont?.clean && cont.unreadable ? (
        <Para>
          Continuing {cont.name} to its target {torr(cont.toPa)} is not offered: {cont.unreadable}.
        </Para>
      ) : null}
      {cont && continuationOffered(cont) ? (
        <Para>
          Safer: continue {cont.name} to its target {torr(cont.toPa)} absolute (it stopped at{' '}
          {torr(cont.fromPa)}): then no state or fill path ahead is flammable or a danger that the plan did
          not have. Fill on from {cont.sourceId} and type the new reading and your initials (e.g.{' '}
          {fromPa(cont.toPa, 'Torr').toFixed(2)} AB): logged as a further reading of fill {cont.step} (more
          gas added).
        </Para>
      ) : alt ? (
        <Para>
          Safer: stop {alt.name} at {torr(alt.toPa)} absolute instead of {torr(alt.fromPa)}. Then no state or
          fill path ahead is flammable or a danger
          {alt.marginKept
            ? ' and none comes nearer the flammable region than the plan'
            : ' (some come nearer the flammable region than the plan: no stop keeps the margins)'}
          . Targets then: {alternativeTargets(alt)}.
        </Para>
      ) : (
        <Para>{r.noAlternative}.</Para>
      )}
      {/* a refusal takes the note's row: the screen keeps 24 rows */}
      <Options
        options={[
          ...(continuationOffered(cont) ? [['VALUE INITIALS', 'the fill continued'] as const] : []),
          ...(alt ? [['safer INITIALS', 'take the safer stop'] as const] : []),
          ['accept INITIALS', "go on through it (have it reviewed by your lab's rules first)"],
          ['stop INITIALS', 'stop the batch here (closed, INCOMPLETE)'],
          ['undo INITIALS', 'the last reading was mistyped'],
          ['fix N INITIALS', 'correct fill N'],
        ]}
        after={
          // a refusal names the choices again: the note gives it its row
          state.error
            ? undefined
            : 'Each choice is logged with the findings; Ctrl-C leaves (resuming asks again).'
        }
      />
      <Text>
        &gt; {state.input}
        <Text inverse> </Text>
      </Text>
      {state.error ? <Para>! {state.error}</Para> : null}
    </Box>
  );
}

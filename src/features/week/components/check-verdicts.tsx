import type { WeekReport } from '../../../../shared/api/reports';
import { Panel } from '../../../components/ui/panel';
import { toneClasses, toneGlyphs } from '../../../components/ui/tone';
import type { Tone } from '../../../components/ui/tone';
import { formatDecimal } from '../../../lib/format';

const verdicts = [
  { verdict: 'pass', word: 'Pass' },
  { verdict: 'warn', word: 'Warn' },
  { verdict: 'fail', word: 'Fail' },
] as const satisfies readonly { verdict: Tone; word: string }[];

/** Guided checks finished this week by verdict: colour, glyph and word together, never colour alone. */
export function CheckVerdicts({ checks }: { checks: WeekReport['checks'] }) {
  const total = checks.pass + checks.warn + checks.fail;
  return (
    <Panel>
      <h2 className="text-xl font-bold">Checks finished</h2>
      {total === 0 ? (
        <p className="mt-2 text-lg text-ink-soft">
          No guided check was finished this week. Checks run at the machine with{' '}
          <code className="font-mono font-bold">vanbay check run</code> are counted here by verdict.
        </p>
      ) : (
        <ul className="mt-3 grid grid-cols-3 gap-3">
          {verdicts.map(({ verdict, word }) => (
            <li key={verdict} className={`rounded-plate border-2 p-3 ${toneClasses[verdict]}`}>
              <span className="flex items-center gap-2 text-base font-bold">
                <span aria-hidden="true">{toneGlyphs[verdict]}</span>
                {word}
              </span>
              <span className="mt-1 block text-3xl font-bold tabular-nums">
                {formatDecimal(checks[verdict], 0)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

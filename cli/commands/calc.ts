import { Command } from 'commander';
import { GENERIC_MIN_FLOW_LPH } from '../../shared/evaluators/flow-volume';
import { FUELS } from '../../shared/evaluators/mixture';
import { lazy, sub } from '../lib/define';
import type { CliDeps } from '../lib/deps';

const actions = () => import('../actions/calc');

/** The offline calculators (CONTRACT.md); their module imports no zod, so they start quickly too. */
export function calcCommand(deps: CliDeps) {
  const command = new Command('calc').description(
    'offline calculators: units, battery, drop, lambda, hold, flow, compression, VIN, mileage',
  );
  sub(
    command,
    'convert',
    'convert VALUE from one unit to another (psi kPa bar, mL L gal floz, L/h mL/min gal/h, mi km, F C)',
  )
    .argument('<value>')
    .argument('<from>')
    .argument('<to>')
    .action(lazy(deps, async () => (await actions()).calcConvertAction));
  sub(command, 'battery', 'state of charge from the resting voltage')
    .argument('<volts>')
    .option('--type <type>', 'flooded, agm or lithium', 'flooded')
    .action(lazy(deps, async () => (await actions()).calcBatteryAction));
  sub(command, 'drop', 'voltage lost between the supply and the load')
    .argument('<supplyVolts>')
    .argument('<loadVolts>')
    .option('--max <volts>', 'largest acceptable drop (default 0.5 V)')
    .action(lazy(deps, async () => (await actions()).calcDropAction));
  sub(command, 'lambda', 'lambda and mixture from an air-fuel ratio')
    .argument('<afr>')
    .option('--fuel <fuel>', FUELS.join(', '), 'gasoline')
    .action(lazy(deps, async () => (await actions()).calcLambdaAction));
  sub(command, 'hold', 'static pressure hold: drop after the 30 s settling window')
    .requiredOption('--points <list>', 'SEC:PSI,SEC:PSI,… since the pump stopped')
    .requiredOption('--max-drop <psi>', 'largest acceptable drop in psi')
    .requiredOption('--minutes <m>', 'length of the hold test')
    .action(lazy(deps, async () => (await actions()).calcHoldAction));
  sub(command, 'flow', 'flow volume from fuel collected in a timed run')
    .requiredOption('--ml <ml>', 'fuel collected, mL')
    .requiredOption('--seconds <s>', 'time the pump ran')
    .option('--min-lph <n>', `minimum from the service manual (default ${GENERIC_MIN_FLOW_LPH} L/h, generic)`)
    .action(lazy(deps, async () => (await actions()).calcFlowAction));
  sub(command, 'compression', 'spread across cylinders: (highest − lowest) / highest')
    .argument('<psi...>')
    .action(lazy(deps, async () => (await actions()).calcCompressionAction));
  sub(command, 'vin', 'check digit (49 CFR 565.15) and possible model years')
    .argument('<vin>')
    .action(lazy(deps, async () => (await actions()).calcVinAction));
  sub(command, 'mileage', 'mileage deduction at the standard rate for the tax year')
    .argument('<miles>')
    .requiredOption('--year <yyyy>', 'tax year')
    .option('--rate <cents>', 'cents per mile, instead of the published rate')
    .action(lazy(deps, async () => (await actions()).calcMileageAction));
  return command;
}

import { formatDecimal } from '../../../lib/format';

/** Seconds after the pump stopped as the gauge watcher counts them: `45 s`, `2:30`, `5:00`. */
export function clockTime(sec: number): string {
  if (sec < 60) return `${formatDecimal(sec, 1)} s`;
  const whole = Math.round(sec);
  return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')}`;
}

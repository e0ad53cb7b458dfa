import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  evaluateMixture,
  FUELS,
  STOICHIOMETRIC_AFR,
  type Fuel,
  type MixtureInput,
} from '../../../shared/evaluators/mixture';

describe('STOICHIOMETRIC_AFR', () => {
  it.each([
    // REFERENCES.md "Air-fuel ratio" table.
    { fuel: 'gasoline', afr: 14.7 },
    { fuel: 'e10', afr: 14.1 },
    { fuel: 'e85', afr: 9.8 },
    { fuel: 'ethanol', afr: 9.0 },
    { fuel: 'methanol', afr: 6.4 },
  ] as const)('$fuel is $afr:1', ({ fuel, afr }) => {
    expect(STOICHIOMETRIC_AFR[fuel]).toBe(afr);
  });

  it('puts gasoline within 0.1 of Heywood', () => {
    // Heywood, Internal Combustion Engine Fundamentals: ≈ 14.6 (from memory).
    expect(Math.abs(STOICHIOMETRIC_AFR.gasoline - 14.6)).toBeLessThanOrEqual(0.1);
  });

  it.each([
    { fuel: 'e10', ethanolByVolume: 0.1 },
    { fuel: 'e85', ethanolByVolume: 0.85 },
  ] as const)('matches a mass-weighted blend for $fuel', ({ fuel, ethanolByVolume }) => {
    // REFERENCES.md: blends are mass-weighted. Densities from memory: ethanol 0.789 g/mL,
    // gasoline about 0.745 g/mL.
    const ethanolMass = ethanolByVolume * 0.789;
    const gasolineMass = (1 - ethanolByVolume) * 0.745;
    const share = ethanolMass / (ethanolMass + gasolineMass);
    const blend = share * STOICHIOMETRIC_AFR.ethanol + (1 - share) * STOICHIOMETRIC_AFR.gasoline;
    expect(Math.abs(blend - STOICHIOMETRIC_AFR[fuel])).toBeLessThan(0.05);
  });
});

describe('evaluateMixture', () => {
  it.each([
    // λ = AFR ÷ stoichiometric AFR (REFERENCES.md); bands common practice, no published source.
    { afr: 14.7, fuel: 'gasoline', lambda: 1, mixture: 'stoichiometric', verdict: 'pass' },
    { afr: 9.8, fuel: 'e85', lambda: 1, mixture: 'stoichiometric', verdict: 'pass' },
    { afr: 6.4, fuel: 'methanol', lambda: 1, mixture: 'stoichiometric', verdict: 'pass' },
    // Hand-worked: 15.0 / 14.7 = 1.0204.
    { afr: 15, fuel: 'gasoline', lambda: 1.0204, mixture: 'lean', verdict: 'pass' },
    // Hand-worked: 13.2 / 14.7 = 0.8980.
    { afr: 13.2, fuel: 'gasoline', lambda: 0.898, mixture: 'rich', verdict: 'warn' },
    // Hand-worked: 16.0 / 14.7 = 1.0884.
    { afr: 16, fuel: 'gasoline', lambda: 1.0884, mixture: 'lean', verdict: 'warn' },
    // Hand-worked: 17.0 / 14.7 = 1.1565.
    { afr: 17, fuel: 'gasoline', lambda: 1.1565, mixture: 'lean', verdict: 'fail' },
    // Hand-worked: 12.0 / 14.7 = 0.8163.
    { afr: 12, fuel: 'gasoline', lambda: 0.8163, mixture: 'rich', verdict: 'fail' },
    // Hand-worked: 14.1 / 14.7 = 0.9592, but on E10 it is exactly stoichiometric.
    { afr: 14.1, fuel: 'e10', lambda: 1, mixture: 'stoichiometric', verdict: 'pass' },
    { afr: 14.1, fuel: 'gasoline', lambda: 0.9592, mixture: 'rich', verdict: 'pass' },
  ] as const)(
    'AFR $afr on $fuel: lambda $lambda, $mixture, $verdict',
    ({ afr, fuel, lambda, mixture, verdict }) => {
      const result = evaluateMixture({ afr, fuel });
      expect(result.figures.lambda).toBe(lambda);
      expect(result.figures.mixture).toBe(mixture);
      expect(result.verdict).toBe(verdict);
      expect(result.figures.stoichAfr).toBe(STOICHIOMETRIC_AFR[fuel]);
    },
  );

  it.each([
    // Band edges, hand-worked as 14.7 × λ; edges are inclusive (common practice, no published source).
    { afr: 13.965, verdict: 'pass' }, // λ 0.95
    { afr: 15.435, verdict: 'pass' }, // λ 1.05
    { afr: 16.17, verdict: 'warn' }, // λ 1.10
    { afr: 12.495, verdict: 'warn' }, // λ 0.85
  ] as const)('treats AFR $afr on gasoline as $verdict at a band edge', ({ afr, verdict }) => {
    expect(evaluateMixture({ afr, fuel: 'gasoline' }).verdict).toBe(verdict);
  });

  it.each([
    // Within 0.5 % of λ = 1 counts as stoichiometric: 14.77 / 14.7 = 1.0048, 14.78 / 14.7 = 1.0054.
    { afr: 14.77, mixture: 'stoichiometric' },
    { afr: 14.78, mixture: 'lean' },
    // 14.63 / 14.7 = 0.99524; 14.62 / 14.7 = 0.99456.
    { afr: 14.63, mixture: 'stoichiometric' },
    { afr: 14.62, mixture: 'rich' },
  ] as const)('AFR $afr on gasoline is $mixture', ({ afr, mixture }) => {
    expect(evaluateMixture({ afr, fuel: 'gasoline' }).figures.mixture).toBe(mixture);
  });

  it('says in every reason that a richer mixture is normal under heavy load', () => {
    for (const afr of [12, 13.2, 14.7, 16, 17]) {
      expect(evaluateMixture({ afr, fuel: 'gasoline' }).reason).toMatch(
        /under heavy load a richer mixture is normal/,
      );
    }
  });

  it('writes the lean-damage risk in plain words', () => {
    const result = evaluateMixture({ afr: 17, fuel: 'gasoline' });
    expect(result.reason).toMatch(
      /^Lambda 1\.16 \(AFR 17:1 on gasoline, stoichiometric 14\.7:1\): dangerously lean/,
    );
  });

  it('keeps lambda × stoichiometric AFR equal to the AFR read', () => {
    // Definition of λ (REFERENCES.md); lambda is shown to 4 decimals, so allow half a unit in the 4th.
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 30, noNaN: true }),
        fc.constantFrom(...FUELS),
        (afr: number, fuel: Fuel) => {
          const { figures } = evaluateMixture({ afr, fuel });
          expect(Math.abs(figures.lambda * figures.stoichAfr - afr)).toBeLessThanOrEqual(
            0.00005 * figures.stoichAfr + 1e-9,
          );
        },
      ),
    );
  });

  it.each<MixtureInput>([
    { afr: 0, fuel: 'gasoline' },
    { afr: -14.7, fuel: 'gasoline' },
    { afr: Number.NaN, fuel: 'gasoline' },
    { afr: Number.POSITIVE_INFINITY, fuel: 'gasoline' },
    { afr: 14.7, fuel: 'diesel' as Fuel },
  ])('throws RangeError for AFR $afr on $fuel', (input) => {
    expect(() => evaluateMixture(input)).toThrow(RangeError);
  });
});

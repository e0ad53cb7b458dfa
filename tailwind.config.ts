import type { Config } from 'tailwindcss';
import plugin from 'tailwindcss/plugin';

/**
 * Vanbay's look, defined once. Two swatch sets, one per light condition: "daylight" is the default
 * because the dashboard gets read at the van's open door in sun; "night" follows the device's dark
 * setting. Every text colour is at least 7:1 against ground and panel (WCAG AAA) in both sets, and
 * the rule colour at least 3:1 (non-text contrast), so nothing fades in glare.
 */
const swatches = {
  daylight: {
    ground: '#f3f0e8',
    panel: '#ffffff',
    ink: '#111417',
    'ink-soft': '#3b4148',
    rule: '#6a7079',
    coolant: '#0a5563',
    'on-coolant': '#ffffff',
    pass: '#0f5424',
    'pass-wash': '#dcf1e1',
    warn: '#6e4200',
    'warn-wash': '#fbedc6',
    fail: '#8f0e17',
    'fail-wash': '#f9dedb',
  },
  night: {
    ground: '#0d1013',
    panel: '#171b20',
    ink: '#f3f0e8',
    'ink-soft': '#b8bec6',
    rule: '#7a828b',
    coolant: '#6dd3e0',
    'on-coolant': '#0d1013',
    pass: '#74e391',
    'pass-wash': '#10301a',
    warn: '#ffc94a',
    'warn-wash': '#372805',
    fail: '#ff8f85',
    'fail-wash': '#3b1411',
  },
} as const;

type Token = keyof typeof swatches.daylight;

const tokens = Object.keys(swatches.daylight) as Token[];

function cssVariables(set: keyof typeof swatches): Record<string, string> {
  return Object.fromEntries(tokens.map((token) => [`--vb-${token}`, swatches[set][token]]));
}

export default {
  // `dark:` follows the device so a utility never disagrees with the swapped variables below.
  darkMode: 'media',
  theme: {
    extend: {
      colors: Object.fromEntries(tokens.map((token) => [token, `var(--vb-${token})`])),
      fontFamily: {
        sans: ['"Space Grotesk"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
      spacing: {
        // 48 px: the smallest target a gloved or greasy thumb hits reliably.
        touch: '3rem',
      },
      borderRadius: {
        plate: '0.375rem',
      },
      borderWidth: {
        3: '3px',
      },
    },
  },
  plugins: [
    plugin(({ addBase }) => {
      addBase({
        ':root': { ...cssVariables('daylight'), 'color-scheme': 'light dark' },
        '@media (prefers-color-scheme: dark)': { ':root': cssVariables('night') },
      });
    }),
  ],
} satisfies Config;

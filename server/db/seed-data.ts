/**
 * The invented demo scenario of PRODUCT.md: Ridgeback Mobile Moto, run by Morgan Avery in the
 * invented town of Cinder Valley. Every person, place, make and model here is made up.
 */
import type { MachineKind, MeterUnit } from '../../shared/api/machines';
import type { Role } from '../../shared/api/users';

export const DEMO_PASSWORD = 'vanbay-demo-2026';
export const DEMO_BUSINESS_SLUG = 'ridgeback';

export const demoBusiness = {
  slug: DEMO_BUSINESS_SLUG,
  name: 'Ridgeback Mobile Moto',
  ownerName: 'Morgan Avery',
  email: 'owner@ridgeback.test',
  phone: '555-0148',
  addressLines: ['41 Quarry Bend Road', 'Cinder Valley'],
  timezone: 'America/Denver',
  labourRateCents: 9_500,
  partsMarkupBps: 2_500,
  tripFeeBaseCents: 3_500,
  tripFeePerMileCents: 150,
  tripFeeFreeMiles: 15,
  taxRatePpm: 62_500,
  invoiceTermsDays: 14,
  invoiceFooter: 'Thank you for riding with Ridgeback. Payment due within 14 days.',
} as const;

export interface DemoUser {
  email: string;
  name: string;
  role: Role;
  /** For the customer sign-in: which seeded customer it belongs to. */
  customerKey?: string;
}

/** The four sign-ins of CONTRACT.md, all with DEMO_PASSWORD. */
export const demoUsers: DemoUser[] = [
  { email: 'owner@ridgeback.test', name: 'Morgan Avery', role: 'owner' },
  { email: 'helper@ridgeback.test', name: 'Dana Whitlock', role: 'helper' },
  { email: 'books@ridgeback.test', name: 'Priya Lindqvist', role: 'bookkeeper' },
  { email: 'jules@example.test', name: 'Jules Marchetti', role: 'customer', customerKey: 'jules' },
];

export interface DemoCustomer {
  key: string;
  name: string;
  email: string;
  phone: string;
  address: string;
  town: string;
}

export const demoCustomers: DemoCustomer[] = [
  {
    key: 'jules',
    name: 'Jules Marchetti',
    email: 'jules@example.test',
    phone: '555-0101',
    address: '12 Larkspur Lane',
    town: 'Cinder Valley',
  },
  {
    key: 'rowan',
    name: 'Rowan Delacroix',
    email: 'rowan@example.test',
    phone: '555-0102',
    address: '388 Old Flume Road',
    town: 'Ashgrove Flats',
  },
  {
    key: 'tess',
    name: 'Tess Brandvold',
    email: 'tess@example.test',
    phone: '555-0103',
    address: '7 Basalt Court',
    town: 'Pumice Ridge',
  },
  {
    key: 'imani',
    name: 'Imani Castellanos',
    email: 'imani@example.test',
    phone: '555-0104',
    address: '2210 Shoreline Drive',
    town: 'Lantern Creek',
  },
  {
    key: 'otis',
    name: 'Otis Fairweather',
    email: 'otis@example.test',
    phone: '555-0105',
    address: '95 Cutbank Way',
    town: 'Cinder Valley',
  },
  {
    key: 'wren',
    name: 'Wren Halvorsen',
    email: 'wren@example.test',
    phone: '555-0106',
    address: '14 Tinder Street',
    town: 'Ashgrove Flats',
  },
  {
    key: 'beck',
    name: 'Beck Tanaka-Moore',
    email: 'beck@example.test',
    phone: '555-0107',
    address: '601 Ember Hollow',
    town: 'Pumice Ridge',
  },
  {
    key: 'lorna',
    name: 'Lorna Quist',
    email: 'lorna@example.test',
    phone: '555-0108',
    address: '3 Frostline Road',
    town: 'Lantern Creek',
  },
  {
    key: 'hollis',
    name: 'Hollis Pike',
    email: 'hollis@example.test',
    phone: '555-0109',
    address: '77 Cairn Lane',
    town: 'Cinder Valley',
  },
];

/** Fuel specs as entered from a service manual; psi because that is how the gauge reads. */
export interface DemoSpecs {
  pressureMinPsi: number;
  pressureMaxPsi: number;
  holdMaxDropPsi: number;
  holdMinutes: number;
  flowMinLph: number;
}

export interface DemoMachine {
  key: string;
  customerKey: string;
  kind: MachineKind;
  year: number | null;
  make: string;
  model: string;
  /** First 8 and last 8 characters of the VIN; the check digit is computed in between. */
  vinBody?: string;
  otherId?: string;
  meterUnit: MeterUnit;
  meterReading: number;
  specs?: DemoSpecs;
}

export const demoMachines: DemoMachine[] = [
  {
    key: 'quillback650',
    customerKey: 'jules',
    kind: 'motorcycle',
    year: 2019,
    make: 'Kestrel',
    model: 'Quillback 650',
    vinBody: '7V9KT650_KC104382',
    meterUnit: 'mi',
    meterReading: 18_420,
    specs: { pressureMinPsi: 40, pressureMaxPsi: 46, holdMaxDropPsi: 3, holdMinutes: 5, flowMinLph: 30 },
  },
  {
    key: 'larch570',
    customerKey: 'jules',
    kind: 'atv',
    year: 2021,
    make: 'Tamarack',
    model: 'Larch 570',
    vinBody: '7V9TL570_MT220917',
    meterUnit: 'h',
    meterReading: 312,
  },
  {
    key: 'drift800',
    customerKey: 'rowan',
    kind: 'snowmobile',
    year: 2018,
    make: 'Norrland',
    model: 'Drift 800',
    vinBody: '7V9ND800_JN031455',
    meterUnit: 'mi',
    meterReading: 4_210,
  },
  {
    key: 'skimmer1100',
    customerKey: 'rowan',
    kind: 'watercraft',
    year: 2017,
    make: 'Kestrel',
    model: 'Skimmer 1100',
    otherId: 'KSR11042H717',
    meterUnit: 'h',
    meterReading: 260,
  },
  {
    key: 'spruce1000',
    customerKey: 'tess',
    kind: 'side_by_side',
    year: 2022,
    make: 'Tamarack',
    model: 'Sprucewood 1000',
    vinBody: '7V9TS1K0_NT408823',
    meterUnit: 'h',
    meterReading: 540,
    specs: { pressureMinPsi: 55, pressureMaxPsi: 61, holdMaxDropPsi: 4, holdMinutes: 5, flowMinLph: 40 },
  },
  {
    key: 'lm22',
    customerKey: 'tess',
    kind: 'small_engine',
    year: null,
    make: 'Tamarack',
    model: 'Yardline 22 mower',
    otherId: 'TYL22-0088417',
    meterUnit: 'h',
    meterReading: 210,
  },
  {
    key: 'skimmer1500',
    customerKey: 'imani',
    kind: 'watercraft',
    year: 2020,
    make: 'Kestrel',
    model: 'Skimmer 1500',
    otherId: 'KSR15219L920',
    meterUnit: 'h',
    meterReading: 155,
  },
  {
    key: 'fjell600',
    customerKey: 'otis',
    kind: 'atv',
    year: 2016,
    make: 'Norrland',
    model: 'Fjell 600',
    vinBody: '7V9NF600_GN507731',
    meterUnit: 'mi',
    meterReading: 6_200,
  },
  {
    key: 'quillback900',
    customerKey: 'wren',
    kind: 'motorcycle',
    year: 2023,
    make: 'Kestrel',
    model: 'Quillback 900',
    vinBody: '7V9KT900_PC118264',
    meterUnit: 'mi',
    meterReading: 3_150,
    specs: { pressureMinPsi: 41, pressureMaxPsi: 45, holdMaxDropPsi: 2, holdMinutes: 5, flowMinLph: 32 },
  },
  {
    key: 'scree450',
    customerKey: 'beck',
    kind: 'motorcycle',
    year: 2017,
    make: 'Tamarack',
    model: 'Scree 450',
    vinBody: '7V9TR450_HT339102',
    meterUnit: 'km',
    meterReading: 31_200,
  },
  {
    key: 'drift600',
    customerKey: 'lorna',
    kind: 'snowmobile',
    year: 2015,
    make: 'Norrland',
    model: 'Drift 600',
    vinBody: '7V9ND600_FN026618',
    meterUnit: 'km',
    meterReading: 9_800,
  },
  {
    key: 'gx7',
    customerKey: 'hollis',
    kind: 'small_engine',
    year: 2020,
    make: 'Norrland',
    model: 'Hearth 7000 generator',
    otherId: 'NH7-20-55120',
    meterUnit: 'h',
    meterReading: 430,
  },
  {
    key: 'spruce700',
    customerKey: 'hollis',
    kind: 'side_by_side',
    year: 2019,
    make: 'Tamarack',
    model: 'Sprucewood 700',
    vinBody: '7V9TS700_KT288054',
    meterUnit: 'mi',
    meterReading: 7_640,
  },
];

/** What the mechanic was called out for and what turned out to be wrong, by story. */
export type JobStory =
  | 'hold-fail'
  | 'clogged-filter'
  | 'no-prime-pump'
  | 'no-prime-relay'
  | 'low-voltage'
  | 'weak-battery'
  | 'service'
  | 'low-compression'
  | 'stale-fuel';

export const storyComplaints: Record<JobStory, string> = {
  'hold-fail': 'Cranks a long time before it fires, worst after sitting overnight.',
  'clogged-filter': 'Idles fine, then cuts out under load on the climb out of the trailhead.',
  'no-prime-pump': 'No start. No hum from the tank at key-on.',
  'no-prime-relay': 'Died on the trail and will not restart; no pump sound at key-on.',
  'low-voltage': 'Stumbles and hesitates when opening the throttle.',
  'weak-battery': 'Battery flat after a week parked; slow cranking.',
  service: 'Season service before storage.',
  'low-compression': 'Hard to start and down on power.',
  'stale-fuel': 'Will not idle since coming out of storage.',
};

/** Stories suited to each kind (a mower has no fuel pump to prime). */
export const storiesByKind: Record<MachineKind, JobStory[]> = {
  motorcycle: ['hold-fail', 'clogged-filter', 'no-prime-pump', 'low-voltage', 'weak-battery', 'service'],
  atv: ['clogged-filter', 'no-prime-relay', 'weak-battery', 'service', 'hold-fail'],
  side_by_side: ['clogged-filter', 'hold-fail', 'no-prime-relay', 'low-voltage', 'service'],
  snowmobile: ['stale-fuel', 'clogged-filter', 'weak-battery', 'service'],
  watercraft: ['stale-fuel', 'weak-battery', 'service', 'no-prime-pump'],
  small_engine: ['low-compression', 'stale-fuel', 'service'],
};

export const demoPlaces: Record<string, string[]> = {
  'Cinder Valley': ['customer driveway', 'Quarry Bend trailhead lot'],
  'Ashgrove Flats': ['customer garage', 'Flume Road pull-out'],
  'Pumice Ridge': ['customer shop', 'Ridge Loop staging area'],
  'Lantern Creek': ['boat ramp car park', 'customer dock'],
};

/**
 * The invented world of PRODUCT.md, widened to ten years of Ridgeback Mobile Moto's customers:
 * more people, more machines, more of the same made-up towns. Every name, make, model and place
 * here is made up (the makes are PRODUCT.md's own: Kestrel, Norrland, Tamarack).
 */
import type { MachineKind, MeterUnit } from '../../shared/api/machines';

export const FIRST_NAMES = [
  'Avery',
  'Blair',
  'Casey',
  'Dale',
  'Emery',
  'Finley',
  'Gray',
  'Harper',
  'Indra',
  'Jonah',
  'Kit',
  'Lane',
  'Marlo',
  'Noor',
  'Oren',
  'Pia',
  'Quinn',
  'Remy',
  'Sable',
  'Teo',
  'Uma',
  'Vale',
  'Wynn',
  'Yael',
  'Zeb',
  'Aurel',
  'Bram',
  'Cleo',
  'Dov',
  'Elke',
  'Fenn',
  'Gus',
  'Hale',
  'Ines',
  'Juno',
  'Kai',
  'Lior',
  'Mira',
  'Nils',
  'Odile',
  'Pell',
  'Rhea',
  'Soren',
  'Tam',
  'Ulla',
  'Vern',
  'Wilda',
  'Ximena',
  'Yusuf',
  'Zora',
] as const;

/** Surnames made from two invented halves, so none is taken from a real person. */
const SURNAME_HEADS = [
  'Brack',
  'Cal',
  'Dun',
  'Fen',
  'Gar',
  'Hollo',
  'Kes',
  'Lark',
  'Mor',
  'Nether',
  'Pell',
  'Quarr',
  'Rook',
  'Sedge',
  'Thorn',
  'Vell',
  'Wick',
  'Yarr',
] as const;
const SURNAME_TAILS = [
  'ridge',
  'wood',
  'ford',
  'stone',
  'by',
  'well',
  'mere',
  'holt',
  'ley',
  'croft',
  'wick',
  'brook',
] as const;
export const SURNAMES = SURNAME_HEADS.flatMap((head) => SURNAME_TAILS.map((tail) => `${head}${tail}`));

/** Towns: the demo's four (server/db/seed-data.ts) and four more, all invented. */
export const TOWNS: { name: string; streets: string[]; places: string[]; milesFromBase: [number, number] }[] =
  [
    {
      name: 'Cinder Valley',
      streets: ['Larkspur Lane', 'Cutbank Way', 'Cairn Lane', 'Quarry Bend Road', 'Clinker Street'],
      places: ['customer driveway', 'Quarry Bend trailhead lot'],
      milesFromBase: [1.5, 9],
    },
    {
      name: 'Ashgrove Flats',
      streets: ['Old Flume Road', 'Tinder Street', 'Flats Road', 'Kindling Court'],
      places: ['customer garage', 'Flume Road pull-out'],
      milesFromBase: [8, 19],
    },
    {
      name: 'Pumice Ridge',
      streets: ['Basalt Court', 'Ember Hollow', 'Ridge Loop', 'Scoria Drive'],
      places: ['customer shop', 'Ridge Loop staging area'],
      milesFromBase: [12, 26],
    },
    {
      name: 'Lantern Creek',
      streets: ['Shoreline Drive', 'Frostline Road', 'Wick Street', 'Creekside Row'],
      places: ['boat ramp car park', 'customer dock'],
      milesFromBase: [10, 22],
    },
    {
      name: 'Slate Hollow',
      streets: ['Shale Road', 'Cleft Lane', 'Hollow Bend'],
      places: ['customer barn', 'Hollow Bend turnout'],
      milesFromBase: [18, 34],
    },
    {
      name: 'Kettle Mesa',
      streets: ['Mesa Top Road', 'Kettle Drive', 'Rimrock Way'],
      places: ['ranch yard', 'Rimrock trail staging'],
      milesFromBase: [24, 42],
    },
    {
      name: 'Gorse Point',
      streets: ['Point Road', 'Heath Lane', 'Furze Court'],
      places: ['marina lot', 'customer driveway'],
      milesFromBase: [14, 30],
    },
    {
      name: 'Tallow Bend',
      streets: ['Bend Road', 'Chandler Way', 'Wax Mill Lane'],
      places: ['customer yard', 'Tallow Bend boat launch'],
      milesFromBase: [6, 16],
    },
  ];

/** Customers that keep a fleet: many machines, many visits. */
export const FLEET_CUSTOMERS: { name: string; town: string; machines: number; kinds: MachineKind[] }[] = [
  {
    name: 'Quarry Bend Trail Rides',
    town: 'Cinder Valley',
    machines: 34,
    kinds: ['atv', 'side_by_side', 'motorcycle'],
  },
  { name: 'Lantern Creek Dock Rentals', town: 'Lantern Creek', machines: 26, kinds: ['watercraft'] },
  {
    name: 'Pumice Ridge Parks Crew',
    town: 'Pumice Ridge',
    machines: 22,
    kinds: ['small_engine', 'side_by_side', 'atv'],
  },
  { name: 'Ashgrove Flats Snow Tours', town: 'Ashgrove Flats', machines: 24, kinds: ['snowmobile'] },
  {
    name: 'Kettle Mesa Ranch',
    town: 'Kettle Mesa',
    machines: 18,
    kinds: ['atv', 'side_by_side', 'motorcycle'],
  },
  { name: 'Slate Hollow Orchard', town: 'Slate Hollow', machines: 12, kinds: ['small_engine', 'atv'] },
];

export interface ModelLine {
  make: 'Kestrel' | 'Norrland' | 'Tamarack';
  model: string;
  /** Four VIN characters for positions 4–7 after the make letter (no I, O or Q). */
  vinCode: string;
  cylinders: number;
}

export const MODELS: Record<MachineKind, ModelLine[]> = {
  motorcycle: [
    { make: 'Kestrel', model: 'Quillback 650', vinCode: 'T650', cylinders: 2 },
    { make: 'Kestrel', model: 'Quillback 900', vinCode: 'T900', cylinders: 2 },
    { make: 'Kestrel', model: 'Talon 390', vinCode: 'L390', cylinders: 1 },
    { make: 'Tamarack', model: 'Scree 450', vinCode: 'R450', cylinders: 1 },
    { make: 'Tamarack', model: 'Birch 250', vinCode: 'B250', cylinders: 1 },
    { make: 'Norrland', model: 'Vidde 700', vinCode: 'V700', cylinders: 2 },
  ],
  atv: [
    { make: 'Tamarack', model: 'Larch 570', vinCode: 'L570', cylinders: 1 },
    { make: 'Tamarack', model: 'Larch 450', vinCode: 'L450', cylinders: 1 },
    { make: 'Norrland', model: 'Fjell 600', vinCode: 'F600', cylinders: 1 },
    { make: 'Norrland', model: 'Fjell 850', vinCode: 'F850', cylinders: 2 },
    { make: 'Kestrel', model: 'Burrow 500', vinCode: 'B500', cylinders: 1 },
  ],
  side_by_side: [
    { make: 'Tamarack', model: 'Sprucewood 1000', vinCode: 'S1K0', cylinders: 2 },
    { make: 'Tamarack', model: 'Sprucewood 700', vinCode: 'S700', cylinders: 2 },
    { make: 'Norrland', model: 'Kvarn 900', vinCode: 'K900', cylinders: 3 },
    { make: 'Kestrel', model: 'Hedgerow 800', vinCode: 'H800', cylinders: 2 },
  ],
  snowmobile: [
    { make: 'Norrland', model: 'Drift 600', vinCode: 'D600', cylinders: 2 },
    { make: 'Norrland', model: 'Drift 800', vinCode: 'D800', cylinders: 2 },
    { make: 'Kestrel', model: 'Frostback 850', vinCode: 'F850', cylinders: 2 },
    { make: 'Tamarack', model: 'Powderline 650', vinCode: 'P650', cylinders: 3 },
  ],
  watercraft: [
    { make: 'Kestrel', model: 'Skimmer 1100', vinCode: 'S110', cylinders: 3 },
    { make: 'Kestrel', model: 'Skimmer 1500', vinCode: 'S150', cylinders: 3 },
    { make: 'Norrland', model: 'Brygge 1300', vinCode: 'B130', cylinders: 3 },
  ],
  small_engine: [
    { make: 'Tamarack', model: 'Yardline 22 mower', vinCode: 'Y220', cylinders: 1 },
    { make: 'Tamarack', model: 'Yardline 30 mower', vinCode: 'Y300', cylinders: 2 },
    { make: 'Norrland', model: 'Hearth 7000 generator', vinCode: 'H700', cylinders: 1 },
    { make: 'Norrland', model: 'Hearth 3500 generator', vinCode: 'H350', cylinders: 1 },
    { make: 'Kestrel', model: 'Sprig 160 tiller', vinCode: 'S160', cylinders: 1 },
  ],
};

/** How often each kind turns up among private customers' machines (weights). */
export const KIND_WEIGHTS: Record<MachineKind, number> = {
  motorcycle: 26,
  atv: 20,
  side_by_side: 16,
  snowmobile: 12,
  watercraft: 10,
  small_engine: 16,
};

/** Meter units by kind, with the share of the first one. */
export const METER_BY_KIND: Record<MachineKind, { first: MeterUnit; share: number; other: MeterUnit }> = {
  motorcycle: { first: 'mi', share: 0.8, other: 'km' },
  atv: { first: 'h', share: 0.7, other: 'mi' },
  side_by_side: { first: 'h', share: 0.85, other: 'mi' },
  snowmobile: { first: 'mi', share: 0.75, other: 'km' },
  watercraft: { first: 'h', share: 1, other: 'h' },
  small_engine: { first: 'h', share: 1, other: 'h' },
};

/** Use per year in the machine's meter unit: [low, high] (hours, or miles / km). */
export const USE_PER_YEAR: Record<MeterUnit, [number, number]> = {
  mi: [900, 6_500],
  km: [1_500, 10_000],
  h: [25, 220],
};

/** Where the van goes when it is not at a job (trips with no job). */
export const ERRANDS = [
  { destination: 'Clinker Street parts counter, Cinder Valley', purpose: 'Parts pick-up' },
  { destination: 'Ashgrove Flats freight depot', purpose: 'Collect a shipped part' },
  { destination: 'Pumice Ridge tyre and battery supply', purpose: 'Batteries and consumables' },
];

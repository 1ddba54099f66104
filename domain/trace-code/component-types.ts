// Component type codes of ASTM F2897-23a Table 5 (positions 11–12 of the code), every code
// the table lists and no other. Labels are "group, kind" in plain words.
//
// Status (of the code and its label): 'confirmed' where both were read in the text of
// F2897-23a (pipe 10–13, couplings 20/21/23/25, end cap 41, elbows 51/5A, tee 61, reducer 71,
// tapping tee 81, valve V1, excess-flow valve EF); 'confirmed-2nd' for the rest, read only in
// a public reproduction of Table 5 kept beside a public copy of the standard. For 1A–1M,
// T0–T3, TX and R0–R6 the codes themselves were read in the text but their individual
// meanings only in the reproduction, so their labels are 'confirmed-2nd'. The letter codes
// skip I and O where the table does (1I, 5I, 8I, 8O are not codes).

import type { ValueStatus } from '@/domain/sources';

export interface ComponentType {
  code: string;
  /** Table 5 group, e.g. 'coupling', 'transition fitting'. */
  group: string;
  /** "group, kind", e.g. 'coupling, electrofusion'. */
  label: string;
  status: ValueStatus;
}

type Row = readonly [code: string, kind: string];

const CONFIRMED_IN_TEXT = new Set(['10', '11', '12', '13', '20', '21', '23', '25', '41', '51', '5A', '61', '71', '81', 'V1', 'EF']);

// Joining kinds shared by end caps, elbows, tees and reducers (Table 5 rows x0–x9).
const FITTING_KINDS = [
  'other', 'butt fusion', 'socket fusion', 'electrofusion', 'mechanical compression or nut follower',
  'mechanical stab', 'mechanical interference fit', 'welded', 'threaded', 'fabricated',
] as const;
const fittingRows = (first: string): Row[] => FITTING_KINDS.map((kind, i) => [`${first}${i}`, kind]);

const GROUPS: readonly { group: string; rows: readonly Row[] }[] = [
  {
    group: 'pipe',
    rows: [
      ['10', 'other'], ['11', 'straight'], ['12', 'coiled'], ['13', 'casing'],
      ['1A', 'steel line pipe, seamless, API 5L PSL1, single coat'],
      ['1B', 'steel line pipe, seamless, API 5L PSL1, dual coat'],
      ['1C', 'steel line pipe, seamless, API 5L PSL2, single coat'],
      ['1D', 'steel line pipe, seamless, API 5L PSL2, dual coat'],
      ['1E', 'steel line pipe, electric resistance welded, API 5L PSL1, single coat'],
      ['1F', 'steel line pipe, electric resistance welded, API 5L PSL1, dual coat'],
      ['1G', 'steel line pipe, electric resistance welded, API 5L PSL2, single coat'],
      ['1H', 'steel line pipe, electric resistance welded, API 5L PSL2, dual coat'],
      ['1J', 'steel pipe, seamless and welded, ASTM A53/A53M'],
      ['1K', 'steel pipe, seamless carbon steel, ASTM A106/A106M'],
      ['1L', 'steel line pipe, high-frequency welded, API 5L PSL2, single coat'],
      ['1M', 'steel line pipe, high-frequency welded, API 5L PSL2, dual coat'],
    ],
  },
  {
    group: 'coupling',
    rows: [
      ['20', 'other'], ['21', 'socket fusion'], ['22', 'socket fusion with excess-flow valve'],
      ['23', 'electrofusion'], ['24', 'electrofusion with excess-flow valve'],
      ['25', 'mechanical compression or nut follower'], ['26', 'mechanical compression or nut follower with excess-flow valve'],
      ['27', 'mechanical stab'], ['28', 'mechanical stab with excess-flow valve'],
      ['29', 'mechanical interference fit'], ['2A', 'mechanical interference fit with excess-flow valve'],
      ['2B', 'welded'], ['2C', 'threaded'], ['2D', 'flanged'],
    ],
  },
  {
    group: 'adapter coupling',
    rows: [
      ['30', 'other'], ['31', 'compression by male pipe thread'], ['32', 'compression by female pipe thread'],
      ['33', 'compression by butt fusion'], ['34', 'compression by butt weld'], ['35', 'compression by solvent weld'],
      ['36', 'stab by male pipe thread'], ['37', 'stab by female pipe thread'], ['38', 'stab by solvent weld'],
      ['39', 'compression by stab'],
    ],
  },
  { group: 'end cap', rows: fittingRows('4') },
  {
    group: 'elbow',
    rows: [
      ...fittingRows('5').map(([code, kind]): Row => [code, code === '50' ? kind : `${kind} 90°`]),
      ['5A', 'butt fusion 45°'], ['5B', 'socket fusion 45°'], ['5C', 'electrofusion 45°'],
      ['5D', 'mechanical compression or nut follower 45°'], ['5E', 'mechanical stab 45°'],
      ['5F', 'mechanical interference fit 45°'], ['5G', 'welded 45°'], ['5H', 'threaded 45°'], ['5J', 'fabricated 45°'],
    ],
  },
  { group: 'tee', rows: fittingRows('6') },
  { group: 'reducer', rows: fittingRows('7') },
  {
    group: 'tapping tee',
    rows: [
      ['80', 'other'],
      ['81', 'saddle heat fusion with butt-fusion outlet'], ['82', 'saddle heat fusion with butt-fusion outlet and excess-flow valve'],
      ['83', 'saddle heat fusion with socket outlet'], ['84', 'saddle heat fusion with socket outlet and excess-flow valve'],
      ['85', 'saddle heat fusion with mechanical compression outlet'], ['86', 'saddle heat fusion with mechanical compression outlet and excess-flow valve'],
      ['87', 'saddle heat fusion with stab outlet'], ['88', 'saddle heat fusion with stab outlet and excess-flow valve'],
      ['89', 'electrofusion with butt-fusion outlet'], ['8A', 'electrofusion with butt-fusion outlet and excess-flow valve'],
      ['8B', 'electrofusion with socket outlet'], ['8C', 'electrofusion with socket outlet and excess-flow valve'],
      ['8D', 'electrofusion with mechanical compression outlet'], ['8E', 'electrofusion with mechanical compression outlet and excess-flow valve'],
      ['8F', 'electrofusion with stab outlet'], ['8G', 'electrofusion with stab outlet and excess-flow valve'],
      ['8H', 'mechanical with butt-fusion outlet'], ['8J', 'mechanical with butt-fusion outlet and excess-flow valve'],
      ['8K', 'mechanical with socket outlet'], ['8L', 'mechanical with socket outlet and excess-flow valve'],
      ['8M', 'mechanical with mechanical compression outlet'], ['8N', 'mechanical with mechanical compression outlet and excess-flow valve'],
      ['8P', 'mechanical with stab outlet'], ['8Q', 'mechanical with stab outlet and excess-flow valve'],
      ['8R', 'mechanical with mechanical interference fit outlet'], ['8S', 'mechanical with mechanical interference fit outlet and excess-flow valve'],
    ],
  },
  {
    group: 'high-volume tapping tee',
    rows: [
      ['90', 'other'], ['91', 'electrofusion with butt-fusion outlet'], ['92', 'saddle heat fusion with butt-fusion outlet'],
      ['93', 'mechanical with compression outlet'], ['94', 'electrofusion with socket outlet'],
      ['95', 'saddle heat fusion with socket outlet'], ['96', 'mechanical with stab outlet'],
      ['97', 'mechanical with mechanical interference fit outlet'],
    ],
  },
  { group: 'branch saddle', rows: [['B0', 'other'], ['B1', 'electrofusion'], ['B2', 'saddle heat fusion'], ['B3', 'mechanical']] },
  { group: 'mechanical saddle', rows: [['S1', 'no outlet']] },
  {
    group: 'service tee',
    rows: [
      ['D0', 'other'], ['D1', 'welded by welded'], ['D2', 'welded by butt fusion'], ['D3', 'welded by thread'],
      ['D4', 'welded by compression or nut follower'], ['D5', 'welded by mechanical interference fit'], ['DD', 'welded by stab'],
      ['D6', 'thread by welded'], ['D7', 'thread by compression or nut follower'], ['DE', 'thread by mechanical interference fit'],
      ['DF', 'thread by stab'], ['DG', 'thread by thread'], ['DH', 'thread by butt fusion'],
      ['D8', 'mechanical saddle by welded'], ['D9', 'mechanical saddle by butt fusion'], ['DA', 'mechanical saddle by thread'],
      ['DB', 'mechanical saddle by compression or nut follower'], ['DC', 'mechanical saddle by mechanical interference fit'],
      ['DJ', 'mechanical saddle by stab'],
    ],
  },
  { group: 'service saddle', rows: [['E0', 'other'], ['E1', 'single strap'], ['E2', 'double strap']] },
  {
    group: 'flange',
    rows: [
      ['FH', 'other'], ['FB', 'blind'], ['FL', 'lap joint'], ['FX', 'socket weld'], ['FS', 'slip-on'],
      ['FT', 'threaded'], ['FW', 'weld neck'], ['FP', 'PE flange adapter assembly'],
    ],
  },
  {
    group: 'transition fitting',
    rows: [['T0', 'other'], ['T1', 'welded end'], ['T2', 'threaded end'], ['T3', 'flanged end'], ['TX', 'socket weld by butt fusion']],
  },
  {
    group: 'riser',
    rows: [
      ['R0', 'other'], ['R1', 'factory assembled, anodeless'], ['R2', 'factory assembled, anodeless, flexible'],
      ['R3', 'factory assembled, not anodeless'], ['R4', 'field assembled, anodeless'],
      ['R5', 'field assembled, anodeless, flexible'], ['R6', 'field assembled, not anodeless'],
    ],
  },
  {
    group: 'valve',
    rows: [
      ['V0', 'other'], ['V1', 'ball'], ['V2', 'butterfly'], ['V3', 'check'], ['V4', 'relief'],
      ['V5', 'gate'], ['V6', 'needle'], ['V7', 'plug'],
    ],
  },
  {
    group: 'meter set',
    rows: [
      ['M0', 'other'], ['M1', 'diaphragm meter'], ['M2', 'rotary meter'], ['M3', 'meter set assembly'], ['M4', 'meter bar'],
      ['M5', 'meter swivel'], ['M6', 'meter nut'], ['M7', 'ultrasonic meter'], ['M8', 'turbine meter'], ['M9', 'remote shut-off meter'],
    ],
  },
  { group: 'regulator', rows: [['RX', 'other'], ['RP', 'pilot'], ['RS', 'service'], ['RR', 'relief']] },
  { group: 'filter', rows: [['F0', 'other'], ['F1', 'pilot'], ['F2', 'service and mains'], ['F3', 'strainer']] },
  { group: 'anode', rows: [['A0', 'other'], ['A1', 'cast iron'], ['A2', 'graphite'], ['A3', 'magnesium'], ['A4', 'zinc']] },
  { group: 'pressure control fitting', rows: [['P0', 'other'], ['P1', 'split repair'], ['P2', 'bottom out'], ['P3', 'top tap']] },
  { group: 'union', rows: [['U1', 'not insulated'], ['UX', 'insulated']] },
  { group: 'repair clamp', rows: [['C0', 'other'], ['C1', 'repair clamp']] },
];

// Codes whose label is the group alone (the table names no kind beside the group).
const GROUP_ONLY_LABELS: Readonly<Record<string, string>> = { EF: 'excess-flow valve' };

/** Every ASTM F2897-23a Table 5 code, keyed by code. */
export const COMPONENT_TYPES: Readonly<Record<string, ComponentType>> = Object.fromEntries([
  ...GROUPS.flatMap(({ group, rows }) =>
    rows.map(([code, kind]): [string, ComponentType] => [
      code,
      { code, group, label: `${group}, ${kind}`, status: CONFIRMED_IN_TEXT.has(code) ? 'confirmed' : 'confirmed-2nd' },
    ]),
  ),
  ...Object.entries(GROUP_ONLY_LABELS).map(([code, label]): [string, ComponentType] => [
    code,
    { code, group: label, label, status: CONFIRMED_IN_TEXT.has(code) ? 'confirmed' : 'confirmed-2nd' },
  ]),
]);

/** Code → label, e.g. '12' → 'pipe, coiled', 'TX' → 'transition fitting, socket weld by butt fusion'. */
export const COMPONENT_TYPE_CODES: Readonly<Record<string, string>> = Object.fromEntries(
  Object.values(COMPONENT_TYPES).map((type) => [type.code, type.label]),
);

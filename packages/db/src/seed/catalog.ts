import type { ReelKind, ServiceType, StepGroup } from '../schema/enums';

// Invented makers, models, parts and wording. No real brands or products.

export const FIRST_NAMES = [
  'Ada',
  'Abel',
  'Alma',
  'Amos',
  'Anya',
  'Arlo',
  'Bea',
  'Bram',
  'Cal',
  'Cleo',
  'Cora',
  'Dax',
  'Della',
  'Eben',
  'Edie',
  'Elio',
  'Elsa',
  'Ezra',
  'Fern',
  'Finn',
  'Flora',
  'Gus',
  'Greta',
  'Hal',
  'Hattie',
  'Ike',
  'Ines',
  'Ivo',
  'Jada',
  'Jem',
  'Juno',
  'Kai',
  'Kit',
  'Lark',
  'Levi',
  'Lina',
  'Lou',
  'Mabel',
  'Milo',
  'Nell',
  'Nico',
  'Noor',
  'Otis',
  'Opal',
  'Pax',
  'Pearl',
  'Quinn',
  'Rafe',
  'Rhea',
  'Rollo',
  'Rosa',
  'Sage',
  'Seth',
  'Sol',
  'Tess',
  'Theo',
  'Uma',
  'Vera',
  'Wade',
  'Wren',
  'Xavi',
  'Yara',
  'Zeke',
  'Zola',
  'Bo',
  'Dot',
  'Ned',
  'Ruby',
  'Tate',
];

export const LAST_NAMES = [
  'Ashgrove',
  'Barrowcliff',
  'Bellwether',
  'Birchall',
  'Brackenridge',
  'Caddick',
  'Calloway',
  'Cobbledick',
  'Coldharbour',
  'Dunmore',
  'Eastwick',
  'Fairweather',
  'Fenwick',
  'Gallowglass',
  'Greenhalgh',
  'Hartigan',
  'Holloway',
  'Inchcape',
  'Jessop',
  'Kettleby',
  'Lamplough',
  'Marlowe',
  'Merriweather',
  'Netherby',
  'Oakenshaw',
  'Pennock',
  'Quarrington',
  'Redfern',
  'Rowntree',
  'Saltonstall',
  'Scarrow',
  'Shellgrove',
  'Stonebridge',
  'Tarrant',
  'Thistlewood',
  'Underhill',
  'Vantreight',
  'Wainscott',
  'Whitlock',
  'Winterbourne',
  'Yarwood',
  'Abercrombie',
  'Blakemore',
  'Cresswell',
  'Dovecote',
  'Ellery',
  'Fothergill',
  'Gorringe',
  'Hazeldine',
  'Ironmonger',
  'Juniper',
  'Kingsmill',
  'Longstaff',
  'Mossop',
  'Northcott',
  'Ormerod',
  'Pickering',
  'Ravensworth',
  'Sowerby',
  'Tolhurst',
  'Uttley',
  'Villiers',
  'Westerman',
];

export interface ReelModel {
  maker: string;
  model: string;
  sizes: readonly string[];
  bearings: readonly number[];
  ratios: readonly string[];
}

export const REEL_MODELS: Record<ReelKind, readonly ReelModel[]> = {
  spinning: [
    {
      maker: 'Brinemark',
      model: 'Surfrunner',
      sizes: ['3000', '4000', '5000', '6000'],
      bearings: [6, 7, 8],
      ratios: ['5.2:1', '5.7:1'],
    },
    {
      maker: 'Tidewright',
      model: 'Jetty SX',
      sizes: ['2500', '3000', '4000'],
      bearings: [5, 6],
      ratios: ['6.2:1', '5.8:1'],
    },
    {
      maker: 'Kestrel Forge',
      model: 'Moorlark 25',
      sizes: ['1000', '2000', '2500'],
      bearings: [7, 9],
      ratios: ['6.0:1', '6.2:1'],
    },
    {
      maker: 'Gullwing',
      model: 'Saltgrass',
      sizes: ['4000', '5000', '8000'],
      bearings: [5, 6],
      ratios: ['4.9:1', '5.3:1'],
    },
    {
      maker: 'Copperhook',
      model: 'Riverbend',
      sizes: ['1500', '2500', '3000'],
      bearings: [4, 5],
      ratios: ['5.1:1', '5.5:1'],
    },
  ],
  baitcasting: [
    {
      maker: 'Oxbow & Pine',
      model: 'Creekshadow',
      sizes: ['100', '150', '200'],
      bearings: [7, 8, 10],
      ratios: ['6.4:1', '7.1:1', '8.1:1'],
    },
    {
      maker: 'Kestrel Forge',
      model: 'Ashbeck LP',
      sizes: ['100', '150'],
      bearings: [9, 11],
      ratios: ['7.3:1', '8.3:1'],
    },
    {
      maker: 'Fathomline',
      model: 'Redfish Round',
      sizes: ['200', '300', '400'],
      bearings: [5, 6],
      ratios: ['5.3:1', '6.2:1'],
    },
  ],
  conventional: [
    {
      maker: 'Fathomline',
      model: 'Deepwell',
      sizes: ['20', '30', '50'],
      bearings: [3, 4, 5],
      ratios: ['3.9:1', '4.3:1'],
    },
    {
      maker: 'Wrackline',
      model: 'Star Drag Classic',
      sizes: ['12', '16', '25'],
      bearings: [2, 3],
      ratios: ['4.2:1', '5.1:1'],
    },
    {
      maker: 'Brinemark',
      model: 'Quayhollow 40',
      sizes: ['30', '40'],
      bearings: [3, 4],
      ratios: ['3.5:1', '4.1:1'],
    },
  ],
  lever_drag: [
    {
      maker: 'Quillon Reelworks',
      model: 'Ironside LD',
      sizes: ['12', '16', '30W', '50W'],
      bearings: [5, 6, 7],
      ratios: ['4.5:1', '6.0:1'],
    },
    {
      maker: 'Wrackline',
      model: 'Bluewater Two-Speed',
      sizes: ['30', '50', '80'],
      bearings: [6, 8],
      ratios: ['4.1:1', '5.1:1'],
    },
  ],
  fly: [
    {
      maker: 'Marrowby',
      model: 'Feather Arbor',
      sizes: ['3/4', '5/6', '7/8'],
      bearings: [0, 1],
      ratios: ['1:1'],
    },
    {
      maker: 'Northfen',
      model: 'Sealed Drag Cassette',
      sizes: ['5/6', '7/8', '9/10', '11/12'],
      bearings: [1, 2],
      ratios: ['1:1'],
    },
  ],
  spincast: [
    {
      maker: 'Copperhook',
      model: 'Thumbstart',
      sizes: ['10', '20', '30'],
      bearings: [1, 2],
      ratios: ['3.6:1', '4.1:1'],
    },
    {
      maker: 'Gullwing',
      model: 'Pushbutton Pal',
      sizes: ['20', '30'],
      bearings: [1, 2, 3],
      ratios: ['3.8:1', '4.3:1'],
    },
  ],
};

export interface PartDef {
  name: string;
  partNumber: string;
  priceCents: number;
  /** Parts that are usually not on the shelf. */
  special: boolean;
  kinds?: readonly ReelKind[];
}

export const PARTS: readonly PartDef[] = [
  { name: 'Carbon drag washer set', partNumber: 'SSR-DW-210', priceCents: 1450, special: false },
  {
    name: 'Shielded ball bearing 3×10×4',
    partNumber: 'SSR-BB-3104',
    priceCents: 650,
    special: false,
  },
  {
    name: 'Shielded ball bearing 5×11×4',
    partNumber: 'SSR-BB-5114',
    priceCents: 700,
    special: false,
  },
  { name: 'Anti-reverse roller clutch', partNumber: 'SSR-AR-440', priceCents: 2350, special: true },
  {
    name: 'Bail spring',
    partNumber: 'SSR-BS-118',
    priceCents: 450,
    special: false,
    kinds: ['spinning'],
  },
  {
    name: 'Line roller bearing',
    partNumber: 'SSR-LR-082',
    priceCents: 900,
    special: false,
    kinds: ['spinning'],
  },
  { name: 'Handle knob', partNumber: 'SSR-HK-301', priceCents: 1200, special: false },
  { name: 'Handle cap', partNumber: 'SSR-HC-020', priceCents: 350, special: false },
  { name: 'Pinion gear', partNumber: 'SSR-PG-615', priceCents: 2800, special: true },
  { name: 'Main drive gear', partNumber: 'SSR-MG-720', priceCents: 4200, special: true },
  { name: 'Click spring', partNumber: 'SSR-CS-044', priceCents: 300, special: false },
  {
    name: 'Level-wind pawl',
    partNumber: 'SSR-LW-133',
    priceCents: 750,
    special: true,
    kinds: ['baitcasting', 'conventional'],
  },
  { name: 'Spool shaft E-clip', partNumber: 'SSR-EC-005', priceCents: 150, special: false },
  {
    name: 'Centrifugal brake block set',
    partNumber: 'SSR-BR-260',
    priceCents: 850,
    special: true,
    kinds: ['baitcasting'],
  },
  {
    name: 'Lever drag pressure plate',
    partNumber: 'SSR-LD-910',
    priceCents: 3900,
    special: true,
    kinds: ['lever_drag'],
  },
  {
    name: 'Fly drag cassette seal',
    partNumber: 'SSR-FD-077',
    priceCents: 1650,
    special: true,
    kinds: ['fly'],
  },
  {
    name: 'Spincast pickup pin set',
    partNumber: 'SSR-SP-012',
    priceCents: 550,
    special: false,
    kinds: ['spincast'],
  },
  { name: 'Spool shaft', partNumber: 'SSR-SS-505', priceCents: 3100, special: true },
];

export const COMPLAINTS: Record<ServiceType, readonly string[]> = {
  tune_up: [
    'Pre-season service, no problems noticed.',
    'Feels a bit rough; wants it cleaned before the season.',
    'Yearly service.',
    'Used all season in salt; wants it cleaned and greased.',
    'Drag feels sticky at the start of a run.',
  ],
  overhaul: [
    'Full service: grinding when cranking under load.',
    'Dropped in the surf; sand inside.',
    'Has not been serviced in years; stiff handle.',
    'Salt crust around the rotor; bail sluggish.',
  ],
  repair: [
    'Handle spins backwards: anti-reverse slipping.',
    'Clicking noise every turn.',
    'Drag jerks and slips under load.',
    'Bail does not close after casting.',
    'Level wind stops halfway across.',
    'Handle wobbles; knob loose.',
  ],
  parts_install: [
    'Customer brought a replacement handle knob to fit.',
    'Fit a spare spool and new drag washers.',
    'Replace the line roller.',
  ],
};

export const CONDITIONS = [
  'Light salt residue, cosmetic scuffs.',
  'Good overall; minor rash on the spool lip.',
  'Heavy corrosion on the rotor nut.',
  'Sand in the line roller; paint chipped on the side plate.',
  'Clean, well kept.',
  'Grease old and dark; handle cap cracked.',
];

export const FINDINGS = [
  'Grease dried out; cleaned and re-greased.',
  'Seized line roller bearing; replaced.',
  'Drag washers glazed; replaced with a new carbon set.',
  'Chipped tooth on the pinion gear; replaced.',
  'Anti-reverse clutch worn; replaced.',
  'Cracked handle cap; replaced.',
  'Bearings gritty; cleaned, two replaced.',
  'Bail spring weak; replaced.',
  'Corrosion under the side plate; cleaned and sealed.',
  'All in order after cleaning; advised yearly service.',
];

export const RETURN_SYMPTOMS = [
  'Drag slipping again under load.',
  'Grinding noise back within weeks of the service.',
  'Handle back-play: anti-reverse slipping again.',
  'Bail will not stay open.',
  'Reel feels dry and rough already.',
  'Clicking noise every turn since the service.',
];

export interface RootCauseDef {
  code: string;
  label: string;
}

export const ROOT_CAUSES: readonly RootCauseDef[] = [
  { code: 'lubrication_missed', label: 'Lubrication missed' },
  { code: 'drag_stack_not_serviced', label: 'Drag stack not serviced' },
  { code: 'bearing_not_replaced', label: 'Bearing not replaced' },
  { code: 'reassembly_error', label: 'Reassembly error' },
  { code: 'wrong_part', label: 'Wrong part' },
  { code: 'part_defect', label: 'Part defect' },
  { code: 'salt_intrusion', label: 'Salt water intrusion (not rinsed)' },
  { code: 'other', label: 'Other' },
];

export interface StepDef {
  group: StepGroup;
  code: string;
  title: string;
  instructions: string;
  safetyCaution?: string;
  required: boolean;
  appliesTo?: readonly ReelKind[];
}

const SDS = "Follow the product's safety data sheet and local regulations.";
const GLOVES =
  'Wear chemical-resistant gloves and work with good ventilation when using degreasers and ' +
  `solvents. ${SDS}`;
const FLAMMABLE =
  'Most degreasers and solvents are flammable: keep them away from flames, heaters, hot ' +
  'tools and sparks, and close the container between uses. ' +
  GLOVES;
const AIR =
  'If you dry with compressed air, wear eye protection, keep the pressure within what local ' +
  'rules allow, never spin a bearing with the air jet (it can burst) and never point the nozzle ' +
  'at skin; or let parts air-dry on a clean rack. ' +
  GLOVES;
const GREASE =
  'Reel grease and oil irritate skin with repeated contact: wear nitrile gloves, wipe spills and ' +
  `wash your hands before eating or smoking. ${SDS}`;
const EYES =
  'Wear eye protection when releasing springs (bail, click and anti-reverse springs, drag ' +
  'springs): they can fly out under tension. Work over a parts tray.';
const HOOKS =
  'Reels often arrive with hooks or lures still tied on: remove and cap them before handling ' +
  'the reel, cut line away from your body with a line cutter and put the cut line in a closed bin.';
const THREAD_LOCKER =
  'Thread-locker can irritate skin and eyes: use it sparingly, wear gloves and follow its ' +
  'safety data sheet. ' +
  EYES;
const LINE_UNDER_LOAD =
  'Line under load can snap back: wear eye protection, keep your face out of the line of pull ' +
  'and never wrap line around your hand.';
const DISPOSAL =
  'Collect used solvent and soaked rags in a closed, labelled metal container and dispose of ' +
  'them as local regulations require; oily rags can heat up and catch fire.';

export const SAFETY_NOTICE =
  'Degreasers and solvents, springs under tension, hooks, grease, compressed air, line under load ' +
  'and small parts can hurt people. The cautions ' +
  "below are the usual ones; the product's safety data sheets, local regulations and licensed " +
  'practice come first.';

export const STANDARD_STEPS: readonly StepDef[] = [
  {
    group: 'teardown',
    code: 'teardown.photograph',
    title: 'Photograph the reel before and during teardown',
    instructions: 'Take check-in and teardown photos so the reel can be put back together exactly.',
    safetyCaution: HOOKS,
    required: true,
  },
  {
    group: 'teardown',
    code: 'teardown.disassemble',
    title: 'Disassemble to component level, laying parts out in order',
    instructions: 'Use the exploded view for the model; bag and label small parts.',
    safetyCaution: EYES,
    required: true,
  },
  {
    group: 'cleaning',
    code: 'cleaning.degrease',
    title: 'Degrease gears, frame and spool shaft',
    instructions: 'Remove all old grease and salt; dry completely before lubricating.',
    safetyCaution: FLAMMABLE,
    required: true,
  },
  {
    group: 'cleaning',
    code: 'cleaning.bearings',
    title: 'Clean and spin-check every bearing',
    instructions: 'Replace any bearing that stays gritty or rough after cleaning.',
    safetyCaution: AIR,
    required: true,
  },
  {
    group: 'cleaning',
    code: 'cleaning.disposal',
    title: 'Dispose of used solvent and rags',
    instructions: 'Close the solvent container and the rag bin before moving on.',
    safetyCaution: DISPOSAL,
    required: true,
  },
  {
    group: 'inspection',
    code: 'inspection.gears',
    title: 'Inspect main and pinion gears for wear and chipped teeth',
    instructions: 'Check the mesh by hand; note any wear in the findings.',
    required: true,
    appliesTo: ['spinning', 'baitcasting', 'conventional', 'lever_drag', 'spincast'],
  },
  {
    group: 'inspection',
    code: 'inspection.anti_reverse',
    title: 'Check the anti-reverse engages with no back-play',
    instructions: 'Replace a slipping clutch; never grease a roller clutch.',
    safetyCaution: EYES,
    required: true,
    appliesTo: ['spinning', 'baitcasting', 'conventional', 'lever_drag', 'spincast'],
  },
  {
    group: 'inspection',
    code: 'inspection.bail',
    title: 'Check the bail spring and trip',
    instructions: 'The bail must flip closed crisply with the handle.',
    safetyCaution: EYES,
    required: true,
    appliesTo: ['spinning'],
  },
  {
    group: 'inspection',
    code: 'inspection.line_roller',
    title: 'Inspect the line roller and its bearing',
    instructions: 'It must spin freely; a seized roller cuts line.',
    required: true,
    appliesTo: ['spinning'],
  },
  {
    group: 'inspection',
    code: 'inspection.level_wind',
    title: 'Inspect the level wind and pawl',
    instructions: 'Clean the worm shaft; check the pawl for a flat spot.',
    required: true,
    appliesTo: ['baitcasting', 'conventional'],
  },
  {
    group: 'lubrication',
    code: 'lubrication.gears',
    title: 'Grease gears with reel-specific grease',
    instructions: 'A thin, even film; excess grease slows the reel and collects grit.',
    safetyCaution: GREASE,
    required: true,
    appliesTo: ['spinning', 'baitcasting', 'conventional', 'lever_drag', 'spincast'],
  },
  {
    group: 'lubrication',
    code: 'lubrication.bearings',
    title: 'Oil bearings and bushings with light reel oil',
    instructions: 'One drop per bearing; no grease in cast-control bearings.',
    safetyCaution: GREASE,
    required: true,
  },
  {
    group: 'drag',
    code: 'drag.washers',
    title: 'Service the drag washers',
    instructions: 'Clean, then re-grease carbon washers with drag grease or replace glazed ones.',
    safetyCaution: GREASE,
    required: true,
  },
  {
    group: 'drag',
    code: 'drag.stack_order',
    title: 'Rebuild the drag stack in order and check it runs smoothly',
    instructions:
      'Follow the stack order on the exploded view; no washer may be skipped or flipped.',
    required: true,
  },
  {
    group: 'drag',
    code: 'drag.setting',
    title: 'Check the drag range with a scale',
    instructions: 'Record the maximum drag; it must be smooth across the range.',
    safetyCaution: LINE_UNDER_LOAD,
    required: true,
  },
  {
    group: 'reassembly',
    code: 'reassembly.reassemble',
    title: 'Reassemble and tighten screws as specified',
    instructions: 'Thread-locker only where the maker calls for it.',
    safetyCaution: THREAD_LOCKER,
    required: true,
  },
  {
    group: 'reassembly',
    code: 'reassembly.photograph',
    title: 'Photograph the reassembled reel',
    instructions: 'One photo of each side.',
    required: false,
  },
  {
    group: 'test_crank',
    code: 'test_crank.under_load',
    title: 'Test-crank under load',
    instructions: 'Listen for noise; check drag, anti-reverse and bail or level wind once more.',
    safetyCaution: LINE_UNDER_LOAD,
    required: true,
  },
  {
    group: 'test_crank',
    code: 'test_crank.advice',
    title: 'Record findings and advise the service interval',
    instructions:
      'About once a year for light use; start, middle and end of the season for hard use.',
    required: false,
  },
];

export interface AuditItemDef {
  code: string;
  title: string;
  guidance: string;
  weight: number;
  critical: boolean;
}

export const AUDIT_ITEMS: readonly AuditItemDef[] = [
  {
    code: 'checkin.complete',
    title: 'Check-in record complete',
    guidance: 'Complaint, condition and reel details recorded.',
    weight: 8,
    critical: false,
  },
  {
    code: 'photos.teardown',
    title: 'Teardown photos show the layout before cleaning',
    guidance: 'At least one photo at teardown.',
    weight: 8,
    critical: false,
  },
  {
    code: 'checklist.complete',
    title: 'Every required checklist step ticked, or a reason given',
    guidance: 'Compare the ticks with the standard version of the job.',
    weight: 12,
    critical: false,
  },
  {
    code: 'drag.serviced',
    title: 'Drag stack serviced and drag range checked',
    guidance: 'Drag steps ticked, and photos or findings show the washers.',
    weight: 14,
    critical: true,
  },
  {
    code: 'lubrication.correct',
    title: 'Reel-specific grease and oil used as the standard says',
    guidance: 'Findings or photos show the lubrication.',
    weight: 10,
    critical: false,
  },
  {
    code: 'parts.recorded',
    title: 'Replaced parts recorded with part numbers and prices',
    guidance: 'Every part in the findings appears as a part line.',
    weight: 8,
    critical: false,
  },
  {
    code: 'findings.recorded',
    title: 'Findings written up in plain words for the customer',
    guidance: 'What was found and what was done.',
    weight: 8,
    critical: false,
  },
  {
    code: 'test_crank.recorded',
    title: 'Test crank under load recorded',
    guidance: 'The test-crank step is ticked before ready.',
    weight: 10,
    critical: true,
  },
  {
    code: 'safety.disposal',
    title: 'Solvents and rags disposed of as the standard says',
    guidance: 'The disposal step is ticked.',
    weight: 10,
    critical: true,
  },
  {
    code: 'billing.correct',
    title: 'Labour, parts and discount add up to the charge',
    guidance: 'Labour follows the posted rate or the flat price.',
    weight: 12,
    critical: false,
  },
];

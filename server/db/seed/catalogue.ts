import type { CureProfileJson, HazardsJson } from '../schema/catalogue';
import type { MaterialKind, StorageClass } from '../../../shared/constants';

/**
 * The invented demo plant: "Halvard Bay Driver Works" and its invented suppliers.
 * Every name here is made up for the demo.
 */
export const PLANT_NAME = 'Halvard Bay Driver Works';

export const DEMO_SUPPLIERS = [
  { code: 'SUP-CORV', name: 'Corvane Bonding Supplies', contactName: 'Ilse Marrow', email: 'orders@corvane.example' },
  { code: 'SUP-OSTM', name: 'Ostmere Coil Wire', contactName: 'Pavel Strand', email: 'sales@ostmere.example' },
  { code: 'SUP-PELL', name: 'Pellbrook Magnet Foundry', contactName: 'Noor Abbasi', email: 'desk@pellbrook.example' },
  { code: 'SUP-TARR', name: 'Tarrow Paper Cone Mill', contactName: 'Edda Quist', email: 'mill@tarrow.example' },
  { code: 'SUP-QUIL', name: 'Quillan Frame & Parts', contactName: 'Bram Holt', email: 'parts@quillan.example' },
] as const;

export interface DemoMaterial {
  code: string;
  name: string;
  kind: MaterialKind;
  unit: string;
  storageClass: StorageClass;
  supplier: string;
  shelfLifeDays?: number;
  openLifeHours?: number;
  thawedLifeHours?: number;
  outOfStorageAllowanceHours?: number;
  potLifeMinutes?: number;
  partner?: string;
  mixRatio?: number;
  cure?: CureProfileJson;
  requiresInspection: boolean;
  hazards?: HazardsJson;
  gtin?: string;
  reorderPoint?: number;
  orderQuantity?: number;
  leadTimeDays?: number;
  /** Container size when received. */
  perContainer: number;
}

const SENSITISER: HazardsJson = { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H315', 'H317', 'H319'] };

// Cure and storage values are typical of their adhesive families (adhesive makers' storage and
// cure guidance, common practice); a real plant takes them from each material's datasheet.
export const DEMO_MATERIALS: DemoMaterial[] = [
  {
    code: 'ADH-AN-220',
    name: 'Anaerobic structural acrylic, magnet bond',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 365,
    openLifeHours: 720,
    requiresInspection: true,
    cure: { refTempC: 22, handlingMinutes: 10, fullCureMinutes: 1440, factorPer10C: 2 },
    hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H317', 'H319'] },
    gtin: '09501101530003',
    reorderPoint: 3000,
    orderQuantity: 6000,
    leadTimeDays: 14,
    perContainer: 250,
  },
  {
    code: 'ACT-220',
    name: 'Activator for anaerobic acrylic',
    kind: 'activator',
    unit: 'ml',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 540,
    openLifeHours: 2160,
    requiresInspection: false,
    hazards: { signalWord: 'Danger', pictograms: ['GHS02', 'GHS07'], statements: ['H225', 'H319', 'H336'] },
    reorderPoint: 500,
    orderQuantity: 2000,
    leadTimeDays: 14,
    perContainer: 500,
  },
  {
    code: 'ADH-EP-410A',
    name: 'Two-part epoxy, resin (part A)',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 365,
    openLifeHours: 2160,
    potLifeMinutes: 45,
    partner: 'HRD-EP-410B',
    mixRatio: 1,
    requiresInspection: true,
    cure: { refTempC: 23, handlingMinutes: 180, fullCureMinutes: 1440, factorPer10C: 2 },
    hazards: { signalWord: 'Warning', pictograms: ['GHS07', 'GHS09'], statements: ['H315', 'H317', 'H319', 'H411'] },
    reorderPoint: 4000,
    orderQuantity: 8000,
    leadTimeDays: 21,
    perContainer: 1000,
  },
  {
    code: 'HRD-EP-410B',
    name: 'Two-part epoxy, hardener (part B)',
    kind: 'hardener',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 365,
    openLifeHours: 2160,
    potLifeMinutes: 45,
    partner: 'ADH-EP-410A',
    mixRatio: 1,
    requiresInspection: true,
    cure: { refTempC: 23, handlingMinutes: 180, fullCureMinutes: 1440, factorPer10C: 2 },
    hazards: { signalWord: 'Danger', pictograms: ['GHS05', 'GHS07'], statements: ['H314', 'H317'] },
    reorderPoint: 4000,
    orderQuantity: 8000,
    leadTimeDays: 21,
    perContainer: 1000,
  },
  {
    code: 'ADH-CA-40',
    name: 'Cyanoacrylate, medium viscosity',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'refrigerated',
    supplier: 'SUP-CORV',
    shelfLifeDays: 300,
    openLifeHours: 720,
    outOfStorageAllowanceHours: 72,
    requiresInspection: true,
    // Moisture-curing: a relative-humidity range as data sheets give it (40–60 % RH; from memory, common practice).
    cure: { refTempC: 22, handlingMinutes: 1, fullCureMinutes: 1440, factorPer10C: 1.5, rhMinPct: 40, rhMaxPct: 60 },
    hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H315', 'H319', 'H335', 'EUH202'] },
    reorderPoint: 400,
    orderQuantity: 1000,
    leadTimeDays: 10,
    perContainer: 50,
  },
  {
    code: 'ADH-DC-12',
    name: 'Dust-cap adhesive, slow cure',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 270,
    openLifeHours: 336,
    requiresInspection: true,
    cure: { refTempC: 22, handlingMinutes: 120, fullCureMinutes: 720, factorPer10C: 2 },
    hazards: SENSITISER,
    reorderPoint: 1500,
    orderQuantity: 3000,
    leadTimeDays: 14,
    perContainer: 300,
  },
  {
    code: 'ADH-FZ-7',
    name: 'Frozen premixed epoxy cartridge',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'frozen',
    supplier: 'SUP-CORV',
    shelfLifeDays: 180,
    thawedLifeHours: 4,
    requiresInspection: true,
    cure: { refTempC: 23, handlingMinutes: 90, fullCureMinutes: 960, factorPer10C: 2 },
    hazards: SENSITISER,
    reorderPoint: 200,
    orderQuantity: 600,
    leadTimeDays: 28,
    perContainer: 30,
  },
  {
    code: 'WIR-AL-EW',
    name: 'Edge-wound aluminium ribbon, 0.2 x 1.0 mm',
    kind: 'wire',
    unit: 'm',
    storageClass: 'ambient',
    supplier: 'SUP-OSTM',
    requiresInspection: true,
    reorderPoint: 5000,
    orderQuantity: 20000,
    leadTimeDays: 30,
    perContainer: 2500,
  },
  {
    code: 'WIR-CU-025',
    name: 'Round copper magnet wire, 0.25 mm',
    kind: 'wire',
    unit: 'm',
    storageClass: 'ambient',
    supplier: 'SUP-OSTM',
    requiresInspection: true,
    reorderPoint: 8000,
    orderQuantity: 30000,
    leadTimeDays: 21,
    perContainer: 5000,
  },
  {
    code: 'WIR-TIN-16',
    name: 'Flexible tinsel lead wire',
    kind: 'wire',
    unit: 'm',
    storageClass: 'ambient',
    supplier: 'SUP-OSTM',
    requiresInspection: false,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 21,
    perContainer: 500,
  },
  {
    code: 'MAG-FER-156',
    name: 'Ferrite ring magnet 156 x 80 x 20 mm (unmagnetized)',
    kind: 'magnet',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-PELL',
    requiresInspection: true,
    reorderPoint: 400,
    orderQuantity: 1200,
    leadTimeDays: 45,
    perContainer: 60,
  },
  {
    code: 'MAG-NEO-SH',
    name: 'NdFeB slug, grade SH (unmagnetized)',
    kind: 'magnet',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-PELL',
    requiresInspection: true,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 60,
    perContainer: 100,
  },
  {
    code: 'CON-12P',
    name: 'Paper cone, 12 in',
    kind: 'cone',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-TARR',
    requiresInspection: true,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 21,
    perContainer: 100,
  },
  {
    code: 'CON-6P',
    name: 'Paper cone, 6.5 in',
    kind: 'cone',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-TARR',
    requiresInspection: true,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 21,
    perContainer: 150,
  },
  {
    code: 'SPI-12',
    name: 'Spider, 12 in phenolic cotton',
    kind: 'spider',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-TARR',
    requiresInspection: false,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 21,
    perContainer: 100,
  },
  {
    code: 'DCP-40',
    name: 'Dust cap, 40 mm felt',
    kind: 'dust_cap',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-TARR',
    requiresInspection: false,
    reorderPoint: 500,
    orderQuantity: 2000,
    leadTimeDays: 14,
    perContainer: 500,
  },
  {
    code: 'FRM-12S',
    name: 'Stamped steel frame, 12 in',
    kind: 'frame',
    unit: 'pcs',
    storageClass: 'ambient',
    supplier: 'SUP-QUIL',
    requiresInspection: true,
    reorderPoint: 300,
    orderQuantity: 800,
    leadTimeDays: 28,
    perContainer: 40,
  },
  {
    // One-part heat-cure epoxy for magnet bonding: an oven schedule (invented data-sheet style values).
    code: 'ADH-HC-150',
    name: 'One-part heat-cure epoxy, magnet bond',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 180,
    openLifeHours: 720,
    requiresInspection: true,
    cure: {
      method: 'heat',
      refTempC: 120,
      handlingMinutes: 20,
      fullCureMinutes: 30,
      schedule: [
        { tempC: 120, minutes: 30 },
        { tempC: 150, minutes: 15 },
      ],
    },
    hazards: SENSITISER,
    reorderPoint: 500,
    orderQuantity: 1000,
    leadTimeDays: 14,
    perContainer: 250,
  },
  {
    // UV-curing acrylic for dust caps: a dose in mJ/cm² (invented data-sheet style value).
    code: 'ADH-UV-30',
    name: 'UV-curing acrylic, dust cap',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    supplier: 'SUP-CORV',
    shelfLifeDays: 365,
    openLifeHours: 2160,
    requiresInspection: true,
    cure: { method: 'uv', refTempC: 23, handlingMinutes: 1, fullCureMinutes: 1, uvDoseMJcm2: 3000 },
    hazards: SENSITISER,
    reorderPoint: 300,
    orderQuantity: 1000,
    leadTimeDays: 10,
    perContainer: 100,
  },
];

export const DEMO_STATIONS = [
  { code: 'ST-MAG-1', name: 'Magnet bond robot 1', kind: 'magnet_assembly', area: 'Line A' },
  { code: 'ST-MOV-1', name: 'Moving parts bench 1', kind: 'moving_parts', area: 'Line A' },
  { code: 'ST-MOV-2', name: 'Moving parts bench 2', kind: 'moving_parts', area: 'Line A' },
  { code: 'ST-LEAD-1', name: 'Lead termination 1', kind: 'lead_termination', area: 'Line A' },
  { code: 'ST-CAP-1', name: 'Dust cap bench 1', kind: 'dust_cap', area: 'Line A' },
  { code: 'ST-MZT-1', name: 'Magnetizer and final test 1', kind: 'magnetize_test', area: 'Test bay' },
  { code: 'ST-RWK-1', name: 'Rework bench', kind: 'moving_parts', area: 'Rework' },
  // Stations that cure with their own readings: an oven and a UV lamp (cautions on the station screen).
  { code: 'ST-OVN-1', name: 'Magnet bond cure oven 1', kind: 'cure_oven', area: 'Line A', cureEnvironment: 'own' as const },
  { code: 'ST-UV-1', name: 'Dust cap UV lamp 1', kind: 'uv_cure', area: 'Line A', cureEnvironment: 'own' as const },
];

export interface DemoStep {
  name: string;
  stationKind: string;
  waitForCure: boolean;
  materials: [string, number][];
}

export const DEMO_MODELS: { code: string; name: string; description: string; steps: DemoStep[] }[] = [
  {
    code: 'HB12W',
    name: '12 in woofer, 400 W',
    description: 'Ferrite motor, edge-wound aluminium coil.',
    steps: [
      {
        name: 'Magnet assembly',
        stationKind: 'magnet_assembly',
        waitForCure: false,
        materials: [
          ['MAG-FER-156', 1],
          ['FRM-12S', 1],
          ['ADH-AN-220', 1.2],
          ['ACT-220', 0.2],
        ],
      },
      {
        name: 'Moving parts',
        stationKind: 'moving_parts',
        waitForCure: false,
        materials: [
          ['WIR-AL-EW', 14],
          ['CON-12P', 1],
          ['SPI-12', 1],
          ['ADH-EP-410A', 3],
          ['HRD-EP-410B', 3],
          ['ADH-CA-40', 0.4],
        ],
      },
      { name: 'Lead termination', stationKind: 'lead_termination', waitForCure: false, materials: [['WIR-TIN-16', 0.35]] },
      {
        name: 'Dust cap',
        stationKind: 'dust_cap',
        waitForCure: true,
        materials: [
          ['DCP-40', 1],
          ['ADH-DC-12', 1.5],
        ],
      },
      { name: 'Magnetize and test', stationKind: 'magnetize_test', waitForCure: false, materials: [] },
    ],
  },
  {
    code: 'HB65F',
    name: '6.5 in full-range',
    description: 'Neodymium motor, round copper coil.',
    steps: [
      {
        name: 'Magnet assembly',
        stationKind: 'magnet_assembly',
        waitForCure: false,
        materials: [
          ['MAG-NEO-SH', 1],
          ['ADH-AN-220', 0.5],
          ['ACT-220', 0.1],
        ],
      },
      {
        name: 'Moving parts',
        stationKind: 'moving_parts',
        waitForCure: false,
        materials: [
          ['WIR-CU-025', 9],
          ['CON-6P', 1],
          ['ADH-CA-40', 0.3],
        ],
      },
      { name: 'Lead termination', stationKind: 'lead_termination', waitForCure: false, materials: [['WIR-TIN-16', 0.25]] },
      {
        name: 'Dust cap',
        stationKind: 'dust_cap',
        waitForCure: true,
        materials: [
          ['DCP-40', 1],
          ['ADH-DC-12', 0.8],
        ],
      },
      { name: 'Magnetize and test', stationKind: 'magnetize_test', waitForCure: false, materials: [] },
    ],
  },
  /**
   * A woofer whose motor is bonded with the one-part heat-cure epoxy in the oven and whose dust cap
   * is bonded with the UV-curing acrylic under the UV lamp: built only today in the demo (the
   * oven's and the lamp's own readings cover today), so the cure board shows an oven cure and a
   * UV cure with their own figures.
   */
  {
    code: 'HB12X',
    name: '12 in woofer, 600 W, oven-cured motor',
    description: 'Ferrite motor bonded with heat-cure epoxy in the oven; UV-cured dust cap.',
    steps: [
      {
        name: 'Magnet bond and oven cure',
        stationKind: 'cure_oven',
        waitForCure: true,
        materials: [
          ['MAG-FER-156', 1],
          ['FRM-12S', 1],
          ['ADH-HC-150', 1.5],
        ],
      },
      {
        name: 'Moving parts',
        stationKind: 'moving_parts',
        waitForCure: false,
        materials: [
          ['WIR-AL-EW', 14],
          ['CON-12P', 1],
          ['SPI-12', 1],
          ['ADH-CA-40', 0.4],
        ],
      },
      { name: 'Lead termination', stationKind: 'lead_termination', waitForCure: false, materials: [['WIR-TIN-16', 0.35]] },
      {
        name: 'Dust cap (UV)',
        stationKind: 'uv_cure',
        waitForCure: true,
        materials: [
          ['DCP-40', 1],
          ['ADH-UV-30', 0.3],
        ],
      },
      { name: 'Magnetize and test', stationKind: 'magnetize_test', waitForCure: false, materials: [] },
    ],
  },
];

export const DEMO_DEFECT_CODES = [
  { code: 'RUB', description: 'Rub or buzz in sweep' },
  { code: 'OPEN', description: 'Open voice coil' },
  { code: 'FS-HI', description: 'Resonance above tolerance' },
  { code: 'SENS-LO', description: 'Sensitivity below tolerance' },
  { code: 'LEAD', description: 'Lead wire break or poor joint' },
  { code: 'CAP', description: 'Dust cap loose or off-centre' },
];
